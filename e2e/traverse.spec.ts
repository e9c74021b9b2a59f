import { expect, test, type Page } from "@playwright/test";
import { runCalcCommand } from "../lib/airflow/commands";
import { formatExpandedUncertainty } from "../lib/airflow/uncertainty";
import { formatQuantity } from "../lib/units";
import { openFieldWork } from "./pages/field-page";
import { SignInPage } from "./pages/sign-in-page";
import { goOffline, goOnline } from "./support/network";
import { expectNoSeriousViolations } from "./support/axe";
import { apiAs } from "./support/api";

/**
 * The technician's traverse, end to end: started and read with the keyboard only on each screen size,
 * the numbers on screen checked against the engine run here on the same input, the network lost in
 * the middle and every reading still reaching the server, a meter's file imported, and an owner kept
 * out. Runs after the other journeys (its own Playwright project): it adds traverses to the demo.
 */

async function expectTargetsAtLeast44px(page: Page) {
  const controls = page.locator("main button, main a, main input:not([type=checkbox]):not([type=radio]):not([type=file]), main select, main label:has(input[type=radio]), main summary");
  const count = await controls.count();
  for (let i = 0; i < count; i++) {
    const box = await controls.nth(i).boundingBox();
    if (!box || box.height === 0) continue;
    expect(box.height, `${await controls.nth(i).evaluate((e) => e.outerHTML.slice(0, 140))}`).toBeGreaterThanOrEqual(44);
  }
}

const focusedLabel = (page: Page) =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el) return "";
    const label = el.id ? document.querySelector(`label[for="${CSS.escape(el.id)}"]`)?.textContent : null;
    return (label ?? el.getAttribute("aria-label") ?? el.textContent ?? "").replace(/\s+/g, " ").trim();
  });

/** Velocity pressures (Pa) on a Ø 315 mm exhaust branch, 2 diameters × 8 log-linear points: invented, shaped like a developed profile. */
const GRID = [
  ["14.2", "21.6", "25.3", "27.9", "28.4", "25.1", "21.0", "13.8"],
  ["13.5", "20.9", "26.0", "28.6", "27.7", "24.6", "20.2", "14.4"],
];
const numbers = GRID.map((row) => row.map(Number));

/** What the engine gives for these readings on this traverse (its stored input with the typed grid). */
function engineFigures(engineInputBase: Record<string, unknown>, readings: (number | null)[][]) {
  const run = runCalcCommand("traverse", { ...engineInputBase, readings });
  if (!run.ok) throw new Error(run.error.message);
  const r = run.value as { mean_velocity_m_s: number; flow_m3_s: number; standard_flow_m3_s: number; mass_flow_kg_s: number; uncertainty: { expanded_pct: number } };
  return {
    mean: formatQuantity("SI", "velocity", r.mean_velocity_m_s),
    actual: formatQuantity("SI", "flow", r.flow_m3_s),
    standard: formatQuantity("SI", "flow", r.standard_flow_m3_s),
    mass: formatQuantity("SI", "massFlow", r.mass_flow_kg_s),
    uncertainty: formatExpandedUncertainty(r.uncertainty.expanded_pct / 100),
  };
}

/**
 * Waits until the service worker holds this page and every script the page has loaded, the parts it
 * fetches after it is up included (one per idle moment after the load event: waited for until their
 * list has stopped growing for a few seconds): what "opened once" leaves a tablet with before the
 * signal goes.
 */
async function waitUntilKeptForOffline(page: Page) {
  await page.waitForLoadState("load");
  const kept = await page.evaluate(async () => {
    const statics = await caches.open("airtally-static-v1");
    let count = -1;
    let since = performance.now();
    for (const end = performance.now() + 60_000; performance.now() < end; await new Promise((r) => setTimeout(r, 250))) {
      const scripts = performance
        .getEntriesByType("resource")
        .map((e) => e.name)
        .filter((u) => new URL(u).pathname.startsWith("/_next/static/") && u.endsWith(".js"));
      if (scripts.length !== count) [count, since] = [scripts.length, performance.now()];
      if (performance.now() - since < 4000 || !(await caches.match(location.href))) continue;
      if ((await Promise.all(scripts.map((u) => statics.match(u)))).every(Boolean)) return true;
    }
    return false;
  });
  expect(kept, "the service worker kept the page and every script it loaded").toBe(true);
}

