import { expect, test, type APIRequestContext, type Page } from "@playwright/test";
import { runCalcCommand } from "../lib/airflow/commands";
import { DEMO_PASSWORD } from "./pages/sign-in-page";
import { expectNoSeriousViolations } from "./support/axe";

/**
 * The review cycle in the browser: the technician submits a traverse → the commissioning agent draws
 * a verification sample, enters a reading, and returns the traverse with a comment → the technician
 * corrects and resubmits → the agent approves → the owner sees the approval; the engineer's Design vs
 * measured page shows the demo trunk's continuity as the engine computes it here from the same
 * numbers. Screens checked with axe and looked at as PNGs at three sizes. Runs as its own stage: it
 * submits and approves in the demo.
 */

const SIZES = [
  { width: 1024, height: 768 },
  { width: 820, height: 1180 },
  { width: 1440, height: 900 },
];

async function signIn(page: Page, email: string) {
  await page.context().clearCookies();
  expect((await page.request.post("/api/auth/sign-in", { data: { email, password: DEMO_PASSWORD } })).status()).toBe(204);
}

async function shoot(page: Page, name: string) {
  for (const size of SIZES) {
    await page.setViewportSize(size);
    await page.screenshot({ path: test.info().outputPath(`${name}-${size.width}x${size.height}.png`), fullPage: true });
  }
  await page.setViewportSize(SIZES[0]!);
}

async function libraryId(api: APIRequestContext): Promise<string> {
  const { projects } = (await (await api.get("/api/v1/projects")).json()) as { projects: { id: string; siteName: string }[] };
  return projects.find((p) => p.siteName === "Wrenfield Community Library")!.id;
}

/** Exhaust velocity pressures (Pa) across Ø 450 mm, 2 diameters × 8 log-linear points: invented. */
const X1_GRID = [
  [18.2, 26.4, 29.8, 33.1, 33.6, 30.2, 27.0, 19.1],
  [17.5, 25.9, 30.4, 32.7, 34.0, 29.6, 26.1, 18.4],
];

test.describe.configure({ mode: "serial" });

