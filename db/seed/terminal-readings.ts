import { and, desc, eq, inArray } from "drizzle-orm";
import { computeReadingFlow, readingColumns, type ReadingValues } from "@/lib/terminals/reading";
import * as s from "../schema";
import type { Tx } from "./index";

/**
 * Initial (as found) capture-hood readings of some of the library's outlets, taken after the demo
 * traverses under the same recorded operating conditions. Invented numbers: most outlets within
 * ±10 % of design, a few outside it (SD-104 and EG-203 starved, SD-122 over), and the west reading
 * room's slot diffusers and the workshop grilles not read yet, so the screens show every state.
 */
const DEMO_HOOD_READINGS: { tag: string; readingM3S: number; dryBulbC: number; minutes: number }[] = [
  // AHU-1 supply at the diffusers, just under 16 °C after the ceiling run.
  { tag: "SD-101", readingM3S: 0.352, dryBulbC: 15.9, minutes: 0 },
  { tag: "SD-102", readingM3S: 0.398, dryBulbC: 15.8, minutes: 4 },
  { tag: "SD-103", readingM3S: 0.347, dryBulbC: 15.9, minutes: 8 },
  { tag: "SD-104", readingM3S: 0.318, dryBulbC: 16.1, minutes: 12 },
  { tag: "SD-121", readingM3S: 0.262, dryBulbC: 16.2, minutes: 25 },
  { tag: "SD-122", readingM3S: 0.309, dryBulbC: 16.2, minutes: 29 },
  { tag: "SD-123", readingM3S: 0.281, dryBulbC: 16.3, minutes: 33 },
  { tag: "SD-124", readingM3S: 0.255, dryBulbC: 16.3, minutes: 37 },
  // EF-1 exhaust grilles, room air.
  { tag: "EG-201", readingM3S: 0.131, dryBulbC: 21.4, minutes: 55 },
  { tag: "EG-202", readingM3S: 0.118, dryBulbC: 21.3, minutes: 59 },
  { tag: "EG-203", readingM3S: 0.097, dryBulbC: 21.5, minutes: 63 },
  { tag: "EG-204", readingM3S: 0.126, dryBulbC: 21.4, minutes: 67 },
];

const START = Date.parse("2026-11-24T12:20:00Z");

export async function seedTerminalReadings(tx: Tx, { projectId, technicianId }: { projectId: string; technicianId: string }) {
  const [project] = await tx.select().from(s.projects).where(eq(s.projects.id, projectId));
  const systems = await tx.select().from(s.airSystems).where(eq(s.airSystems.projectId, projectId));
  if (!project || systems.length === 0) return;
  const sections = await tx.select().from(s.ductSections).where(inArray(s.ductSections.systemId, systems.map((x) => x.id)));
  const terminals = await tx.select().from(s.terminals).where(inArray(s.terminals.sectionId, sections.map((x) => x.id)));
  const [hood] = await tx.select().from(s.instruments).where(and(eq(s.instruments.kind, "capture_hood"), eq(s.instruments.serial, "CH-7710")));
  const [air] = await tx.select().from(s.instruments).where(and(eq(s.instruments.kind, "thermo_hygrometer"), eq(s.instruments.serial, "TH-2209")));
  if (!hood) return;

  const systemOf = (sectionId: string) => sections.find((x) => x.id === sectionId)!.systemId;
  const sets = new Map<string, { id: string; readings: number }>();
  const conditions = new Map<string, string | null>();
  for (const system of systems) {
    // The conditions the system runs under now: the newest record.
    const [current] = await tx
      .select({ id: s.operatingConditions.id })
      .from(s.operatingConditions)
      .where(eq(s.operatingConditions.systemId, system.id))
      .orderBy(desc(s.operatingConditions.recordedAt))
      .limit(1);
    conditions.set(system.id, current?.id ?? null);
  }

  const rows: (typeof s.terminalReadings.$inferInsert)[] = [];
  for (const item of DEMO_HOOD_READINGS) {
    const terminal = terminals.find((t) => t.tag === item.tag);
    if (!terminal) continue;
    const systemId = systemOf(terminal.sectionId);
    let set = sets.get(systemId);
    if (!set) {
      const [created] = await tx.insert(s.terminalSets).values({ systemId, status: "draft", revision: 1, notes: "Initial readings, as found." }).returning({ id: s.terminalSets.id });
      set = { id: created!.id, readings: 0 };
      sets.set(systemId, set);
    }
    const values: ReadingValues = {
      method: "hood",
      phase: "initial",
      setpoint: "design",
      hoodFlowM3S: item.readingM3S,
      hoodCorrectionFactor: hood.hoodCorrectionFactor ?? 1,
      hoodDensityCorrected: false,
      hoodBackPressureCompensated: true,
      velocitiesMS: null,
      velocityBasis: null,
      effectiveAreaM2: null,
      dryBulbC: item.dryBulbC,
      relativeHumidityPct: 45,
      barometricPa: null,
      controllerFlowM3S: null,
      controllerFlowFactor: null,
      damperMarked: false,
    };
    const flow = computeReadingFlow(values, terminal, project);
    set.readings += 1;
    rows.push({
      terminalId: terminal.id,
      setId: set.id,
      ...readingColumns(values, flow),
      conditionsId: conditions.get(systemId) ?? null,
      instrumentId: hood.id,
      airInstrumentId: air?.id ?? null,
      takenBy: technicianId,
      takenAt: new Date(START + item.minutes * 60_000),
    });
  }
  if (rows.length > 0) await tx.insert(s.terminalReadings).values(rows);
  for (const set of sets.values()) await tx.update(s.terminalSets).set({ version: 1 + set.readings }).where(eq(s.terminalSets.id, set.id));
}