async function typeLine(page: Page, values: readonly string[]) {
  for (const v of values) {
    await page.keyboard.type(v);
    await page.keyboard.press("Enter");
  }
}

const VIEWPORTS = [
  { width: 1024, height: 768, name: "landscape tablet", section: "X1.1" },
  { width: 820, height: 1180, name: "portrait tablet", section: "X1.2" },
  { width: 1440, height: 900, name: "desktop", section: "X1" },
] as const;

for (const viewport of VIEWPORTS) {
  test.describe(`on a ${viewport.name} (${viewport.width}×${viewport.height})`, () => {
    test.use({ viewport: { width: viewport.width, height: viewport.height }, hasTouch: viewport.width < 1200 });

    test(`a technician traverses ${viewport.section} with the keyboard only, loses the network midway, and every reading reaches the server`, async ({ page, context, playwright, baseURL }) => {
      test.setTimeout(180_000);
      const projectId = await openFieldWork(page);
      // The demo's exhaust sections carry approved traverses (its closeout report is issued): this is their re-traverse.
      const start = page.getByRole("link", { name: `Re-traverse of ${viewport.section}`, exact: true });
      await start.focus();
      await page.keyboard.press("Enter");
      await expect(page.getByRole("heading", { name: new RegExp(`Start a traverse of ${viewport.section.replace(".", "\\.")}`) })).toBeVisible();
      // The engine's suggestion with its reason: Ø 315 mm and Ø 450 mm take 8 points per diameter, 2 diameters (ASHRAE Handbook rule, common practice).
      await expect(page.getByText("Suggested: 2 diameters × 8 points")).toBeVisible();
      await expect(page.getByText(/mm round: 8 points per diameter/)).toBeVisible();
      await expectNoSeriousViolations(page);

      await page.getByRole("textbox", { name: /^Dry-bulb/ }).focus();
      await page.keyboard.type("18.5");
      await page.getByRole("textbox", { name: /^Relative humidity/ }).focus();
      await page.keyboard.type("46");
      await page.getByRole("textbox", { name: /^Duct static pressure/ }).focus();
      await page.keyboard.type("-140");
      await page.getByRole("button", { name: /^Start traverse/ }).focus();
      await page.keyboard.press("Enter");

      await expect(page).toHaveURL(/\/traverses\/[0-9a-f-]{36}$/);
      const traverseId = page.url().split("/").pop()!;
      await expect(page.getByRole("heading", { name: new RegExp(`Traverse of ${viewport.section.replace(".", "\\.")}`) })).toBeVisible();
      await expect(page.getByRole("img", { name: /Cross-section of .* with the numbered traverse points and ports/ })).toBeVisible();
      await expect(page.getByRole("table").filter({ hasText: "Port P1" }).getByRole("row")).toHaveCount(9);
      await expectNoSeriousViolations(page);
      await expectTargetsAtLeast44px(page);

      // The page is kept for use without network once the service worker has it.
      await page.evaluate(async () => {
        await navigator.serviceWorker.ready;
        for (let i = 0; i < 100 && !(await caches.match(location.href)); i++) await new Promise((r) => setTimeout(r, 100));
      });

      const first = page.getByRole("textbox", { name: /Diameter 1, Point 1\b/ });
      await first.focus();
      await typeLine(page, GRID[0]!);
      expect(await focusedLabel(page)).toContain("Diameter 2, Point 1");
      const status = page.getByRole("status").filter({ hasText: /^Saved\b/ }).first();
      await expect(page.getByRole("status").filter({ hasText: "The server has the readings." })).toBeVisible({ timeout: 15_000 });
      void status;

      await goOffline(context);
      await typeLine(page, GRID[1]!.slice(0, 5));
      await expect(page.getByRole("status").filter({ hasText: "Saved on this device" }).first()).toBeVisible();
      await page.waitForTimeout(400); // the device write follows the keystroke by a few milliseconds
      await page.reload();
      await expect(page.getByRole("textbox", { name: /Diameter 2, Point 5\b/ })).toHaveValue(GRID[1]![4]!);
      await expect(page.getByRole("textbox", { name: /Diameter 1, Point 8\b/ })).toHaveValue(GRID[0]![7]!);
      await expect(page.getByText("No network: the readings are sent when the connection returns.")).toBeVisible();
      await page.getByRole("textbox", { name: /Diameter 2, Point 6\b/ }).focus();
      await typeLine(page, GRID[1]!.slice(5));
      // After the last point Enter goes to the results.
      expect(await focusedLabel(page)).toBe("Results");

      await goOnline(context);
      await expect(page.getByRole("status").filter({ hasText: "The server has the readings." })).toBeVisible({ timeout: 30_000 });

      const api = await apiAs(playwright, baseURL, "tech@example.test");
      const saved = (await (await api.get(`/api/v1/projects/${projectId}/traverses/${traverseId}`)).json()).traverse;
      expect(saved.readings).toEqual(numbers);
      expect(saved.result.counts).toEqual({ points: 16, read: 16, unreadable: 0, notRead: 0 });
      const expected = engineFigures(saved.engineInput, numbers);
      await expect(page.getByTestId("mean-velocity")).toHaveText(expected.mean);
      await expect(page.getByTestId("actual-flow")).toHaveText(expected.actual);
      await expect(page.getByTestId("standard-flow")).toHaveText(expected.standard);
      await expect(page.getByTestId("mass-flow")).toHaveText(expected.mass);
      await expect(page.getByTestId("uncertainty")).toHaveText(expected.uncertainty);
      await expect(page.getByText(/Saved on the server \(version \d+\)/)).toBeVisible();
      await expect(page.getByRole("img", { name: /Velocity map of/ })).toBeVisible();
      await expectNoSeriousViolations(page);
      await api.dispose();
    });
  });
}

