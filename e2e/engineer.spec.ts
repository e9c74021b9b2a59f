import { expect, test, type APIRequestContext } from "@playwright/test";
import { fanVersusOutlets, outletAccuracy } from "../lib/airflow/fan-outlets";
import { checkContinuity } from "../lib/airflow/network";
import { formatExpandedUncertainty } from "../lib/airflow/uncertainty";
import { SignInPage } from "./pages/sign-in-page";
import { expectNoSeriousViolations } from "./support/axe";
import { apiAs } from "./support/api";

/**
 * The engineer of record's journey: the system view's continuity at the demo trunk equals the
 * engine's for the same traverses, the fan against its outlets once every outlet is read, a deviation
 * accepted with a reason and shown on the overview; the owner's dashboard shows approvals and the
 * deviation and offers no controls. Changes the demo (readings, a deviation): runs in its own stage.
 */

async function libraryId(api: APIRequestContext): Promise<string> {
  const projects = (await (await api.get("/api/v1/projects")).json()).projects as { id: string; siteName: string }[];
  return projects.find((p) => p.siteName === "Wrenfield Community Library")!.id;
}

const signedPct = (v: number, digits: number) => `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(digits)} %`;

interface TraverseJson {
  id: string;
  result: { massFlowKgS: number; flowM3S: number; densityKgM3: number; standardFlowM3S: number; uncertainty: { standard: { combinedStandardPct: number } } };
}

const SIZES = [
  { width: 1024, height: 768 },
  { width: 820, height: 1180 },
  { width: 1440, height: 900 },
];

