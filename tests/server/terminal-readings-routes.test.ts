import { and, count, eq } from "drizzle-orm";
import psychrolib from "psychrolib";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { listTraversesForProject } from "@/db/queries/airflow";
import { reduceStoredTraverse } from "@/lib/server/airflow-view";
import { callRoute } from "../support/route-call";

const session = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), session));

const route = await import("@/app/api/v1/projects/[projectId]/terminals/[terminalId]/readings/route");
const projectRoute = await import("@/app/api/v1/projects/[projectId]/terminal-readings/route");

psychrolib.SetUnitSystem(psychrolib.SI);

const ids: Record<string, string> = {};
const terminal: Record<string, string> = {};
const system: Record<string, string> = {};
const instrument: Record<string, string> = {};
let library: string;
let clinic: string;
let ahuConditions: string;
let efConditions: string;
let singleTraverseId: string;
const UNKNOWN = "00000000-0000-4000-8000-000000000000";

const as = (email: string | null) => {
  session.userId = email === null ? undefined : ids[email];
};
const post = (tag: string, body: unknown, projectId = library) =>
  callRoute(route.POST, { method: "POST", path: `/api/v1/projects/${projectId}/terminals/${terminal[tag]}/readings`, params: { projectId, terminalId: terminal[tag] ?? tag }, body });
const get = (tag: string, projectId = library) => callRoute(route.GET, { params: { projectId, terminalId: terminal[tag] ?? tag } });
const listAll = (query = "") => callRoute(projectRoute.GET, { path: `/api/v1/projects/${library}/terminal-readings${query}`, params: { projectId: library } });

const hoodBody = (extra: Record<string, unknown> = {}) => ({
  phase: "initial",
  method: "hood",
  hoodFlowM3S: 0.3,
  hoodDensityCorrected: false,
  hoodBackPressureCompensated: true,
  dryBulbC: 18,
  relativeHumidityPct: 40,
  conditionsId: ahuConditions,
  instrumentId: instrument.hood,
  ...extra,
});

beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  for (const u of await db.select().from(s.users)) ids[u.email] = u.id;
  for (const p of await db.select().from(s.projects)) {
    if (p.siteName === "Wrenfield Community Library") library = p.id;
    else clinic = p.id;
  }
  for (const sys of await db.select().from(s.airSystems)) system[sys.tag] = sys.id;
  for (const t of await db.select().from(s.terminals)) terminal[t.tag] ??= t.id;
  // The clinic reuses some tags; keep the library's, and name the clinic's box apart.
  const clinicVav = await db
    .select({ id: s.terminals.id })
    .from(s.terminals)
    .innerJoin(s.ductSections, eq(s.ductSections.id, s.terminals.sectionId))
    .where(and(eq(s.ductSections.systemId, system["RTU-2"]!), eq(s.terminals.tag, "VAV-1")));
  terminal["clinic VAV-1"] = clinicVav[0]!.id;
  const libraryTerminals = await db
    .select({ id: s.terminals.id, tag: s.terminals.tag })
    .from(s.terminals)
    .innerJoin(s.ductSections, eq(s.ductSections.id, s.terminals.sectionId))
    .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
    .where(eq(s.airSystems.projectId, library));
  for (const t of libraryTerminals) terminal[t.tag] = t.id;

  const conditions = await db.select().from(s.operatingConditions);
  ahuConditions = conditions.filter((c) => c.systemId === system["AHU-1"]).sort((a, b) => b.recordedAt.getTime() - a.recordedAt.getTime())[0]!.id;
  efConditions = conditions.find((c) => c.systemId === system["EF-1"])!.id;

  // Instruments in calibration for as long as these tests may run, and one retired.
  const made = await db
    .insert(s.instruments)
    .values([
      { kind: "capture_hood", serial: "T-HOOD", calibrationDueOn: "2099-01-01", rangeMin: 0.012, rangeMax: 0.94, hoodCorrectionFactor: 1.02 },
      { kind: "thermal_anemometer", serial: "T-ANEMO", calibrationDueOn: "2099-01-01", rangeMin: 0.15, rangeMax: 20 },
      { kind: "capture_hood", serial: "T-RETIRED", calibrationDueOn: "2099-01-01", retiredAt: new Date("2026-01-01T00:00:00Z") },
    ])
    .returning();
  instrument.hood = made[0]!.id;
  instrument.anemometer = made[1]!.id;
  instrument.retired = made[2]!.id;
  instrument.overdue = (await db.select().from(s.instruments).where(eq(s.instruments.serial, "VA-7702")))[0]!.id;
  instrument.air = (await db.select().from(s.instruments).where(eq(s.instruments.serial, "TH-2209")))[0]!.id;

  // A VAV box on its own branch below S1 with a traverse of that branch (its own duct), and a second box on S1.3.
  const [s1] = await db.select().from(s.ductSections).where(and(eq(s.ductSections.systemId, system["AHU-1"]!), eq(s.ductSections.tag, "S1")));
  const [s13] = await db.select().from(s.ductSections).where(and(eq(s.ductSections.systemId, system["AHU-1"]!), eq(s.ductSections.tag, "S1.3")));
  const [own] = await db
    .insert(s.ductSections)
    .values({ systemId: system["AHU-1"]!, parentId: s1!.id, tag: "S1.9", kind: "branch", shape: "round", diameterMm: 500, designFlowM3S: 1.1 })
    .returning();
  const [vav] = await db
    .insert(s.terminals)
    .values([
      { sectionId: own!.id, tag: "VAV-9", type: "vav_box", designFlowM3S: 1.1, designMinFlowM3S: 0.33, controllerFlowFactor: 0.87 },
      { sectionId: s13!.id, tag: "VAV-8", type: "vav_box", designFlowM3S: 0.3, designMinFlowM3S: 0, designHeatingFlowM3S: 0.15, controllerFlowFactor: 1.1 },
    ])
    .returning();
  terminal["VAV-9"] = vav!.id;
  terminal["VAV-8"] = (await db.select().from(s.terminals).where(eq(s.terminals.tag, "VAV-8")))[0]!.id;
  // The demo's S1.3 grid, copied onto S1.9 (the same Ø 500 duct).
  const [s13Traverse] = await db.select().from(s.traverses).where(eq(s.traverses.sectionId, s13!.id));
  const { id: _id, createdAt: _c, updatedAt: _u, ...copy } = s13Traverse!;
  void _id;
  void _c;
  void _u;
  const [t] = await db.insert(s.traverses).values({ ...copy, sectionId: own!.id, status: "draft" }).returning();
  const points = await db.select().from(s.readings).where(eq(s.readings.traverseId, s13Traverse!.id));
  await db.insert(s.readings).values(points.map((p) => ({ traverseId: t!.id, line: p.line, point: p.point, value: p.value })));
  singleTraverseId = t!.id;
});

afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