test.describe("on a landscape tablet", () => {
  test.use({ viewport: { width: 1024, height: 768 }, hasTouch: true });

  test("a technician imports a meter's CSV, sees it placed with the count mismatch called out, and accepts it as one save", async ({ page, playwright, baseURL }) => {
    const projectId = await openFieldWork(page);
    const api = await apiAs(playwright, baseURL, "tech@example.test");
    const project = (await (await api.get(`/api/v1/projects/${projectId}`)).json()) as { sections: { id: string; tag: string }[] };
    const x1 = project.sections.find((s) => s.tag === "X1")!;
    const created = await api.post(`/api/v1/projects/${projectId}/traverses`, { data: { sectionId: x1.id, method: "log-linear", air: { dryBulbC: 17, relativeHumidityPct: 50, staticPa: -150 } } });
    expect(created.status()).toBe(201);
    const t = (await created.json()).traverse;
    await page.goto(`/projects/${projectId}/traverses/${t.id}`);
    await page.getByText("Import readings from a meter's file").click();
    // 15 values for 16 points, in inches of water named in the header.
    const values = [0.061, 0.089, 0.105, 0.117, 0.121, 0.104, 0.088, 0.058, 0.057, 0.085, 0.108, 0.118, 0.116, 0.101, 0.083];
    await page.getByLabel("Meter file (CSV)").setInputFiles({ name: "x1-readings.csv", mimeType: "text/csv", buffer: Buffer.from(`Pv (in. w.c.)\n${values.join("\n")}\n`) });
    await expect(page.getByText("x1-readings.csv: 15 of 16 points placed")).toBeVisible();
    await expect(page.getByText("The file has 15 values; this traverse has 16 points (2 × 8). The last 1 stay empty.")).toBeVisible();
    await expectNoSeriousViolations(page);
    // Nothing is saved before it is accepted.
    expect((await (await api.get(`/api/v1/projects/${projectId}/traverses/${t.id}`)).json()).traverse.version).toBe(1);
    await page.getByRole("button", { name: "Use these readings" }).click();
    await expect(page.getByRole("status").filter({ hasText: "The server has the readings." })).toBeVisible({ timeout: 15_000 });
    const saved = (await (await api.get(`/api/v1/projects/${projectId}/traverses/${t.id}`)).json()).traverse;
    // One PUT: version 1 → 2. 1 in. w.c. = 249.08891 Pa (NIST SP 811 B.8).
    expect(saved.version).toBe(2);
    expect(saved.readings[0][2]).toBeCloseTo(0.105 * 249.08891, 6);
    expect(saved.readings[1][7]).toBeNull();
    expect(saved.result.counts.notRead).toBe(1);
    await expect(page.getByRole("textbox", { name: /Diameter 1, Point 3\b/ })).toHaveValue("26.15");
    await api.dispose();
  });
});

