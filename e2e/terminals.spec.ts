import { expect, test, type Page } from "@playwright/test";
import { computeReadingFlow, judgeReading, type ProjectBasis } from "../lib/terminals/reading";
import { SignInPage } from "./pages/sign-in-page";
import { TerminalsPage } from "./pages/terminals-page";
import { goOffline, goOnline } from "./support/network";
import { expectNoSeriousViolations } from "./support/axe";
import { apiAs } from "./support/api";

/** Every control in `main` at least 44 px tall (measured in one pass in the page). */
async function expectTouchTargets(page: Page) {
  const small = await page.evaluate(() => {
    const selector = "main button, main a, main input[type=text], main textarea, main label:has(input[type=radio]), main label:has(input[type=checkbox]), main summary";
    const all = [...document.querySelectorAll<HTMLElement>(selector)];
    const visible = all.filter((e) => e.getBoundingClientRect().height > 0);
    return { count: visible.length, small: visible.filter((e) => e.getBoundingClientRect().height < 44).map((e) => e.outerHTML.slice(0, 120)) };
  });
  expect(small.count).toBeGreaterThan(20);
  expect(small.small).toEqual([]);
}

// The library as seeded: 210 m, standard air 1.204 kg/m³, ±10 % on outlets and terminal units.
const LIBRARY_BASIS: ProjectBasis = {
  altitudeM: 210,
  standardDensityKgM3: 1.204,
  outletToleranceMinusPct: 10,
  outletTolerancePlusPct: 10,
  terminalUnitToleranceMinusPct: 10,
  terminalUnitTolerancePlusPct: 10,
  fanToleranceMinusPct: 5,
  fanTolerancePlusPct: 5,
  sectionToleranceMinusPct: 10,
  sectionTolerancePlusPct: 10,
  outsideAirToleranceMinusPct: 0,
  outsideAirTolerancePlusPct: 10,
};

/** % of design the engine gives for an uncorrected hood reading (L/s) at a dry-bulb, RH not measured. */
function expectedPct(readingLS: number, dryBulbC: number, designLS: number, factor = 1) {
  const values = {
    method: "hood" as const,
    phase: "initial" as const,
    setpoint: "design" as const,
    hoodFlowM3S: readingLS / 1000,
    hoodCorrectionFactor: factor,
    hoodDensityCorrected: false,
    hoodBackPressureCompensated: true,
    velocitiesMS: null,
    velocityBasis: null,
    effectiveAreaM2: null,
    dryBulbC,
    relativeHumidityPct: null,
    barometricPa: null,
    controllerFlowM3S: null,
    controllerFlowFactor: null,
    damperMarked: false,
  };
  const flow = computeReadingFlow(values, { effectiveAreaM2: null }, LIBRARY_BASIS);
  const judged = judgeReading({ ...values, standardFlowM3S: flow.standardFlowM3S }, { kind: "diffuser", designFlowM3S: designLS / 1000, designMinFlowM3S: null, designHeatingFlowM3S: null, effectiveAreaM2: null, controllerFlowFactor: null }, LIBRARY_BASIS);
  return { pct: Math.round(judged.pctOfDesign!), within: judged.withinTolerance!, standardLS: Math.round(flow.standardFlowM3S * 1000) };
}

const VIEWPORTS = [
  { width: 1024, height: 768, name: "landscape tablet", outlet: "SD-111", vav: "VAV-E2E-1" },
  { width: 820, height: 1180, name: "portrait tablet", outlet: "SD-112", vav: "VAV-E2E-2" },
  { width: 1440, height: 900, name: "desktop", outlet: "SD-114", vav: "VAV-E2E-3" },
];

