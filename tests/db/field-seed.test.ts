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
    expect(used.map((u) => u.instrument.serial).sort()).toEqual(["MM-30418", "PT-0931", "TH-2209"]);
    expect(used.every((u) => u.uses === 4)).toBe(true);
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