test.describe("on a portrait tablet", () => {
  test.use({ viewport: { width: 820, height: 1180 }, hasTouch: true });

  test("after one visit, every part of the traverse screen works without network, the parts loaded after the page included", async ({ page, context, playwright, baseURL }) => {
    const projectId = await openFieldWork(page);
    const api = await apiAs(playwright, baseURL, "tech@example.test");
    const design = (await (await api.get(`/api/v1/projects/${projectId}`)).json()) as { sections: { id: string; tag: string }[] };
    const x1 = design.sections.find((s) => s.tag === "X1")!;
    const t = (await (await api.post(`/api/v1/projects/${projectId}/traverses`, { data: { sectionId: x1.id, method: "log-linear", air: { dryBulbC: 17, relativeHumidityPct: 50, staticPa: -150 } } })).json()).traverse;
    await page.goto(`/projects/${projectId}/traverses/${t.id}`);
    await expect(page.getByRole("textbox", { name: /Diameter 1, Point 1\b/ })).toBeVisible();
    await waitUntilKeptForOffline(page);

    await goOffline(context);
    await page.reload();
    await expect(page.getByRole("heading", { name: /Traverse of X1\b/ })).toBeVisible();
    // The live engine comes after the page: typed values still get their numbers on the tablet.
    await page.getByRole("textbox", { name: /Diameter 1, Point 1\b/ }).focus();
    await typeLine(page, ["21.5"]);
    await expect(page.getByText("No network: the readings are sent when the connection returns.")).toBeVisible();
    await expect(page.getByText(/^Computed on this tablet as you type/)).toBeVisible();
    await expect(page.getByTestId("mean-velocity")).toHaveText(/\d/);
    // The chart is drawn once its place comes near the screen.
    await page.getByRole("heading", { name: "Velocity profile" }).scrollIntoViewIfNeeded();
    await expect(page.getByRole("img", { name: /Velocity profile of X1\b/ })).toBeVisible();
    // So do the air editor, the meter import and the instrument and conditions editor.
    await expect(page.getByRole("textbox", { name: /^Dry-bulb/ })).toBeVisible();
    await page.getByText("Import readings from a meter's file").click();
    await expect(page.getByLabel("Meter file (CSV)")).toBeVisible();
    await page.getByRole("button", { name: "Change instruments or conditions" }).click();
    await expect(page.getByRole("group", { name: /^Manometer/ })).toBeVisible();
    await expect(page.getByText(/could not be loaded without network/)).toHaveCount(0);

    await goOnline(context);
    await expect(page.getByRole("status").filter({ hasText: "The server has the readings." })).toBeVisible({ timeout: 30_000 });
    expect((await (await api.get(`/api/v1/projects/${projectId}/traverses/${t.id}`)).json()).traverse.readings[0][0]).toBe(21.5);
    await api.dispose();
  });

  test("a save made elsewhere first shows both grids side by side, and nothing is overwritten until the technician chooses", async ({ page, context, playwright, baseURL }) => {
    const projectId = await openFieldWork(page);
    const api = await apiAs(playwright, baseURL, "tech@example.test");
    const design = (await (await api.get(`/api/v1/projects/${projectId}`)).json()) as { sections: { id: string; tag: string }[] };
    const x11 = design.sections.find((s) => s.tag === "X1.1")!;
    const t = (await (await api.post(`/api/v1/projects/${projectId}/traverses`, { data: { sectionId: x11.id, method: "log-linear", air: { dryBulbC: 17, relativeHumidityPct: 50, staticPa: -120 } } })).json()).traverse;
    await page.goto(`/projects/${projectId}/traverses/${t.id}`);
    await expect(page.getByRole("textbox", { name: /Diameter 1, Point 1\b/ })).toBeVisible();
    // The grid is in the server's HTML before React takes it over: type only once the page is hydrated.
    await page.waitForLoadState("networkidle");

    await goOffline(context);
    await page.getByRole("textbox", { name: /Diameter 1, Point 1\b/ }).focus();
    await typeLine(page, ["11.1", "22.2"]);
    await expect(page.getByRole("status").filter({ hasText: "Saved on this device" }).first()).toBeVisible();
    // Meanwhile another device saves a different grid first.
    const theirs = numbers.map((row) => row.map((v) => v + 1));
    expect((await api.put(`/api/v1/projects/${projectId}/traverses/${t.id}/readings`, { data: { version: 1, readings: theirs } })).status()).toBe(200);
    await goOnline(context);

    const choice = page.getByRole("region", { name: /Two versions of the readings of X1\.1/ });
    await expect(choice).toBeVisible({ timeout: 30_000 });
    await expect(choice).toContainText("On this device (yours)");
    await expect(choice).toContainText("On the server (version 2)");
    await expect(choice).toContainText("11.1");
    await expect(choice).toContainText(String(theirs[0]![0]));
    await expectNoSeriousViolations(page);
    // Nothing was overwritten while the choice waits.
    expect((await (await api.get(`/api/v1/projects/${projectId}/traverses/${t.id}`)).json()).traverse.readings).toEqual(theirs);

    await choice.getByRole("button", { name: "Keep mine" }).click();
    await expect(page.getByRole("status").filter({ hasText: "The server has the readings." })).toBeVisible({ timeout: 15_000 });
    const saved = (await (await api.get(`/api/v1/projects/${projectId}/traverses/${t.id}`)).json()).traverse;
    expect(saved.version).toBe(3);
    expect(saved.readings[0].slice(0, 3)).toEqual([11.1, 22.2, null]);
    await api.dispose();
  });
});