for (const viewport of VIEWPORTS) {
  test.describe(`on a ${viewport.name} (${viewport.width}×${viewport.height})`, () => {
    test.use({ viewport: { width: viewport.width, height: viewport.height }, hasTouch: viewport.width < 1100 });
    // Each journey records two or three readings through the screen and checks them with axe and over the
    // API: about 20–30 s on two cores, too near the default limit.
    test.slow();

    test("a technician records an outlet's initial and final readings with the keyboard only and sees % of design and the verdict", async ({ page, playwright, baseURL }) => {
      const screen = new TerminalsPage(page);
      const projectId = await screen.open();
      await expectNoSeriousViolations(page);
      const tag = viewport.outlet;

      // Initial: 240 L/s at 17 °C on a 280 L/s diffuser.
      await page.getByRole("button", { name: `Read ${tag}`, exact: true }).focus();
      await page.keyboard.press("Enter");
      const panel = screen.panel(tag);
      await expect(panel).toBeVisible();
      await expect.poll(() => screen.focusedName()).toMatch(/^Hood reading/);
      await page.keyboard.type("240");
      await screen.enterUntil(/^Dry-bulb at the outlet/);
      await page.keyboard.type("17");
      const initial = expectedPct(240, 17, 280);
      await expect(panel.getByRole("region", { name: "Result" })).toContainText(`${initial.pct} %`);
      await expect(panel.getByRole("region", { name: "Result" })).toContainText("Not density-corrected by the hood: referred to standard air");
      await expectNoSeriousViolations(page);
      await expectTouchTargets(page);
      await screen.enterUntil(/^Notes/);
      await screen.tabUntil(/^Record reading/);
      await page.keyboard.press("Enter");

      const row = screen.row(tag);
      await expect(row.getByRole("cell").nth(1)).toContainText(`${initial.standardLS} L/s`);
      await expect(row.getByRole("cell").nth(1)).toContainText(`${initial.pct} % of design`);
      await expect(row.getByRole("cell").nth(3)).toContainText(`${initial.pct} %${initial.within ? "Within" : "Outside"}`);
      await expect(page.getByRole("status").filter({ hasText: `Saved. The server has the initial reading of ${tag}.` })).toBeVisible();
      // The Read button has the focus back, ready for the final reading after adjustment.
      await expect.poll(() => screen.focusedName()).toBe(`Read ${tag}`);

      // Final, after adjusting the damper: 272 L/s, damper marked.
      await page.keyboard.press("Enter");
      await expect(panel.getByRole("radio", { name: /Final/ })).toBeChecked();
      await expect.poll(() => screen.focusedName()).toMatch(/^Hood reading/);
      await page.keyboard.type("272");
      await screen.enterUntil(/^Dry-bulb at the outlet/);
      await expect(panel.getByLabel(/Dry-bulb at the outlet/)).toHaveValue("17"); // kept from the reading before
      await screen.enterUntil(/^Damper position marked/);
      await page.keyboard.press("Space");
      await expect(panel.getByRole("checkbox", { name: "Damper position marked" })).toBeChecked();
      await screen.enterUntil(/^Notes/);
      await page.keyboard.type("Damper two turns in.");
      await screen.tabUntil(/^Record reading/);
      await page.keyboard.press("Enter");

      const final = expectedPct(272, 17, 280);
      await expect(row.getByRole("cell").nth(2)).toContainText(`${final.pct} % of design`);
      await expect(row.getByRole("cell").nth(2)).toContainText("Damper marked");
      await expect(row.getByRole("cell").nth(3)).toContainText(`${final.pct} %${final.within ? "Within" : "Outside"}`);
      await expect(page.getByRole("status").filter({ hasText: `Saved. The server has the final reading of ${tag}.` })).toBeVisible();

      // Both kept: the history lists the final, then the initial.
      await row.getByRole("button", { name: `History (2) of ${tag}` }).focus();
      await page.keyboard.press("Enter");
      const history = page.getByRole("list", { name: `Readings of ${tag}, newest first` }).locator(":scope > li");
      await expect(history).toHaveCount(2);
      await expect(history.first()).toContainText("Final");
      await expect(history.first()).toContainText("damper position marked");
      await expect(history.first()).toContainText("Damper two turns in.");
      await expect(history.last()).toContainText("Initial");

      const api = await apiAs(playwright, baseURL, "owner@example.test");
      const terminals = (await (await api.get(`/api/v1/projects/${projectId}/terminals`)).json()).terminals as { id: string; tag: string }[];
      const stored = (await (await api.get(`/api/v1/projects/${projectId}/terminals/${terminals.find((t) => t.tag === tag)!.id}/readings`)).json()) as {
        readings: { phase: string; pctOfDesign: number; damperMarked: boolean }[];
      };
      expect(stored.readings.map((r) => [r.phase, Math.round(r.pctOfDesign), r.damperMarked])).toEqual([
        ["final", final.pct, true],
        ["initial", initial.pct, false],
      ]);
      await api.dispose();
    });

    test("a technician records a VAV box at maximum and minimum with the controller's reading and sees the flow-factor suggestion", async ({ page, playwright, baseURL }) => {
      // The engineer schedules a box on S1.3 for this test (design 300 / 90 L/s, controller factor 0.87).
      const engineer = await apiAs(playwright, baseURL, "engineer@example.test");
      const projects = (await (await engineer.get("/api/v1/projects")).json()).projects as { id: string; siteName: string }[];
      const projectId = projects.find((p) => p.siteName === "Wrenfield Community Library")!.id;
      const design = (await (await engineer.get(`/api/v1/projects/${projectId}`)).json()) as { sections: { id: string; tag: string }[] };
      const created = await engineer.post(`/api/v1/projects/${projectId}/terminals`, {
        data: { sectionId: design.sections.find((s) => s.tag === "S1.3")!.id, tag: viewport.vav, kind: "vav_box", designFlowM3S: 0.3, designMinFlowM3S: 0.09, controllerFlowFactor: 0.87, room: "Quiet study" },
      });
      expect(created.status()).toBe(201);
      await engineer.dispose();

      const screen = new TerminalsPage(page);
      await screen.open();
      const tag = viewport.vav;
      // Maximum: the hood shows 270 L/s density-corrected; the controller shows 300 L/s.
      await page.getByRole("button", { name: `Read ${tag} at maximum`, exact: true }).focus();
      await page.keyboard.press("Enter");
      const panel = screen.panel(tag);
      await expect(panel.getByRole("radio", { name: "Maximum" })).toBeChecked();
      await expect.poll(() => screen.focusedName()).toMatch(/^Hood reading/);
      await page.keyboard.type("270");
      await screen.enterUntil(/^Correction factor/);
      await page.keyboard.press("Enter"); // density-corrected? → "No: refer it here"
      await page.keyboard.press("ArrowLeft"); // → "Yes: it shows standard air"
      await expect(panel.getByRole("radio", { name: "Yes: it shows standard air" })).toBeChecked();
      await screen.enterUntil(/^Dry-bulb at the outlet/);
      await page.keyboard.type("15");
      await screen.enterUntil(/^Controller display/);
      await page.keyboard.type("300");
      const result = panel.getByRole("region", { name: "Result" });
      // measured ÷ displayed = 0.9; new factor = 0.87 × 0.9² = 0.705
      await expect(result).toContainText("Measured ÷ displayed 0.900");
      await expect(result).toContainText("Flow factor 0.870 → 0.705");
      await expect(result).toContainText("90 %");
      await expectNoSeriousViolations(page);
      await screen.enterUntil(/^Notes/);
      await screen.tabUntil(/^Record reading/);
      await page.keyboard.press("Enter");
      const maxRow = screen.row(tag, "Maximum");
      await expect(maxRow.getByRole("cell").nth(3)).toContainText("90 %Within");
      await expect(maxRow.getByRole("cell").nth(3)).toContainText("Controller ×0.90 · factor → 0.705");
      // The focus returns to the button that opened the panel (a frame after the row shows); wait for it before moving on.
      await expect.poll(() => screen.focusedName()).toBe(`Read ${tag} at maximum`);

      // Minimum: 99 L/s against 90 L/s design; the controller shows 90 L/s.
      await page.getByRole("button", { name: `Read ${tag} at minimum`, exact: true }).focus();
      await page.keyboard.press("Enter");
      await expect(panel.getByRole("radio", { name: "Minimum" })).toBeChecked();
      await expect(panel.getByRole("radio", { name: "Yes: it shows standard air" })).toBeChecked(); // kept from the last reading
      await expect.poll(() => screen.focusedName()).toMatch(/^Hood reading/);
      await page.keyboard.type("99");
      await screen.enterUntil(/^Controller display/);
      await page.keyboard.type("90");
      await expect(panel.getByRole("region", { name: "Result" })).toContainText("Flow factor 0.870 → 1.053");
      await screen.enterUntil(/^Notes/);
      await screen.tabUntil(/^Record reading/);
      await page.keyboard.press("Enter");
      const minRow = screen.unitRow(tag, "Minimum");
      await expect(minRow.getByRole("cell").nth(3)).toContainText("110 %Within");
      await expect(minRow.getByRole("cell").nth(3)).toContainText("Controller ×1.10 · factor → 1.053");
    });
  });
}