test("the technician submits, the agent samples and returns, the technician resubmits, the agent approves, the owner sees it", async ({ page }) => {
  test.setTimeout(240_000);
  // The technician's traverse of the exhaust trunk, read over the API (the traverse journey covers typing).
  await signIn(page, "tech@example.test");
  const projectId = await libraryId(page.request);
  const design = (await (await page.request.get(`/api/v1/projects/${projectId}`)).json()) as { systems: { id: string; tag: string; name: string }[]; sections: { id: string; tag: string; systemId: string }[] };
  const x1 = design.sections.find((s) => s.tag === "X1")!;
  const ef = design.systems.find((s) => s.tag === "EF-1")!;
  const { conditions } = (await (await page.request.get(`/api/v1/projects/${projectId}/systems/${ef.id}/conditions`)).json()) as { conditions: { id: string }[] };
  const { instruments } = (await (await page.request.get("/api/v1/instruments?kind=manometer")).json()) as { instruments: { id: string; calibrationStatus: { status: string } }[] };
  const manometer = instruments.find((i) => i.calibrationStatus.status === "ok" || i.calibrationStatus.status === "due-soon")!;
  const started = await page.request.post(`/api/v1/projects/${projectId}/traverses`, {
    data: { sectionId: x1.id, method: "log-linear", lines: 2, pointsPerLine: 8, air: { dryBulbC: 21.5, relativeHumidityPct: 42, staticPa: -180 }, conditionsId: conditions[0]!.id, instrument: { readingInstrumentId: manometer.id } },
  });
  expect(started.status()).toBe(201);
  const traverse = ((await started.json()) as { traverse: { id: string; version: number } }).traverse;
  expect((await page.request.put(`/api/v1/projects/${projectId}/traverses/${traverse.id}/readings`, { data: { version: traverse.version, readings: X1_GRID } })).status()).toBe(200);

  // Submit from the traverse page.
  await page.goto(`/projects/${projectId}/traverses/${traverse.id}`);
  const submit = page.getByRole("button", { name: "Submit for review" });
  await expect(submit).toBeEnabled();
  await shoot(page, "traverse-before-submit");
  await submit.click();
  await expect(page.getByText("Submitted for review: the readings are locked")).toBeVisible();
  const ownerBefore = await approvedCount(page, "owner@example.test");

  // The agent: the queue, a sample of EF-1 with a reading, and a return with a comment.
  await signIn(page, "cx@example.test");
  await page.goto(`/projects/${projectId}/review`);
  await expect(page.getByRole("heading", { name: "Review queue" })).toBeVisible();
  await page.getByLabel("System", { exact: true }).selectOption({ label: `EF-1 — ${ef.name}` });
  const row = page.getByRole("row", { name: /EF-1 \/ X1 Traverse/ });
  await expect(row).toBeVisible();
  await page.getByRole("button", { name: /Draw a verification sample of EF-1/ }).click();
  const sample = page.getByRole("region", { name: /EF-1/ });
  await expect(sample.getByText(/seed \d+/)).toBeVisible();
  const technicianFlow = await techFlowOf(page.request, projectId, traverse.id);
  await sample.getByLabel(/Agent's airflow/).first().fill((technicianFlow * 1000 * 1.02).toFixed(0));
  await sample.getByRole("button", { name: /Save reading of X1/ }).click();
  await expect(sample.getByText(/Agrees/).first()).toBeVisible();
  await expectNoSeriousViolations(page);
  await shoot(page, "review-queue-sample");

  await row.getByRole("button", { name: /Review/ }).click();
  const returnButton = page.getByRole("button", { name: /Return EF-1 \/ X1 with comment/ });
  await returnButton.click();
  await expect(page.getByText(/a return needs a comment/)).toBeVisible();
  await page.getByLabel(/Comment/).first().fill("Line 2 point 8 reads low against line 1: re-read it.");
  await returnButton.click();
  await expect(page.getByRole("status").filter({ hasText: /returned/ }).first()).toBeVisible();

  // The technician sees the comment, corrects the reading and submits again.
  await signIn(page, "tech@example.test");
  await page.goto(`/projects/${projectId}/traverses/${traverse.id}`);
  await expect(page.getByText("“Line 2 point 8 reads low against line 1: re-read it.”")).toBeVisible();
  const current = ((await (await page.request.get(`/api/v1/projects/${projectId}/traverses/${traverse.id}`)).json()) as { traverse: { version: number } }).traverse;
  const corrected = X1_GRID.map((r) => [...r]);
  corrected[1]![7] = 18.9;
  expect((await page.request.put(`/api/v1/projects/${projectId}/traverses/${traverse.id}/readings`, { data: { version: current.version, readings: corrected } })).status()).toBe(200);
  await page.reload();
  await page.getByRole("button", { name: "Submit again for review" }).click();
  await expect(page.getByText("Submitted for review: the readings are locked")).toBeVisible();

  // The agent approves.
  await signIn(page, "cx@example.test");
  await page.goto(`/projects/${projectId}/review`);
  await page.getByRole("row", { name: /EF-1 \/ X1 Traverse/ }).getByRole("button", { name: /Review/ }).click();
  await page.getByRole("button", { name: /Approve EF-1 \/ X1\b(?!\.)/ }).click();
  await expect(page.getByRole("row", { name: /EF-1 \/ X1 Traverse/ }).getByText("Approved")).toBeVisible();

  // The agent's Activity screen lists the decisions, newest first.
  await page.goto(`/projects/${projectId}/activity`);
  await expect(page.getByRole("cell", { name: /Approved the traverse of EF-1 \/ X1/ }).first()).toBeVisible();
  await expect(page.getByRole("cell", { name: /Returned the traverse of EF-1 \/ X1 revision \d+: “Line 2 point 8/ }).first()).toBeVisible();
  await page.getByLabel("Kind of event").selectOption("review");
  await expect(page.getByRole("cell", { name: /Submitted the traverse|Resubmitted the traverse/ }).first()).toBeVisible();
  await expectNoSeriousViolations(page);
  await shoot(page, "activity");

  // The owner sees one more approved section and the approval notice.
  expect(await approvedCount(page, "owner@example.test")).toBe(ownerBefore + 1);
  const notices = (await (await page.request.get("/api/v1/notifications")).json()) as { notifications: { kind: string; message: string }[] };
  expect(notices.notifications.some((n) => n.kind === "traverse.approved" && n.message.includes("EF-1 / X1"))).toBe(true);
  await page.goto("/projects");
  await expect(page.getByText(new RegExp(`${ownerBefore + 1} of \\d+ duct sections approved`))).toBeVisible();
});

test("the engineer's Design vs measured page shows the demo trunk's continuity as the engine gives it", async ({ page }) => {
  await signIn(page, "engineer@example.test");
  const projectId = await libraryId(page.request);
  const queue = (await (await page.request.get(`/api/v1/projects/${projectId}/review-queue`)).json()) as { items: { type: string; id: string; tag: string; systemTag: string }[] };
  const tags = ["S1", "S1.1", "S1.2", "S1.3"];
  const nodes = [];
  for (const tag of tags) {
    const item = queue.items.find((i) => i.type === "traverse" && i.systemTag === "AHU-1" && i.tag === tag)!;
    const { traverse } = (await (await page.request.get(`/api/v1/projects/${projectId}/traverses/${item.id}`)).json()) as { traverse: { engineInput: Record<string, unknown> } };
    const run = runCalcCommand("traverse", traverse.engineInput);
    if (!run.ok) throw new Error(run.error.message);
    nodes.push({ id: tag, parent: tag === "S1" ? null : "S1", mass_flow_kg_s: (run.value as { mass_flow_kg_s: number }).mass_flow_kg_s });
  }
  const network = runCalcCommand("network", { nodes, tolerance_pct: 10 });
  if (!network.ok) throw new Error(network.error.message);
  const junction = (network.value as { junctions: { id: string; imbalance_pct: number }[] }).junctions.find((j) => j.id === "S1")!;
  await page.goto(`/projects/${projectId}/systems`);
  const item = page.getByRole("listitem").filter({ hasText: "S1 → S1.1 + S1.2 + S1.3" });
  // The system view prints the imbalance signed, to two decimals, as a share of the trunk's mass flow.
  const signed = `${junction.imbalance_pct >= 0 ? "+" : "−"}${Math.abs(junction.imbalance_pct).toFixed(2)}`;
  await expect(item).toContainText(`imbalance ${signed} % by mass`);
});

async function approvedCount(page: Page, email: string): Promise<number> {
  await signIn(page, email);
  const { projects } = (await (await page.request.get("/api/v1/projects")).json()) as { projects: { siteName: string; approvedSectionCount: number }[] };
  return projects.find((p) => p.siteName === "Wrenfield Community Library")!.approvedSectionCount;
}

async function techFlowOf(api: APIRequestContext, projectId: string, traverseId: string): Promise<number> {
  const { traverse } = (await (await api.get(`/api/v1/projects/${projectId}/traverses/${traverseId}`)).json()) as { traverse: { result: { standardFlowM3S: number } } };
  return traverse.result.standardFlowM3S;
}