describe("who may read and record", () => {
  it("lets every member read a terminal's history and the project's readings, and answers 401 signed out", async () => {
    as(null);
    expect((await get("SD-101")).status).toBe(401);
    expect((await listAll()).status).toBe(401);
    for (const email of ["owner@example.test", "cx@example.test", "engineer@example.test", "tech@example.test", "admin@example.test"]) {
      as(email);
      const res = await get("SD-101");
      expect(res.status, email).toBe(200);
      expect(res.body.terminal.tag).toBe("SD-101");
      expect(res.body.readings.length).toBeGreaterThan(0);
      expect((await listAll()).status, email).toBe(200);
    }
  });

  it("refuses owners, engineers, commissioning agents and site administrators (403) before reading the body; signed out 401", async () => {
    for (const email of ["owner@example.test", "engineer@example.test", "cx@example.test", "admin@example.test"]) {
      as(email);
      const res = await callRoute(route.POST, { method: "POST", params: { projectId: library, terminalId: terminal["SD-101"]! }, rawBody: "{" });
      expect(res.status, email).toBe(403);
    }
    as(null);
    expect((await post("SD-101", hoodBody())).status).toBe(401);
  });

  it("answers another project's terminal exactly like an unknown one (404), before looking at the body", async () => {
    as("engineer@example.test"); // a member of both projects
    const foreign = await get("clinic VAV-1");
    const unknown = await get(UNKNOWN);
    const garbage = await get("not-an-id");
    expect([foreign.status, unknown.status, garbage.status]).toEqual([404, 404, 404]);
    expect(foreign.body).toEqual(unknown.body);
    expect(garbage.body).toEqual(unknown.body);
    as("tech@example.test");
    const posted = await callRoute(route.POST, { method: "POST", params: { projectId: library, terminalId: terminal["clinic VAV-1"]! }, rawBody: "{" });
    expect(posted.status).toBe(404);
    expect((await post("clinic VAV-1", hoodBody(), clinic)).status).toBe(404); // not a member of the clinic at all
  });
});