test("the engineer of record checks continuity and the fan against its outlets, and accepts a deviation; the owner sees it read-only", async ({ page, playwright, baseURL }) => {
  test.setTimeout(180_000);
  const engineer = await apiAs(playwright, baseURL, "engineer@example.test");
  const projectId = await libraryId(engineer);
  const design = (await (await engineer.get(`/api/v1/projects/${projectId}`)).json()) as {
    systems: { id: string; tag: string }[];
    sections: { id: string; tag: string; systemId: string }[];
    terminals: { id: string; tag: string; kind: string; sectionId: string; designFlowM3S: number }[];
  };
  const ahu = design.systems.find((s) => s.tag === "AHU-1")!;
  const ahuSections = design.sections.filter((s) => s.systemId === ahu.id);
  const outlets = design.terminals.filter((t) => ahuSections.some((s) => s.id === t.sectionId) && ["diffuser", "grille", "register"].includes(t.kind));

  // The technician reads every outlet of AHU-1 still unread, with the register's hood, under the current conditions.
  const tech = await apiAs(playwright, baseURL, "tech@example.test");
  const conditionsId = ((await (await tech.get(`/api/v1/projects/${projectId}/systems/${ahu.id}/conditions`)).json()) as { current: { id: string } }).current.id;
  const hoods = (await (await tech.get("/api/v1/instruments?kind=capture_hood")).json()).instruments as { id: string; serial: string; accuracyPct: number | null; accuracyFloor: number | null }[];
  const hood = hoods.find((h) => h.serial === "CH-7710")!;
  const listed = async () =>
    ((await (await engineer.get(`/api/v1/projects/${projectId}/terminal-readings?systemId=${ahu.id}`)).json()) as {
      readings: { terminalId: string; terminalTag: string; phase: "initial" | "final"; setpoint: string; standardFlowM3S: number; instrumentId: string | null; method: string; velocitiesMS: number[] | null; conditionsId: string | null }[];
    }).readings;
  const before = await listed();
  for (const o of outlets.filter((t) => !before.some((r) => r.terminalId === t.id))) {
    const res = await tech.post(`/api/v1/projects/${projectId}/terminals/${o.id}/readings`, {
      data: { phase: "initial", method: "hood", hoodFlowM3S: o.designFlowM3S * 0.93, hoodDensityCorrected: true, hoodBackPressureCompensated: true, dryBulbC: 18, conditionsId, instrumentId: hood.id },
    });
    expect(res.status(), o.tag).toBe(201);
  }
  await tech.dispose();

  // The engine on the same numbers: continuity at S1, and the fan against its outlets.
  const traverseLinks = new Map<string, string>();
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("engineer@example.test");
  await expect(page).toHaveURL(/\/projects$/);
  await page.goto(`/projects/${projectId}/systems`);
  await expect(page.getByRole("heading", { name: /AHU-1/ }).first()).toBeVisible();
  for (const tag of ["S1", "S1.1", "S1.2", "S1.3"]) {
    const href = await page.locator(`a[data-section="${tag}"]`).first().getAttribute("href");
    traverseLinks.set(tag, href!.split("/").pop()!);
  }
  const traverses = new Map<string, TraverseJson>();
  for (const [tag, id] of traverseLinks) traverses.set(tag, (await (await engineer.get(`/api/v1/projects/${projectId}/traverses/${id}`)).json()).traverse as TraverseJson);
  const node = (tag: string, parent: string | null) => {
    const r = traverses.get(tag)!.result;
    return { id: tag, parent, massFlowKgS: r.massFlowKgS, flowM3S: r.flowM3S, densityKgM3: r.densityKgM3 };
  };
  const engine = checkContinuity([node("S1", null), node("S1.1", "S1"), node("S1.2", "S1"), node("S1.3", "S1")], { tolerancePct: 10, standardDensityKgM3: 1.204 }).junctions[0]!;
  const junction = page.locator('[data-junction="S1"]');
  await expect(junction).toContainText(`${signedPct(engine.imbalancePct, 2)} by mass`);

  const readings = await listed();
  const latest = (terminalId: string) => {
    const mine = readings.filter((r) => r.terminalId === terminalId && r.setpoint === "design");
    return mine.find((r) => r.phase === "final") ?? mine.find((r) => r.phase === "initial")!;
  };
  const instruments = new Map(((await (await engineer.get("/api/v1/instruments?includeRetired=true")).json()).instruments as { id: string; kind: string; accuracyPct: number | null; accuracyFloor: number | null }[]).map((i) => [i.id, i]));
  const s1 = traverses.get("S1")!.result;
  const check = fanVersusOutlets(
    [{ tag: "S1", standardFlowM3S: s1.standardFlowM3S, relativeStandardUncertainty: s1.uncertainty.standard.combinedStandardPct / 100, conditions: null }],
    outlets.map((o) => {
      const r = latest(o.id);
      const i = r.instrumentId ? instruments.get(r.instrumentId) : undefined;
      expect(r.method, o.tag).toBe("hood");
      return {
        tag: o.tag,
        standardFlowM3S: r.standardFlowM3S,
        phase: r.phase,
        accuracy: i && i.kind === "capture_hood" ? outletAccuracy({ pct: i.accuracyPct, floorM3S: i.accuracyFloor }) : outletAccuracy(null),
        conditions: null,
      };
    }),
  );
  expect(check.status).toBe("complete");
  if (check.status !== "complete") return;
  const tile = page.getByTestId("unaccounted-AHU-1");
  await expect(tile).toContainText("Unaccounted airflow");
  await expect(tile).toContainText(`(${signedPct(check.unaccountedPct, 1)} of the fan)`);
  await expect(tile).toContainText(formatExpandedUncertainty(check.expandedUncertaintyPct / 100));
  await expect(tile).not.toContainText(/leakage of/i);

  for (const size of SIZES) {
    await page.setViewportSize(size);
    // Dense, but usable on a tablet: only the wide tables scroll sideways, never the page. Charts
    // follow a new width a moment after it (a resize observer), so the page is measured once settled.
    await expect.poll(() => page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(size.width);
    await page.screenshot({ path: test.info().outputPath(`systems-${size.width}x${size.height}.png`), fullPage: true });
  }
  await page.setViewportSize({ width: 1024, height: 768 });
  await expectNoSeriousViolations(page);

  // Accept the first result outside its band, with a reason.
  const first = page.locator("li", { has: page.getByRole("button", { name: /^Accept deviation: / }) }).first();
  const label = (await first.locator("strong").first().textContent())!;
  const item = page.locator("li").filter({ has: page.locator("strong").getByText(label, { exact: true }) });
  await item.getByRole("button", { name: /^Accept deviation: / }).click();
  await item.getByRole("textbox").fill("short");
  await item.getByRole("button", { name: "Accept deviation", exact: true }).click();
  await expect(item.getByRole("alert")).toContainText("at least 10 characters");
  const reason = "Room use changed to storage; the lower airflow is agreed with the owner.";
  await item.getByRole("textbox").fill(reason);
  await item.getByRole("button", { name: "Accept deviation", exact: true }).click();
  await expect(item).toContainText(reason);
  await expect(item).toContainText("Accepted deviation");
  await expect(item.getByRole("button", { name: /^Withdraw acceptance: / })).toBeVisible();

  await page.goto(`/projects/${projectId}`);
  const deviations = page.getByRole("region", { name: "Accepted deviations" });
  await expect(deviations).toContainText(label);
  await expect(deviations).toContainText(reason);
  await expect(page.getByRole("region", { name: "Open exceptions" })).not.toContainText(label);
  for (const size of SIZES) {
    await page.setViewportSize(size);
    await page.screenshot({ path: test.info().outputPath(`overview-engineer-${size.width}x${size.height}.png`), fullPage: true });
  }
  await engineer.dispose();

  // The owner: approvals and the deviation on the dashboard, no controls anywhere on it; the API refuses.
  await page.context().clearCookies();
  await page.setViewportSize({ width: 820, height: 1180 });
  await signIn.goto();
  await signIn.signIn("owner@example.test");
  await expect(page).toHaveURL(/\/projects$/);
  await page.goto(`/projects/${projectId}`);
  await expect(page.getByRole("region", { name: "Approvals" })).toContainText("S1.1");
  await expect(page.getByRole("region", { name: "Approvals" })).toContainText("Approved");
  await expect(page.getByRole("region", { name: "Accepted deviations" })).toContainText(reason);
  await expect(page.getByRole("region", { name: "Progress" })).toContainText("Sections approved");
  await expect(page.getByRole("main").getByRole("button")).toHaveCount(0);
  await expect(page.getByRole("main").getByRole("textbox")).toHaveCount(0);
  await expectNoSeriousViolations(page);
  for (const size of SIZES) {
    await page.setViewportSize(size);
    await expect.poll(() => page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(size.width);
    await page.screenshot({ path: test.info().outputPath(`overview-owner-${size.width}x${size.height}.png`), fullPage: true });
  }
  await page.goto(`/projects/${projectId}/systems`);
  await expect(page.getByRole("button", { name: /Accept deviation|Withdraw acceptance/ })).toHaveCount(0);
  const owner = await apiAs(playwright, baseURL, "owner@example.test");
  const list = (await (await owner.get(`/api/v1/projects/${projectId}/deviations`)).json()).deviations as { id: string; entityId: string; subject: string; measure: string }[];
  expect(list.length).toBeGreaterThan(0);
  const refused = await owner.post(`/api/v1/projects/${projectId}/deviations/${list[0]!.id}/withdrawal`, { data: { reason: "The owner tries to withdraw it." } });
  expect(refused.status()).toBe(403);
  const refusedAccept = await owner.post(`/api/v1/projects/${projectId}/deviations`, { data: { subject: list[0]!.subject, entityId: list[0]!.entityId, measure: list[0]!.measure, reason: "The owner tries to accept." } });
  expect(refusedAccept.status()).toBe(403);
  await owner.dispose();
});