test("an owner sees a traverse without any recording control, and the API refuses the owner's save (403)", async ({ page, playwright, baseURL }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("owner@example.test");
  const api = await apiAs(playwright, baseURL, "owner@example.test");
  const projects = (await (await api.get("/api/v1/projects")).json()).projects as { id: string; siteName: string }[];
  const library = projects.find((p) => p.siteName === "Wrenfield Community Library")!;
  const tech = await apiAs(playwright, baseURL, "tech@example.test");
  const design = (await (await tech.get(`/api/v1/projects/${library.id}`)).json()) as { sections: { id: string; tag: string }[] };
  const x12 = design.sections.find((s) => s.tag === "X1.2")!;
  const created = (await (await tech.post(`/api/v1/projects/${library.id}/traverses`, { data: { sectionId: x12.id, method: "log-linear", air: { dryBulbC: 17, relativeHumidityPct: 50, staticPa: null } } })).json()).traverse;
  await tech.put(`/api/v1/projects/${library.id}/traverses/${created.id}/readings`, { data: { version: 1, readings: numbers } });

  await page.goto(`/projects/${library.id}/traverses/${created.id}`);
  await expect(page.getByRole("heading", { name: /Traverse of X1\.2/ })).toBeVisible();
  await expect(page.getByText("Read only: technicians record traverses.")).toBeVisible();
  await expect(page.getByRole("main").getByRole("textbox")).toHaveCount(0);
  await expect(page.getByRole("button", { name: /Can't read|Use these readings|Start traverse/ })).toHaveCount(0);
  await expect(page.getByTestId("standard-flow")).toBeVisible();
  await expectNoSeriousViolations(page);
  expect((await api.put(`/api/v1/projects/${library.id}/traverses/${created.id}/readings`, { data: { version: 2, readings: numbers } })).status()).toBe(403);
  expect((await api.post(`/api/v1/projects/${library.id}/traverses`, { data: { sectionId: x12.id, method: "log-linear", air: { dryBulbC: 17, relativeHumidityPct: 50, staticPa: 0 } } })).status()).toBe(403);
  await page.goto(`/projects/${library.id}/sections/${x12.id}/traverses/new`);
  await expect(page.getByRole("main").getByRole("alert")).toContainText("Your role in this project does not include taking readings");
  await api.dispose();
  await tech.dispose();
});
