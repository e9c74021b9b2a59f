import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { getProjectDesign, listTraversesForProject } from "@/db/queries/airflow";
import { listProjectsForUser } from "@/db/queries/projects";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { buildAirflowView, reduceStoredTraverse, type SystemView } from "@/lib/server/airflow-view";

let views: SystemView[];
beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  const [project] = await db.select().from(s.projects).where(eq(s.projects.siteName, "Wrenfield Community Library"));
  const [design, traverses] = await Promise.all([getProjectDesign({ projectId: project!.id }), listTraversesForProject({ projectId: project!.id })]);
  views = buildAirflowView(project!, design, traverses);
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

describe("design against measured for the demo project", () => {
  it("reduces every stored traverse and orders each duct tree trunk first", () => {
    const supply = views.find((v) => v.system.tag === "AHU-1")!;
    expect(supply.sections.map((r) => [r.section.tag, r.depth])).toEqual([
      ["S1", 0],
      ["S1.1", 1],
      ["S1.2", 1],
      ["S1.3", 1],
    ]);
    for (const row of supply.sections) {
      expect(row.reduction?.ok).toBe(true);
      if (!row.reduction?.ok) continue;
      const r = row.reduction.result;
      // Continuity of definitions: ṁ = ρ·Q and Q_std = ṁ/ρ_std (ASHRAE Fundamentals, definitions of standard air flow).
      expect(r.massFlowKgS).toBeCloseTo(r.densityKgM3 * r.flowM3S, 9);
      expect(r.standardFlowM3S).toBeCloseTo(r.massFlowKgS / 1.204, 9);
      expect(row.pctOfDesign).toBeCloseTo((100 * r.standardFlowM3S) / row.section.designFlowM3S, 9);
    }
  });

  it("checks the trunk junction by mass and says which junctions still wait for readings", () => {
    const supply = views.find((v) => v.system.tag === "AHU-1")!;
    const [junction] = supply.junctions;
    expect(junction?.status).toBe("checked");
    if (junction?.status !== "checked") return;
    const mass = (tag: string) => {
      const row = supply.sections.find((r) => r.section.tag === tag)!;
      return row.reduction?.ok ? row.reduction.result.massFlowKgS : NaN;
    };
    const children = mass("S1.1") + mass("S1.2") + mass("S1.3");
    expect(junction.junction.childrenMassFlowKgS).toBeCloseTo(children, 9);
    expect(junction.junction.imbalancePct).toBeCloseTo((100 * (mass("S1") - children)) / mass("S1"), 9);

    const exhaust = views.find((v) => v.system.tag === "EF-1")!;
    expect(exhaust.junctions).toEqual([expect.objectContaining({ status: "waiting", missing: ["X1", "X1.1", "X1.2"] })]);
  });

  it("plans branch balancing from the lowest ratio and projects the fan speed by the fan laws", () => {
    const supply = views.find((v) => v.system.tag === "AHU-1")!;
    const ratio = (tag: string) => {
      const row = supply.sections.find((r) => r.section.tag === tag)!;
      return row.reduction?.ok ? row.reduction.result.standardFlowM3S / row.section.designFlowM3S : NaN;
    };
    const [plan] = supply.branchPlans;
    const lowest = ["S1.1", "S1.2", "S1.3"].sort((a, b) => ratio(a) - ratio(b))[0];
    // Proportional balancing (common practice): the lowest measured/design ratio is the reference and stays open.
    expect(plan?.indexTerminal).toBe(lowest);
    expect(plan?.steps[0]).toMatchObject({ id: lowest, role: "index" });

    // Fan laws (airflow-methods.md §6): N₂ = N₁·Q₂/Q₁, p ∝ N², P ∝ N³.
    const fan = supply.fan!;
    // S1 carries the whole fan and its design equals AHU-1's, so the speed ratio is 1 / S1's ratio.
    const n = 1 / ratio("S1");
    expect(fan.targetSpeedRpm).toBeCloseTo(1150 * n, 6);
    expect(fan.pressureFactor).toBeCloseTo(n ** 2, 9);
    expect(fan.powerFactor).toBeCloseTo(n ** 3, 9);
    expect(views.find((v) => v.system.tag === "EF-1")!.fan).toBeNull();
  });

  it("passes the project's altitude with a measured barometer, and a missing static pressure as assumed, not as a silent 0", async () => {
    const row = views.find((v) => v.system.tag === "AHU-1")!.sections.find((r) => r.latest && r.reduction?.ok)!;
    const db = await getDb();
    const [project] = await db.select().from(s.projects).where(eq(s.projects.siteName, "Wrenfield Community Library"));
    // A sea-level-corrected weather report (101 325 Pa) at a 1500 m site, whose standard atmosphere is 84 556 Pa
    // (ASHRAE Fundamentals ch. 1 eq. 3), and no static pressure recorded.
    const stored = { ...row.latest!, barometricPa: 101_325, staticPa: null };
    const reduced = reduceStoredTraverse(stored, row.section, { ...project!, altitudeM: 1500 });
    expect(reduced.ok).toBe(true);
    if (!reduced.ok) return;
    expect(reduced.result.air.barometricSource).toBe("measured");
    expect(reduced.result.air.staticAssumed).toBe(true);
    expect(reduced.result.warnings.join(" ")).toMatch(/sea-level-corrected/);
    expect(reduced.result.warnings.join(" ")).toMatch(/static pressure was not given/);
  });

  it("counts progress in the project list by each section's newest traverse, as the screens do", async () => {
    const db = await getDb();
    const [project] = await db.select().from(s.projects).where(eq(s.projects.siteName, "Wrenfield Community Library"));
    const [tech] = await db.select().from(s.users).where(eq(s.users.email, "tech@example.test"));
    const summary = async () => (await listProjectsForUser({ userId: tech!.id, isAdmin: false }))[0]!;
    expect(await summary()).toMatchObject({ approvedSectionCount: 2, submittedTraverseCount: 2 });

    // A re-traverse of the approved branch S1.1, returned by the reviewer, supersedes its approval.
    const east = views.find((v) => v.system.tag === "AHU-1")!.sections.find((r) => r.section.tag === "S1.1")!.section;
    await db.insert(s.traverses).values({ sectionId: east.id, method: "log-linear", lines: 2, pointsPerLine: 8, status: "returned", createdAt: new Date(Date.now() + 60_000) });

    const [design, traverses] = await Promise.all([getProjectDesign({ projectId: project!.id }), listTraversesForProject({ projectId: project!.id })]);
    const screenRows = buildAirflowView(project!, design, traverses).flatMap((v) => v.sections);
    const onScreen = (status: string) => screenRows.filter((r) => r.latest?.status === status).length;
    expect(onScreen("approved")).toBe(1);
    expect(await summary()).toMatchObject({ approvedSectionCount: onScreen("approved"), submittedTraverseCount: onScreen("submitted") });
  });
});