test("a reading recorded without signal survives a reload and reaches the server when the network returns", async ({ page, context, playwright, baseURL }) => {
  test.setTimeout(60_000);
  const screen = new TerminalsPage(page);
  const projectId = await screen.open();
  // The service worker keeps this page for use without network once it controls it.
  await page.evaluate(async () => {
    await navigator.serviceWorker.ready;
    for (let i = 0; i < 100 && !(await caches.match(location.href)); i++) await new Promise((r) => setTimeout(r, 100));
  });

  await goOffline(context);
  await page.getByRole("button", { name: "Read SD-115", exact: true }).click();
  const panel = screen.panel("SD-115");
  await panel.getByLabel(/Hood reading/).fill("255");
  await panel.getByLabel(/Dry-bulb at the outlet/).fill("16.5");
  await panel.getByRole("button", { name: "Record reading of SD-115" }).click();
  const row = screen.row("SD-115");
  const expected = expectedPct(255, 16.5, 280);
  await expect(row.getByRole("cell").nth(1)).toContainText(`${expected.pct} % of design`);
  await expect(row.getByRole("cell").nth(1)).toContainText("Saved on this device");
  await expect(page.getByRole("status").filter({ hasText: "Saved on this device. No network: the initial reading of SD-115 is sent when the connection returns." })).toBeVisible();
  await page.waitForTimeout(300); // the device write follows by a few milliseconds

  await page.reload();
  await expect(page.getByRole("heading", { name: "Outlets and terminal units" })).toBeVisible();
  await expect(page.getByText("No network. Keep working").or(page.getByText("1 entry is saved on this device")).first()).toBeVisible();
  await expect(screen.row("SD-115").getByRole("cell").nth(1)).toContainText("Saved on this device");

  await goOnline(context);
  await expect(screen.row("SD-115").getByRole("cell").nth(1)).not.toContainText("on this device", { timeout: 20_000 });
  await expect(screen.row("SD-115").getByRole("cell").nth(1)).toContainText(`${expected.pct} % of design`);
  const api = await apiAs(playwright, baseURL, "cx@example.test");
  const list = (await (await api.get(`/api/v1/projects/${projectId}/terminal-readings`)).json()).readings as { terminalTag: string; hoodFlowM3S: number }[];
  expect(list.filter((r) => r.terminalTag === "SD-115")).toEqual([expect.objectContaining({ hoodFlowM3S: 0.255 })]);
  await api.dispose();
});