describe("POST …/terminals/{terminalId}/readings", () => {
  it("records a hood reading the hood did not density-correct, referred to standard air with the air at the outlet (psychrolib), with % of design and the verdict", async () => {
    as("tech@example.test");
    const res = await post("SD-111", hoodBody({ hoodFlowM3S: 0.26, dryBulbC: 17, relativeHumidityPct: 40 }));
    expect(res.status).toBe(201);
    const r = res.body.reading;
    // Density at the library's 210 m (standard atmosphere), room pressure, 17 °C, 40 % RH, from psychrolib.
    const p = psychrolib.GetStandardAtmPressure(210);
    const rho = psychrolib.GetMoistAirDensity(17, psychrolib.GetHumRatioFromRelHum(17, 0.4, p), p);
    const standard = (0.26 * 1.02 * rho) / 1.204; // the register's factor 1.02 for this hood
    expect(r.hoodCorrectionFactor).toBe(1.02);
    expect(r.flowM3S).toBeCloseTo(0.2652, 12);
    expect(r.standardFlowM3S).toBeCloseTo(standard, 6);
    expect(r.densityKgM3).toBeCloseTo(rho, 6);
    expect(r.designFlowM3S).toBe(0.28);
    expect(r.pctOfDesign).toBeCloseTo((100 * standard) / 0.28, 6);
    expect(r.withinTolerance).toBe(true);
    expect(r.tolerance).toEqual({ minusPct: 10, plusPct: 10 });
    expect(r.steps.join(" ")).toContain("Not density-corrected by the hood: referred to standard air");
    expect(r.flags).toEqual([]);
    expect(r.setpoint).toBe("design");
    expect(r.takenByName).toBe("Tomasz Reyes");

    const db = await getDb();
    const [audit] = await db.select().from(s.auditLog).where(eq(s.auditLog.entityId, r.id));
    expect(audit).toMatchObject({ action: "terminal.reading_recorded", projectId: library, userId: ids["tech@example.test"], entityType: "terminal_reading" });
    expect((audit!.detail as { terminalTag: string; verdict: string }).terminalTag).toBe("SD-111");
  });

  it("takes a density-corrected hood's figure as standard airflow", async () => {
    as("tech@example.test");
    const res = await post("SD-112", hoodBody({ hoodFlowM3S: 0.25, hoodDensityCorrected: true, hoodCorrectionFactor: 1 }));
    expect(res.status).toBe(201);
    expect(res.body.reading.standardFlowM3S).toBeCloseTo(0.25, 12);
    expect(res.body.reading.flowM3S).toBeGreaterThan(0.25); // the library's air is lighter than standard air
  });

  it("records velocity × effective area: the velocities averaged times the Ak typed for the reading", async () => {
    as("tech@example.test");
    const res = await post("SD-113", {
      phase: "initial",
      method: "velocity_area",
      velocitiesMS: [2.4, 2.6, 2.5, 2.7],
      velocityBasis: "standard",
      effectiveAreaM2: 0.11,
      dryBulbC: 16,
      conditionsId: ahuConditions,
      instrumentId: instrument.anemometer,
      airInstrumentId: instrument.air,
    });
    expect(res.status).toBe(201);
    expect(res.body.reading.meanVelocityMS).toBeCloseTo(2.55, 12);
    expect(res.body.reading.standardFlowM3S).toBeCloseTo(2.55 * 0.11, 12);
    expect(res.body.reading.warnings.join(" ")).toContain("50 % RH was assumed");
  });

  it("keeps every re-reading: initial, then final readings after adjustment, none overwritten, the latest of each phase picked", async () => {
    as("tech@example.test");
    const first = await post("SD-114", hoodBody({ hoodFlowM3S: 0.2, takenAt: new Date(Date.now() - 120_000).toISOString() }));
    const adjusted = await post("SD-114", hoodBody({ phase: "final", hoodFlowM3S: 0.27, damperMarked: false, takenAt: new Date(Date.now() - 60_000).toISOString() }));
    const again = await post("SD-114", hoodBody({ phase: "final", hoodFlowM3S: 0.285, damperMarked: true }));
    expect([first.status, adjusted.status, again.status]).toEqual([201, 201, 201]);
    expect(adjusted.body.reading.flags.join(" ")).toContain("without the damper position marked");
    expect(again.body.reading.flags).toEqual([]);
    const history = await get("SD-114");
    expect(history.body.readings.map((r: { id: string }) => r.id)).toEqual([again.body.reading.id, adjusted.body.reading.id, first.body.reading.id]);
    expect(history.body.latest.design.initial.id).toBe(first.body.reading.id);
    expect(history.body.latest.design.final.id).toBe(again.body.reading.id);
    expect(history.body.latest.design.final.damperMarked).toBe(true);
  });

  it("keeps readings in the system's open terminal set, refuses them while it is submitted, and opens the next revision once it is approved", async () => {
    as("tech@example.test");
    const db = await getDb();
    const [open] = await db.select().from(s.terminalSets).where(and(eq(s.terminalSets.systemId, system["EF-1"]!), eq(s.terminalSets.status, "draft")));
    const res = await post("EG-211", hoodBody({ hoodFlowM3S: 0.19, conditionsId: efConditions }));
    expect(res.status).toBe(201);
    expect(res.body.reading.setId).toBe(open!.id);
    const [after] = await db.select().from(s.terminalSets).where(eq(s.terminalSets.id, open!.id));
    expect(after!.version).toBe(open!.version + 1);

    // Submitted: the system's readings are locked while the commissioning agent reviews them.
    await db.update(s.terminalSets).set({ status: "submitted" }).where(eq(s.terminalSets.id, open!.id));
    const locked = await post("EG-212", hoodBody({ hoodFlowM3S: 0.21, conditionsId: efConditions }));
    expect(locked.status).toBe(409);
    expect(locked.body.error.message).toMatch(/submitted for review and locked/);
    // Approved: the next reading opens revision 2 in draft.
    await db.update(s.terminalSets).set({ status: "approved" }).where(eq(s.terminalSets.id, open!.id));
    const next = await post("EG-212", hoodBody({ hoodFlowM3S: 0.21, conditionsId: efConditions }));
    expect(next.status).toBe(201);
    expect(next.body.reading.setId).not.toBe(open!.id);
    const [created] = await db.select().from(s.terminalSets).where(eq(s.terminalSets.id, next.body.reading.setId));
    expect(created).toMatchObject({ status: "draft", revision: 2, systemId: system["EF-1"] });
    const listed = await listAll(`?systemId=${system["EF-1"]}`);
    expect(listed.body.sets.map((x: { revision: number; status: string }) => `${x.revision}:${x.status}`)).toEqual(["2:draft", "1:approved"]);
  });

  it("stores a retried create once: the same client id answers 200 with the stored reading; on another terminal, 409", async () => {
    as("tech@example.test");
    const id = "3c0a7b52-5d0e-4f7e-9a1b-2c3d4e5f6a70";
    const first = await post("SD-115", hoodBody({ id }));
    const again = await post("SD-115", hoodBody({ id }));
    expect([first.status, again.status]).toEqual([201, 200]);
    expect(again.body.reading).toEqual(first.body.reading);
    const db = await getDb();
    const [n] = await db.select({ n: count() }).from(s.terminalReadings).where(eq(s.terminalReadings.id, id));
    expect(n!.n).toBe(1);
    const audits = await db.select().from(s.auditLog).where(eq(s.auditLog.entityId, id));
    expect(audits).toHaveLength(1);
    expect((await post("SD-101", hoodBody({ id }))).status).toBe(409);
  });

  it("answers 400 naming each field: what the method needs, fields of another method, values out of bounds", async () => {
    as("tech@example.test");
    const res = await post("SD-101", { phase: "later", method: "hood", velocitiesMS: [1], dryBulbC: 90, conditionsId: "x" });
    expect(res.status).toBe(400);
    const f = res.body.error.fields;
    expect(f.phase).toContain('"initial", "final"');
    expect(f.hoodFlowM3S).toContain("give the hood's reading");
    expect(f.hoodDensityCorrected).toContain("density");
    expect(f.hoodBackPressureCompensated).toContain("back pressure");
    expect(f.velocitiesMS).toContain("belongs to another method");
    expect(f.dryBulbC).toBe("must be a number from -30 to 60 °C, or null; got 90");
    expect(f.conditionsId).toContain("must be the id of operating conditions");
    const velocity = await post("SD-101", { phase: "initial", method: "velocity_area", velocitiesMS: [2, 80], velocityBasis: "sideways", dryBulbC: 18, conditionsId: ahuConditions, instrumentId: instrument.anemometer });
    expect(Object.keys(velocity.body.error.fields).sort()).toEqual(["velocitiesMS.1", "velocityBasis"]);
    const noAk = await post("SD-101", { phase: "initial", method: "velocity_area", velocitiesMS: [2, 2.1], velocityBasis: "actual", dryBulbC: 18, conditionsId: ahuConditions, instrumentId: instrument.anemometer });
    expect(noAk.body.error.fields.effectiveAreaM2).toContain("the terminal has none on record");
    const future = await post("SD-101", hoodBody({ takenAt: new Date(Date.now() + 86_400_000).toISOString() }));
    expect(future.body.error.fields.takenAt).toContain("cannot be in the future");
  });

  it("checks the reading against the terminal, its system's conditions and the register", async () => {
    as("tech@example.test");
    const wrong = await post("SD-101", hoodBody({ setpoint: "maximum", controllerFlowM3S: 0.3, conditionsId: efConditions, instrumentId: instrument.anemometer, airInstrumentId: instrument.hood }));
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields).toMatchObject({
      setpoint: 'an outlet or inlet is read at "design"; got "maximum"',
      controllerFlowM3S: expect.stringContaining("belongs to terminal units"),
      conditionsId: "is not a record of AHU-1's operating conditions",
      instrumentId: expect.stringContaining("is not a capture hood"),
      airInstrumentId: expect.stringContaining("is not a thermo-hygrometer"),
    });
    const none = await post("SD-101", hoodBody({ conditionsId: undefined, instrumentId: undefined }));
    expect(Object.keys(none.body.error.fields).sort()).toEqual(["conditionsId", "instrumentId"]);
    const retired = await post("SD-101", hoodBody({ instrumentId: instrument.retired }));
    expect(retired.body.error.fields.instrumentId).toBe("Instrument T-RETIRED: retired on 1 Jan 2026; choose another instrument.");
  });

  it("asks for a stated reason when an instrument is past its calibration due date, and records it with one", async () => {
    as("tech@example.test");
    const body = { phase: "initial", method: "velocity_area", velocitiesMS: [2.4, 2.5, 2.6], velocityBasis: "actual", effectiveAreaM2: 0.1, dryBulbC: 17, conditionsId: ahuConditions, instrumentId: instrument.overdue };
    const refused = await post("SD-121", body);
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.overdueReason).toContain("State why VA-7702 (calibration past due since 2 Oct 2026");
    const kept = await post("SD-121", { ...body, overdueReason: "Only vane anemometer on site; checked against the hood at SD-101." });
    expect(kept.status).toBe(201);
    expect(kept.body.reading.overdueReason).toContain("Only vane anemometer");
  });

  it("flags implausible readings in words and keeps them: negative, above 3 × design, beyond the instrument's range", async () => {
    as("tech@example.test");
    const high = await post("SD-122", hoodBody({ hoodFlowM3S: 0.95 }));
    expect(high.status).toBe(201);
    expect(high.body.reading.flags.join(" ")).toMatch(/more than 3 times the design airflow/);
    expect(high.body.reading.flags.join(" ")).toContain("Beyond the range of capture hood T-HOOD");
    const negative = await post("SD-123", {
      phase: "initial",
      method: "velocity_area",
      velocitiesMS: [-1.2, -1.1, -0.9],
      velocityBasis: "standard",
      effectiveAreaM2: 0.1,
      dryBulbC: 18,
      conditionsId: ahuConditions,
      instrumentId: instrument.anemometer,
    });
    expect(negative.status).toBe(201);
    expect(negative.body.reading.standardFlowM3S).toBeLessThan(0);
    expect(negative.body.reading.flags[0]).toContain("Negative airflow");
    expect(negative.body.reading.flags.join(" ")).toContain("Beyond the range of thermal anemometer T-ANEMO (0.15 m/s to 20.00 m/s): reading 1: -1.20 m/s");
    expect(negative.body.reading.withinTolerance).toBe(false);
  });

  it("reads a terminal unit at maximum and minimum against its design, with the controller's display and the corrected flow factor", async () => {
    as("tech@example.test");
    const missing = await post("VAV-8", hoodBody());
    expect(missing.body.error.fields.setpoint).toBe('say which setpoint VAV-8 was forced to: "maximum", "minimum", "heating"');
    const max = await post("VAV-8", hoodBody({ setpoint: "maximum", hoodFlowM3S: 0.28, hoodDensityCorrected: true, hoodCorrectionFactor: 1, controllerFlowM3S: 0.31 }));
    expect(max.status).toBe(201);
    const r = max.body.reading;
    expect(r.designFlowM3S).toBe(0.3);
    expect(r.pctOfDesign).toBeCloseTo((100 * 0.28) / 0.3, 9);
    expect(r.controllerRatio).toBeCloseTo(0.28 / 0.31, 12);
    // new factor = old × (measured/displayed)²
    expect(r.suggestedFlowFactor).toBeCloseTo(1.1 * (0.28 / 0.31) ** 2, 12);
    expect(r.controllerFlowFactor).toBe(1.1);
    const min = await post("VAV-8", hoodBody({ setpoint: "minimum", hoodFlowM3S: 0.004, hoodDensityCorrected: true, controllerFlowM3S: 0, controllerFlowFactor: 1.05 }));
    expect(min.status).toBe(201);
    expect(min.body.reading.pctOfDesign).toBeNull();
    expect(min.body.reading.flags.join(" ")).toContain("design minimum airflow is zero");
    const heating = await post("VAV-9", hoodBody({ setpoint: "heating" }));
    expect(heating.body.error.fields.setpoint).toContain("VAV-9 has no heating airflow scheduled");
  });

  it("takes a terminal unit's airflow from a traverse of its own duct, exactly as the engine reduces it", async () => {
    as("tech@example.test");
    const res = await post("VAV-9", { phase: "initial", method: "traverse", setpoint: "maximum", traverseId: singleTraverseId, controllerFlowM3S: 1.0 });
    expect(res.status).toBe(201);
    const db = await getDb();
    const [project] = await db.select().from(s.projects).where(eq(s.projects.id, library));
    const stored = (await listTraversesForProject({ projectId: library })).find((t) => t.id === singleTraverseId)!;
    const [section] = await db.select().from(s.ductSections).where(eq(s.ductSections.id, stored.sectionId));
    const reduced = reduceStoredTraverse(stored, section!, project!);
    expect(reduced.ok).toBe(true);
    if (!reduced.ok) return;
    expect(res.body.reading.standardFlowM3S).toBe(reduced.result.standardFlowM3S);
    expect(res.body.reading.flowM3S).toBe(reduced.result.flowM3S);
    expect(res.body.reading.conditionsId).toBe(stored.conditionsId);
    expect(res.body.reading.traverseVersion).toBe(stored.version);

    // A traverse of a branch that feeds several outlets is not one outlet's airflow.
    const s11 = (await listTraversesForProject({ projectId: library })).find((t) => t.status === "approved")!;
    const shared = await post("SD-101", { phase: "initial", method: "traverse", traverseId: s11.id });
    expect(shared.status).toBe(400);
    expect(shared.body.error.fields.traverseId).toMatch(/feeds 4 terminals|is a traverse of/);
  });

  it("warns when the reading's operating conditions differ from the terminal's previous reading", async () => {
    as("tech@example.test");
    const db = await getDb();
    const [older] = await db.select().from(s.operatingConditions).where(eq(s.operatingConditions.systemId, system["AHU-1"]!)).orderBy(s.operatingConditions.recordedAt).limit(1);
    const res = await post("SD-124", hoodBody({ phase: "final", damperMarked: true, conditionsId: older!.id }));
    expect(res.status).toBe(201);
    expect(res.body.warnings.join(" ")).toContain("Not comparable with the previous initial reading of SD-124");
    expect(res.body.warnings.join(" ")).toContain("Fan speed: 1,150 rpm for the previous initial reading, 1,100 rpm for this reading");
  });
});

