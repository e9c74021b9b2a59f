import { expect, type Page } from "@playwright/test";
import { LIBRARY } from "./field-page";
import { SignInPage } from "./sign-in-page";

/**
 * The Terminals screen. `open` signs in and reaches it the way a technician does, from the Field
 * work hub, with the keyboard (focus a link, Enter).
 */
export class TerminalsPage {
  constructor(private readonly page: Page) {}

  async open(email = "tech@example.test"): Promise<string> {
    const signIn = new SignInPage(this.page);
    await signIn.goto();
    await signIn.signIn(email);
    await this.page.getByRole("link", { name: new RegExp(LIBRARY) }).focus();
    await this.page.keyboard.press("Enter");
    await this.page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Field work" }).focus();
    await this.page.keyboard.press("Enter");
    await this.page.getByRole("link", { name: "Terminal readings of AHU-1" }).focus();
    await this.page.keyboard.press("Enter");
    await expect(this.page.getByRole("heading", { name: "Outlets and terminal units" })).toBeVisible();
    return this.page.url().match(/projects\/([0-9a-f-]{36})/)![1]!;
  }

  /** The table row of a terminal (its first row for a terminal unit), found by its tag. */
  row(tag: string, setpoint?: string) {
    const header = this.page.getByRole("rowheader", { name: new RegExp(`^${tag}\\b${setpoint ? `.*${setpoint}` : ""}`) });
    return this.page.getByRole("row").filter({ has: header });
  }

  /** The setpoint row of a terminal unit (its header names only the setpoint after the first). */
  unitRow(tag: string, setpoint: "Maximum" | "Minimum" | "Heating") {
    return this.page.getByRole("row").filter({ has: this.page.getByRole("rowheader", { name: new RegExp(`^${tag}\\b.*${setpoint}$`) }) });
  }

  panel(tag: string) {
    return this.page.getByRole("form", { name: `Reading of ${tag}` });
  }

  /** The name of the control that has the keyboard's focus (its label, else its text). */
  focusedName() {
    return this.page.evaluate(() => {
      const el = document.activeElement as HTMLElement | null;
      if (!el) return "";
      const label = el.id ? document.querySelector(`label[for="${el.id}"]`)?.textContent : el.closest("label")?.textContent;
      return (label ?? el.getAttribute("aria-label") ?? el.textContent ?? "").trim();
    });
  }

  /** Enter until the focus is on `name` (at most `limit` presses): the panel's Enter-moves-on. */
  async enterUntil(name: RegExp, limit = 12) {
    for (let i = 0; i < limit; i++) {
      if (name.test(await this.focusedName())) return;
      await this.page.keyboard.press("Enter");
    }
    expect(await this.focusedName()).toMatch(name);
  }

  /** Tab until the focus is on `name`. */
  async tabUntil(name: RegExp, limit = 20) {
    for (let i = 0; i < limit; i++) {
      if (name.test(await this.focusedName())) return;
      await this.page.keyboard.press("Tab");
    }
    expect(await this.focusedName()).toMatch(name);
  }
}
