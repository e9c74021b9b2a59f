import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { SetupPage } from "./pages/setup-page";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

test.use({ viewport: { width: 1024, height: 768 } });

async function signIn(page: Page, email: string) {
  const signInPage = new SignInPage(page);
  await signInPage.goto();
  await signInPage.signIn(email);
  await expect(page.getByRole("heading", { name: "Projects" })).toBeVisible();
}

async function expectAccessible(page: Page) {
  await expect(page).toHaveTitle(/\S/);
  const results = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  const serious = results.violations.filter((v) => v.impact === "serious" || v.impact === "critical");
  expect(serious.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
}

async function expectTouchTargets(page: Page) {
  const controls = page.locator("main button, main select, main input:not([type=checkbox]):not([type=radio]), main a[class*='min-h-touch']");
  const count = await controls.count();
  for (let i = 0; i < count; i++) {
    const box = await controls.nth(i).boundingBox();
    if (!box) continue;
    expect(box.height, `control ${i}: ${await controls.nth(i).getAttribute("name") ?? (await controls.nth(i).innerText())}`).toBeGreaterThanOrEqual(44);
  }
}

// 1 ft³/min = 4.719 474 432 E-04 m³/s and 1 in. = 25.4 mm exactly (NIST SP 811 B.8).
const CFM = 4.719474432e-4;

test("an engineer creates a project with its duct tree and terminals by form, typing in cfm and inches", async ({ page }) => {
  // About twenty saves and page loads in one journey: 20 s alone, more beside the other journeys on a busy machine.
  test.setTimeout(60_000);
  const setup = new SetupPage(page);
  const name = `Harbour Lofts ${Date.now().toString(36)}`;
  await signIn(page, "engineer@example.test");
  await page.goto("/projects/new");
  await expectAccessible(page);
  await page.goto("/projects");
  await setup.createProject(name, "Harbour Lofts");
  await expect(page.getByText("No air systems yet.")).toBeVisible();
  await expectAccessible(page);

  await setup.addSystem({ tag: "AHU-7", name: "Lofts supply", airflow: "3000" });
  await expect(page.getByText("No duct sections in AHU-7 yet.")).toBeVisible();
  await setup.addTrunk({ tag: "T1", size: "30x18", airflow: "3,000", location: "Riser, level 2" });
  await expect(setup.treeRow("T1")).toContainText("30 × 18 in.");
  await expect(setup.treeRow("T1")).toContainText("3,000 cfm");
  await expect(page.getByText("No branches below T1 yet, so there is no junction to check here.")).toBeVisible();

  // A bad value gets its message beside the field, in the units typed, and nothing typed is lost.
  await setup.section("T1").click();
  await page.getByRole("button", { name: "Add branch below" }).click();
  const branch = setup.form("New branch below T1");
  await setup.fillSection(branch, { tag: "T1.1", size: "300", airflow: "1200" });
  await branch.getByRole("button", { name: "Add branch" }).click();
  const diameter = branch.getByLabel(/^Inside diameter/);
  await expect(diameter).toHaveAttribute("aria-invalid", "true");
  const describedBy = (await diameter.getAttribute("aria-describedby"))!;
  await expect(page.locator(`[id="${describedBy}"]`)).toHaveText("Diameter must be at least 1 in. and at most 240 in.; 300 in. was entered.");
  await expect(branch.getByLabel("Tag", { exact: true })).toHaveValue("T1.1");
  await diameter.fill("14");
  await branch.getByRole("button", { name: "Add branch" }).click();
  await expect(page.getByRole("status")).toHaveText("Branch added.");
  await setup.addBranch("T1", { tag: "T1.2", size: "24x12", airflow: "1800" });
  await expect(page.getByText("Check the schedule")).toHaveCount(0);

  const outlet = await setup.openTerminalForm("T1.1", "outlet");
  await outlet.getByLabel("Tag", { exact: true }).fill("SD-1");
  await outlet.getByLabel(/^Neck or inlet diameter/).fill("8");
  await outlet.getByLabel(/^Design airflow/).fill("300");
  await outlet.getByLabel(/^Room/).fill("Loft 1");
  await outlet.getByRole("button", { name: "Add terminal" }).click();
  await expect(page.getByRole("status")).toHaveText("Terminal added.");
  await expect(page.getByRole("row").filter({ hasText: "SD-1" })).toContainText("Ø 8 in.");

  const unit = await setup.openTerminalForm("T1.2", "unit");
  await unit.getByLabel("Tag", { exact: true }).fill("VAV-7");
  await unit.getByLabel(/^Neck or inlet diameter/).fill("12");
  await unit.getByLabel(/^Design airflow/).fill("1800");
  await unit.getByLabel(/^Design minimum airflow/).fill("2000");
  await unit.getByRole("button", { name: "Add terminal" }).click();
  await expect(unit.getByText("The minimum (2,000 cfm) cannot exceed the design maximum (1,800 cfm).")).toBeVisible();
  await unit.getByLabel(/^Design minimum airflow/).fill("540");
  await unit.getByLabel(/^Heating airflow/).fill("900");
  await unit.getByRole("button", { name: "Add terminal" }).click();
  await expect(page.getByRole("row").filter({ hasText: "VAV-7" })).toContainText("1,800");
  await expectAccessible(page);
  await expectTouchTargets(page);

  // Moving T1.2 below its own branch is refused; below T1.1 it is fine.
  await setup.section("T1.1").click();
  await page.getByRole("button", { name: "Edit or move" }).click();
  const options = await setup.form("Edit T1.1").getByLabel(/^Upstream section/).locator("option").allTextContents();
  expect(options.some((o) => o.includes("T1.1 ·"))).toBe(false);

  // What was stored is SI: 3000 cfm and 30 in. exactly converted.
  const projectId = page.url().split("/projects/")[1]!.split("/")[0]!;
  const design = await (await page.request.get(`/api/v1/projects/${projectId}`)).json();
  const trunk = design.sections.find((s: { tag: string }) => s.tag === "T1");
  expect(trunk.designFlowM3S).toBeCloseTo(3000 * CFM, 9);
  expect(trunk.widthMm).toBeCloseTo(762, 9);
  expect(design.terminals.find((t: { tag: string }) => t.tag === "VAV-7")).toMatchObject({ kind: "vav_box", service: "supply" });
});

const SCHEDULE_BAD = [
  "record,system,tag,parent,terminal_type,shape,diameter_in,width_in,height_in,design_airflow_cfm,min_airflow_cfm",
  "section,RF-3,R1,,,rectangular,,24,14,2000,",
  "section,RF-3,R1.1,R9,,round,12,,,800,",
  "terminal,RF-3,RG-1,R1.1,grille,rectangular,,24,,400,",
].join("\n");
const SCHEDULE_GOOD = [
  "record,system,tag,parent,terminal_type,shape,diameter_in,width_in,height_in,design_airflow_cfm,min_airflow_cfm",
  "section,RF-3,R1,,,rectangular,,24,14,2000,",
  "section,RF-3,R1.1,R1,,round,12,,,800,",
  "section,RF-3,R1.2,R1,,round,14,,,1200,",
  "terminal,RF-3,RG-1,R1.1,grille,rectangular,,24,12,400,",
  "terminal,RF-3,RG-2,R1.1,grille,rectangular,,24,12,400,",
  "terminal,RF-3,RG-3,R1.2,grille,rectangular,,24,24,1200,",
].join("\n");

test("an engineer imports a duct tree from a schedule in cfm and inches, fixing the file after the preview", async ({ page }) => {
  const setup = new SetupPage(page);
  await signIn(page, "engineer@example.test");
  await setup.createProject(`Quayside Offices ${Date.now().toString(36)}`, "Quayside Offices");
  await page.getByRole("button", { name: "Add air system" }).click();
  const system = setup.form("New air system");
  await system.getByLabel("Tag", { exact: true }).fill("RF-3");
  await system.getByLabel("Name", { exact: true }).fill("Office return");
  await system.getByLabel("Kind").selectOption("return");
  await system.getByLabel(/^Design airflow/).fill("2000");
  await system.getByRole("button", { name: "Add system" }).click();
  await page.getByRole("link", { name: "← Set-up" }).click();
  await page.getByRole("link", { name: "Import a schedule" }).click();

  const file = page.getByLabel("Design schedule (CSV)");
  await file.setInputFiles({ name: "return.csv", mimeType: "text/csv", buffer: Buffer.from(SCHEDULE_BAD) });
  await expect(page.getByText("2 with errors")).toBeVisible();
  await expect(page.getByRole("row", { name: /^3 section RF-3 R1\.1/ })).toContainText("parent: No section R9 in RF-3, in the file or the project.");
  await expect(page.getByRole("row").filter({ hasText: "RG-1" })).toContainText("height_in: Enter the height of the rectangular neck.");
  await expect(page.getByRole("button", { name: /^Import/ })).toBeDisabled();
  await expectAccessible(page);

  await file.setInputFiles({ name: "return.csv", mimeType: "text/csv", buffer: Buffer.from(SCHEDULE_GOOD) });
  await expect(page.getByText("Ready to import:")).toBeVisible();
  await page.getByRole("button", { name: "Import 6 rows" }).click();
  await expect(page.getByRole("status")).toContainText("Imported: 3 sections and 3 terminals added");
  await page.getByRole("link", { name: "Back to set-up" }).click();
  await page.getByRole("link", { name: "Open the duct tree of RF-3" }).click();
  await expect(setup.treeRow("R1")).toContainText("24 × 14 in.");
  await expect(setup.treeRow("R1.2")).toContainText("1,200 cfm");
  await setup.section("R1.2").click();
  await expect(page.getByRole("row").filter({ hasText: "RG-3" })).toContainText("Return");

  // The export of what was imported re-imports with nothing to change.
  const projectId = page.url().split("/projects/")[1]!.split("/")[0]!;
  const exported = await page.request.get(`/api/v1/projects/${projectId}/design/export.csv?units=IP`);
  const again = await page.request.post(`/api/v1/projects/${projectId}/design/import`, { headers: { "content-type": "text/csv" }, data: await exported.text() });
  expect((await again.json()).preview.counts).toMatchObject({ add: 0, update: 0, unchanged: 6, withErrors: 0 });
});

test("the inch-pound demo reads as a US engineer specifies it", async ({ page }) => {
  await signIn(page, "engineer@example.test");
  await page.getByRole("link", { name: /Marlow Quay Clinic/ }).click();
  const nav = page.getByRole("navigation", { name: "Project" });
  await expect(page.getByRole("row").filter({ hasText: "C1.1.1" })).toContainText("16 × 10 in.");
  await expect(page.getByRole("row").filter({ hasText: "C1.3" }).first()).toContainText("1,200 cfm");
  await expectAccessible(page);

  await nav.getByRole("link", { name: "Set-up" }).click();
  const settings = page.getByRole("region", { name: "Project settings" });
  await expect(settings).toContainText("0.075 lb/ft³");
  await expect(settings).toContainText("115 ft");
  await expect(settings).toContainText("−5 / +10 % of design");
  await expect(page.getByRole("region", { name: "Air systems" })).toContainText("design 2,400 cfm at 1.5 in. w.c.");
  await expectAccessible(page);

  await page.getByRole("link", { name: "Open the duct tree of RTU-2" }).click();
  await expect(page.getByText("Motor: 3 hp, 1,755 rpm, 4.8 A, 460 V, 3-phase, service factor 1.15, on a variable-frequency drive.")).toBeVisible();
  const setup = new SetupPage(page);
  await expect(setup.treeRow("C1")).toContainText("24 × 16 in.");
  await expect(setup.treeRow("C1")).toContainText("2,400 cfm");
  await setup.section("C1.1").click();
  const vav = page.getByRole("row").filter({ hasText: "VAV-1" });
  await expect(vav).toContainText("Ø 10 in.");
  await expect(vav).toContainText("700210350");
  await setup.section("C1.2").click();
  await expect(page.getByRole("row").filter({ hasText: "SD-111" })).toContainText("Ø 8 in.");
  await expect(page.getByRole("row").filter({ hasText: "SD-111" })).toContainText("0.31");
  await expectAccessible(page);

  await nav.getByRole("link", { name: "Design vs measured" }).click();
  await expect(page.getByText("standard air (0.075 lb/ft³)")).toBeVisible();
  await expect(page.getByText("C1 → C1.1 + C1.2 + C1.3")).toBeVisible();

  // The same project in SI for someone who prefers it: whole inches become millimetres, not rounded inches.
  await page.getByText("SI", { exact: true }).click();
  await expect(page.getByText("standard air (1.201 kg/m³)")).toBeVisible();
  await expect(page.getByRole("row").filter({ hasText: "C1.1.1" })).toContainText("406 × 254 mm");
  await page.getByText("Project", { exact: true }).click();
  await expect(page.getByText("standard air (0.075 lb/ft³)")).toBeVisible();
});

test("an owner sees no set-up controls and the API refuses them", async ({ page, playwright, baseURL }) => {
  await signIn(page, "owner@example.test");
  await expect(page.getByRole("link", { name: "New project" })).toHaveCount(0);
  await page.getByRole("link", { name: /Wrenfield Library/ }).click();
  await expect(page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Reports" })).toBeVisible();
  await expect(page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Set-up" })).toHaveCount(0);
  await expect(page.getByText("No air systems yet")).toHaveCount(0);
  const projectId = page.url().split("/projects/")[1]!.split("/")[0]!;
  await page.goto(`/projects/${projectId}/setup`);
  await expect(page.getByText("Your role in this project does not include setting the project up.")).toBeVisible();
  await expect(page.getByRole("button", { name: /Add|Edit|Delete/ })).toHaveCount(0);
  await page.goto("/projects/new");
  await expect(page.getByText("Only site administrators and project engineers can start a project.")).toBeVisible();

  const api = await playwright.request.newContext({ baseURL });
  expect((await api.post("/api/auth/sign-in", { data: { email: "owner@example.test", password: DEMO_PASSWORD } })).status()).toBe(204);
  expect((await api.patch(`/api/v1/projects/${projectId}`, { data: { address: "x" } })).status()).toBe(403);
  expect((await api.post("/api/v1/projects", { data: { name: "x", siteName: "y", unitSystem: "SI" } })).status()).toBe(403);
  expect((await api.post(`/api/v1/projects/${projectId}/design/import`, { headers: { "content-type": "text/csv" }, data: SCHEDULE_GOOD })).status()).toBe(403);
  // Owners read the design (their closeout report shows design against measured); they change nothing.
  expect((await api.get(`/api/v1/projects/${projectId}/terminals`)).status()).toBe(200);
  await api.dispose();
});

test("the set-up screens work at tablet portrait and desktop widths", async ({ page }) => {
  for (const viewport of [
    { width: 820, height: 1180 },
    { width: 1440, height: 900 },
  ]) {
    await page.setViewportSize(viewport);
    await signIn(page, "admin@example.test");
    await page.getByRole("link", { name: /Marlow Quay Clinic/ }).click();
    await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Set-up" }).click();
    await page.getByRole("link", { name: "Open the duct tree of RTU-2" }).click();
    const setup = new SetupPage(page);
    await setup.section("C1.3.1").click();
    await expect(page.getByRole("heading", { name: /C1\.3\.1 · branch of C1\.3/ })).toBeInViewport();
    await expect(page.getByRole("row").filter({ hasText: "SD-126" })).toContainText("Ø 10 in.");
    await expectTouchTargets(page);
    // Nothing runs off the side of the screen.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width);
    await page.context().clearCookies();
  }
});