describe("GET …/terminal-readings", () => {
  it("lists the project's readings newest first with the conditions they name, narrowed by system; refuses an unknown parameter or system", async () => {
    as("owner@example.test");
    const all = await listAll();
    expect(all.status).toBe(200);
    const times = all.body.readings.map((r: { takenAt: string }) => Date.parse(r.takenAt));
    expect([...times].sort((a, b) => b - a)).toEqual(times);
    const named = new Set(all.body.readings.map((r: { conditionsId: string }) => r.conditionsId));
    expect(all.body.conditions.map((c: { id: string }) => c.id).sort()).toEqual([...named].filter(Boolean).sort());
    const ef = await listAll(`?systemId=${system["EF-1"]}`);
    expect(ef.body.readings.every((r: { systemId: string }) => r.systemId === system["EF-1"])).toBe(true);
    expect(ef.body.readings.map((r: { terminalTag: string }) => r.terminalTag)).toContain("EG-203");
    expect((await listAll(`?systemId=${system["RTU-2"]}`)).status).toBe(404);
    expect((await listAll("?sort=tag")).status).toBe(400);
  });

  it("shows the demo's out-of-tolerance outlets as such", async () => {
    as("engineer@example.test");
    const ef = await listAll(`?systemId=${system["EF-1"]}`);
    const eg203 = ef.body.readings.find((r: { terminalTag: string; phase: string }) => r.terminalTag === "EG-203");
    expect(eg203.withinTolerance).toBe(false);
    expect(eg203.pctOfDesign).toBeLessThan(90);
  });
});