test("an owner sees the readings and verdicts but no controls, and the API refuses their reading (403)", async ({ page, playwright, baseURL }) => {
  const api = await apiAs(playwright, baseURL, "owner@example.test");
  const projects = (await (await api.get("/api/v1/projects")).json()).projects as { id: string; siteName: string }[];
  const projectId = projects.find((p) => p.siteName === "Wrenfield Community Library")!.id;
  const screen = new TerminalsPage(page);
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("owner@example.test");
  await expect(page).toHaveURL(/\/projects$/);
  await page.goto(`/projects/${projectId}/terminals`);
  await expect(page.getByRole("heading", { name: "Outlets and terminal units" })).toBeVisible();
  await expect(screen.row("SD-104").getByRole("cell").nth(3)).toContainText("Outside");
  await expect(page.getByText("Index outlet SD-104")).toBeVisible();
  await expect(page.getByRole("button", { name: /^Read / })).toHaveCount(0);
  await expect(page.getByRole("button", { name: /Record/ })).toHaveCount(0);
  await expectNoSeriousViolations(page);

  const terminals = (await (await api.get(`/api/v1/projects/${projectId}/terminals`)).json()).terminals as { id: string; tag: string }[];
  const res = await api.post(`/api/v1/projects/${projectId}/terminals/${terminals.find((t) => t.tag === "SD-104")!.id}/readings`, {
    data: { phase: "final", method: "hood", hoodFlowM3S: 0.36, hoodDensityCorrected: true, hoodBackPressureCompensated: true, dryBulbC: 18 },
  });
  expect(res.status()).toBe(403);
  await api.dispose();
});
