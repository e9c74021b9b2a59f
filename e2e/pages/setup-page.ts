import { expect, type Locator, type Page } from "@playwright/test";

/** The engineer's set-up screens: new project, air systems, the duct tree and the schedule import. */
export class SetupPage {
  constructor(private readonly page: Page) {}

  form(name: string | RegExp): Locator {
    return this.page.getByRole("form", { name });
  }

  async createProject(name: string, site: string) {
    await this.page.getByRole("link", { name: "New project" }).click();
    await expect(this.page.getByRole("heading", { name: "New project" })).toBeVisible();
    const form = this.form("New project");
    await form.getByLabel("Project name").fill(name);
    await form.getByLabel("Site", { exact: true }).fill(site);
    await form.getByRole("button", { name: "Create project" }).click();
    await expect(this.page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Set-up" })).toHaveAttribute("aria-current", "page");
  }

  async addSystem(values: { tag: string; name: string; airflow: string }) {
    await this.page.getByRole("button", { name: "Add air system" }).click();
    const form = this.form("New air system");
    await form.getByLabel("Tag", { exact: true }).fill(values.tag);
    await form.getByLabel("Name", { exact: true }).fill(values.name);
    await form.getByLabel(/^Design airflow/).fill(values.airflow);
    await form.getByRole("button", { name: "Add system" }).click();
    await expect(this.page.getByRole("heading", { name: `Duct tree of ${values.tag}` })).toBeVisible();
  }

  /** Fills a section form: round with a diameter, or rectangular with width × height. */
  async fillSection(form: Locator, values: { tag: string; size: string; airflow: string; location?: string }) {
    await form.getByLabel("Tag", { exact: true }).fill(values.tag);
    const [a, b] = values.size.split("x");
    if (b) {
      await form.getByLabel("Shape").selectOption("rectangular");
      await form.getByLabel(/^Inside width/).fill(a!);
      await form.getByLabel(/^Inside height/).fill(b);
    } else {
      await form.getByLabel("Shape").selectOption("round");
      await form.getByLabel(/^Inside diameter/).fill(a!);
    }
    await form.getByLabel(/^Design airflow/).fill(values.airflow);
    if (values.location) await form.getByLabel(/^Location/).fill(values.location);
  }

  async addTrunk(values: { tag: string; size: string; airflow: string; location?: string }) {
    await this.page.getByRole("button", { name: "Add trunk" }).click();
    const form = this.form("New trunk");
    await this.fillSection(form, values);
    await form.getByRole("button", { name: "Add section" }).click();
    await expect(this.page.getByRole("status")).toHaveText("Section added.");
  }

  section(tag: string): Locator {
    return this.page.getByRole("button", { name: new RegExp(`^${tag.replace(/\./g, "\\.")}, (trunk|branch): open$`) });
  }

  async addBranch(below: string, values: { tag: string; size: string; airflow: string }) {
    await this.section(below).click();
    await this.page.getByRole("button", { name: "Add branch below" }).click();
    const form = this.form(`New branch below ${below}`);
    await this.fillSection(form, values);
    await form.getByRole("button", { name: "Add branch" }).click();
    await expect(this.page.getByRole("status")).toHaveText("Branch added.");
  }

  async openTerminalForm(on: string, kind: "outlet" | "unit") {
    await this.section(on).click();
    await this.page.getByRole("button", { name: kind === "outlet" ? "Add outlet or inlet" : "Add terminal unit" }).click();
    return this.form("New terminal");
  }

  treeRow(tag: string): Locator {
    return this.section(tag).locator("xpath=..");
  }
}
