import { eq, isNotNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { latestConditionsBySystem, listConditionsForSystem } from "@/db/queries/conditions";
import { countTerminalsBySystem } from "@/db/queries/field";
import { listInstrumentsUsedInProject } from "@/db/queries/instruments";
import { DEMO_INSTRUMENTS } from "@/db/seed/instruments";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { compareConditions } from "@/lib/airflow/conditions";
import { instrumentUsability } from "@/lib/instruments/usability";
import { conditionsCreateSchema } from "@/lib/validation/conditions";
import { terminalReadingCreateSchema } from "@/lib/validation/terminal-readings";
import { computeReadingFlow } from "@/lib/terminals/reading";
import { withinTolerance } from "@/lib/airflow/balancing";
import { toleranceFor } from "@/lib/airflow/tolerance";
import { instrumentCreateSchema, instrumentRecordProblems } from "@/lib/validation/instruments";

let libraryId: string;
beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  const [library] = await db.select().from(s.projects).where(eq(s.projects.siteName, "Wrenfield Community Library"));
  libraryId = library!.id;
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

describe("the demo instrument register and operating conditions", () => {
  it("holds only instruments the API itself would accept", () => {
    for (const i of DEMO_INSTRUMENTS) {
      const parsed = instrumentCreateSchema.safeParse(i);
      expect(parsed.error?.issues ?? [], i.serial).toEqual([]);
      expect(instrumentRecordProblems(parsed.data!, "2026-12-02"), i.serial).toEqual({});
    }
  });

  it("shows every calibration status on the demo's 'today' (2 Dec 2026)", async () => {
    const db = await getDb();
    const rows = await db.select().from(s.instruments);
    const status = Object.fromEntries(rows.map((r) => [r.serial, instrumentUsability(r, "2026-12-02").status]));
    expect(status).toMatchObject({ "MM-30418": "ok", "TA-5521": "due-soon", "VA-7702": "overdue", "CM-8836": "no-due-date" });
    expect(rows.filter((r) => r.kind === "pitot_tube").map((r) => r.probeHeadDiameterMm)).toEqual([8, 8]);
  });

  it("links every supply traverse to its manometer, pitot tube, air instrument and conditions", async () => {
    const db = await getDb();
    const linked = await db.select().from(s.traverses).where(isNotNull(s.traverses.instrumentId));
    expect(linked).toHaveLength(4);
    const used = await listInstrumentsUsedInProject({ projectId: libraryId });
    // Four traverses name the manometer, the tube and the thermo-hygrometer; the twelve demo hood readings name the hood and the thermo-hygrometer.
    expect(Object.fromEntries(used.map((u) => [u.instrument.serial, u.uses]))).toEqual({ "MM-30418": 4, "PT-0931": 4, "TH-2209": 16, "CH-7710": 12 });
    // Each traverse was taken with instruments in calibration on its day.
    for (const t of linked) for (const u of used) expect(instrumentUsability(u.instrument, t.takenAt!).ok).toBe(true);
    const conditionIds = new Set(linked.map((t) => t.conditionsId));
    expect(conditionIds.size).toBe(1);
  });

  it("keeps the conditions history per system, newest first, with the demo's change of fan speed", async () => {
    const db = await getDb();
    const systems = await db.select().from(s.airSystems).where(eq(s.airSystems.projectId, libraryId));
    const ahu = systems.find((x) => x.tag === "AHU-1")!;
    const [now, before] = await listConditionsForSystem({ systemId: ahu.id });
    expect(now!.fanSpeedRpm).toBe(1150);
    expect(now!.recordedByName).toBe("Tomasz Reyes");
    // The seeded records are ones the API would accept from a tablet.
    for (const c of [now!, before!]) {
      const { fanSpeedRpm, vfdHz, boxes, outsideAirDamperPct, ductStaticSetpointPa, filterState, notes } = c;
      expect(conditionsCreateSchema.safeParse({ fanSpeedRpm, vfdHz, boxes, outsideAirDamperPct, ductStaticSetpointPa, filterState, notes }).error?.issues ?? []).toEqual([]);
    }
    expect(compareConditions(before!, now!).map((d) => d.field)).toEqual(["fanSpeed", "outsideAirDamperPct", "filterState"]);
    const latest = await latestConditionsBySystem({ systemIds: systems.map((x) => x.id) });
    expect(latest.get(ahu.id)!.id).toBe(now!.id);
    expect(latest.size).toBe(2);
    const counts = await countTerminalsBySystem({ projectId: libraryId });
    expect(counts.get(ahu.id)).toEqual({ outlets: 13, terminalUnits: 0 });
  });
});

describe("the demo terminal readings", () => {
  it("are initial hood readings the API would accept, stored with the airflow the engine gives, a few outside tolerance", async () => {
    const db = await getDb();
    const rows = await db.select().from(s.terminalReadings);
    const project = (await db.select().from(s.projects).where(eq(s.projects.id, libraryId)))[0]!;
    const terminals = new Map((await db.select().from(s.terminals)).map((t) => [t.id, t]));
    expect(rows).toHaveLength(12);
    let outside = 0;
    for (const r of rows) {
      expect(r.phase).toBe("initial");
      const body = {
        phase: r.phase,
        method: r.method,
        hoodFlowM3S: r.hoodFlowM3S,
        hoodCorrectionFactor: r.hoodCorrectionFactor,
        hoodDensityCorrected: r.hoodDensityCorrected,
        hoodBackPressureCompensated: r.hoodBackPressureCompensated,
        dryBulbC: r.dryBulbC,
        relativeHumidityPct: r.relativeHumidityPct,
        conditionsId: r.conditionsId,
        instrumentId: r.instrumentId,
        airInstrumentId: r.airInstrumentId,
      };
      expect(terminalReadingCreateSchema.safeParse(body).error?.issues ?? []).toEqual([]);
      const terminal = terminals.get(r.terminalId)!;
      const flow = computeReadingFlow({ ...body, setpoint: r.setpoint, velocitiesMS: null, velocityBasis: null, effectiveAreaM2: null, barometricPa: null, controllerFlowM3S: null, controllerFlowFactor: null, damperMarked: false, method: "hood", phase: "initial", hoodFlowM3S: r.hoodFlowM3S, hoodDensityCorrected: r.hoodDensityCorrected }, terminal, project);
      expect(r.standardFlowM3S).toBe(flow.standardFlowM3S);
      if (!withinTolerance(r.standardFlowM3S, terminal.designFlowM3S, toleranceFor(project, "outlet"))) outside += 1;
    }
    expect(outside).toBe(3);
  });

  it("sit in one open draft set per system, whose version counts them", async () => {
    const db = await getDb();
    const sets = await db.select().from(s.terminalSets);
    expect(sets.map((x) => x.status)).toEqual(["draft", "draft"]);
    for (const set of sets) {
      const n = (await db.select().from(s.terminalReadings).where(eq(s.terminalReadings.setId, set.id))).length;
      expect(set.version).toBe(1 + n);
    }
  });
});
