/**
 * The demo's last step: the library's exhaust system (EF-1) made fully approved (traverses of its
 * trunk and both branches, approved with a review by the demo commissioning agent; final readings
 * of every exhaust grille, the set approved), the TAB supervisor designated and their statement
 * signed, both report approvals recorded, and revision 1 issued through the real builder and
 * issueReport. The supply system stays part-approved, so the report shows what "not approved —
 * excluded" looks like. Invented numbers throughout.
 *
 * It needs object storage (the launcher starts the local store before the server seeds) and runs
 * through the process database (getDb), after the rest of the demo is committed. It does nothing
 * when the library already has an issued report.
 *
 * Other work adds verification samples, terminal-set decisions and accepted deviations: their demo
 * rows belong in their own steps, called before `issueDemoReport` in `seedDemoReport`.
 */
import { and, eq, inArray } from "drizzle-orm";
import { getDb } from "../client";
import * as s from "../schema";
import { engineAccuracy } from "@/lib/instruments/accuracy";
import { computeReadingFlow, readingColumns, type ReadingValues } from "@/lib/terminals/reading";

const LIBRARY_SITE = "Wrenfield Community Library";

// Ø 450 and Ø 315 round, 2 diameters × 6 points, log-linear; velocity pressures in Pa, room air drawn out.
const EXHAUST_TRAVERSES: Record<string, { grid: number[][]; dryBulbC: number; staticPa: number; minutes: number; notes: string }> = {
  X1: {
    grid: [
      [15.9, 19.8, 21.6, 22.0, 20.1, 16.4],
      [16.3, 20.4, 22.3, 21.5, 19.6, 15.8],
    ],
    dryBulbC: 21.6,
    staticPa: -240,
    minutes: 0,
    notes: "Ports at 12 and 3 o'clock on the roof curb riser, 1.1 m below the fan inlet.",
  },
  "X1.1": {
    grid: [
      [17.8, 22.6, 24.9, 25.3, 22.8, 18.2],
      [18.4, 23.1, 25.6, 24.7, 22.2, 17.6],
    ],
    dryBulbC: 21.4,
    staticPa: -185,
    minutes: 35,
    notes: "Read from the washroom corridor access panel.",
  },
  "X1.2": {
    grid: [
      [13.9, 17.2, 18.9, 19.3, 17.4, 14.1],
      [14.2, 17.7, 19.4, 18.8, 16.9, 13.6],
    ],
    dryBulbC: 20.8,
    staticPa: -150,
    minutes: 60,
    notes: "Workshop dust extraction off during the reading.",
  },
};

// Final (as left) capture-hood readings of the exhaust grilles after adjustment, and the workshop's first readings.
const EXHAUST_HOOD: { tag: string; phase: "initial" | "final"; readingM3S: number; minutes: number }[] = [
  { tag: "EG-211", phase: "initial", readingM3S: 0.214, minutes: 80 },
  { tag: "EG-212", phase: "initial", readingM3S: 0.171, minutes: 84 },
  { tag: "EG-201", phase: "final", readingM3S: 0.126, minutes: 100 },
  { tag: "EG-202", phase: "final", readingM3S: 0.121, minutes: 104 },
  { tag: "EG-203", phase: "final", readingM3S: 0.119, minutes: 110 },
  { tag: "EG-204", phase: "final", readingM3S: 0.124, minutes: 114 },
  { tag: "EG-211", phase: "final", readingM3S: 0.203, minutes: 122 },
  { tag: "EG-212", phase: "final", readingM3S: 0.192, minutes: 128 },
];

const START = Date.parse("2026-11-25T09:10:00Z");

export interface DemoReportOutcome {
  issued: boolean;
  note: string;
}

/** Completes the exhaust system's data and issues the demo report; tolerant of a run that already did it. */
export async function seedDemoReport(): Promise<DemoReportOutcome> {
  const db = await getDb();
  const [library] = await db.select().from(s.projects).where(eq(s.projects.siteName, LIBRARY_SITE));
  if (!library) return { issued: false, note: "No demo library project." };
  const [existing] = await db.select({ id: s.reports.id }).from(s.reports).where(eq(s.reports.projectId, library.id)).limit(1);
  if (existing) return { issued: false, note: "The demo library already has an issued report." };
  // Server modules load only here: the launcher imports the database client (and so this seed) outside Next.
  const { storageConfigured } = await import("@/lib/server/storage");
  if (!storageConfigured()) return { issued: false, note: "No object storage configured: the demo report was not issued." };

  const people = await db.select().from(s.users).where(inArray(s.users.email, ["tech@example.test", "cx@example.test", "engineer@example.test"]));
  const person = (email: string) => people.find((p) => p.email === email)!;
  const tech = person("tech@example.test");
  const cx = person("cx@example.test");
  const engineer = person("engineer@example.test");

  await approveExhaustSystem(library.id, tech.id, cx.id);
  await signSupervisorStatement(library, tech, engineer.id);
  return issueDemoReport(library.id, cx, engineer);
}

async function approveExhaustSystem(projectId: string, technicianId: string, reviewerId: string): Promise<void> {
  const db = await getDb();
  const [ef] = await db.select().from(s.airSystems).where(and(eq(s.airSystems.projectId, projectId), eq(s.airSystems.tag, "EF-1")));
  if (!ef) return;
  const sections = await db.select().from(s.ductSections).where(eq(s.ductSections.systemId, ef.id));
  const kit = await db.select().from(s.instruments).where(inArray(s.instruments.serial, ["MM-30418", "PT-0931", "TH-2209", "CH-7710"]));
  const bySerial = (serial: string) => kit.find((i) => i.serial === serial) ?? null;
  const [conditions] = await db.select({ id: s.operatingConditions.id }).from(s.operatingConditions).where(eq(s.operatingConditions.systemId, ef.id)).limit(1);
  const [project] = await db.select().from(s.projects).where(eq(s.projects.id, projectId));

  await db.transaction(async (tx) => {
    for (const section of sections) {
      const plan = EXHAUST_TRAVERSES[section.tag];
      if (!plan) continue;
      const already = await tx.select().from(s.traverses).where(eq(s.traverses.sectionId, section.id));
      if (already.some((t) => t.status === "approved")) continue;
      const takenAt = new Date(START + plan.minutes * 60_000);
      const [traverse] = await tx
        .insert(s.traverses)
        .values({
          sectionId: section.id,
          method: "log-linear",
          lines: plan.grid.length,
          pointsPerLine: plan.grid[0]!.length,
          instrument: "Pitot-static tube with digital micromanometer",
          instrumentSerial: "MM-30418",
          probeCoefficient: 1.0,
          probeHeadDiameterMm: bySerial("PT-0931")?.probeHeadDiameterMm ?? null,
          instrumentAccuracy: engineAccuracy([bySerial("MM-30418"), bySerial("PT-0931"), bySerial("TH-2209")]),
          dryBulbC: plan.dryBulbC,
          relativeHumidityPct: 44,
          barometricPa: 98_760,
          staticPa: plan.staticPa,
          portOffsetMm: 25,
          instrumentId: bySerial("MM-30418")?.id ?? null,
          probeInstrumentId: bySerial("PT-0931")?.id ?? null,
          airInstrumentId: bySerial("TH-2209")?.id ?? null,
          conditionsId: conditions?.id ?? null,
          revision: already.reduce((m, t) => Math.max(m, t.revision), 0) + 1,
          status: "approved",
          notes: plan.notes,
          takenBy: technicianId,
          takenAt,
          submittedAt: new Date(takenAt.getTime() + 15 * 60_000),
        })
        .returning();
      await tx.insert(s.readings).values(plan.grid.flatMap((line, i) => line.map((value, j) => ({ traverseId: traverse!.id, line: i + 1, point: j + 1, value, recordedAt: takenAt }))));
      await tx.insert(s.reviews).values({
        traverseId: traverse!.id,
        reviewerId,
        decision: "approved",
        reason: "Witnessed the second diameter; three points re-read within 3 %.",
        witnessed: true,
        traverseVersion: traverse!.version,
        createdAt: new Date(takenAt.getTime() + 3 * 60 * 60_000),
      });
    }

    // Terminal readings: the workshop's first readings and the final readings of every grille, then the set approved.
    const terminals = await tx.select().from(s.terminals).where(inArray(s.terminals.sectionId, sections.map((x) => x.id)));
    let [set] = await tx.select().from(s.terminalSets).where(eq(s.terminalSets.systemId, ef.id));
    if (set?.status === "approved" || !project) return;
    set ??= (await tx.insert(s.terminalSets).values({ systemId: ef.id, status: "draft", revision: 1, notes: "Initial and final readings." }).returning())[0]!;
    const hood = bySerial("CH-7710");
    const air = bySerial("TH-2209");
    const rows: (typeof s.terminalReadings.$inferInsert)[] = [];
    for (const item of EXHAUST_HOOD) {
      const terminal = terminals.find((t) => t.tag === item.tag);
      if (!terminal) continue;
      const values: ReadingValues = {
        method: "hood",
        phase: item.phase,
        setpoint: "design",
        hoodFlowM3S: item.readingM3S,
        hoodCorrectionFactor: hood?.hoodCorrectionFactor ?? 1,
        hoodDensityCorrected: false,
        hoodBackPressureCompensated: true,
        velocitiesMS: null,
        velocityBasis: null,
        effectiveAreaM2: null,
        dryBulbC: 21.3,
        relativeHumidityPct: 44,
        barometricPa: null,
        controllerFlowM3S: null,
        controllerFlowFactor: null,
        damperMarked: item.phase === "final",
      };
      const flow = computeReadingFlow(values, terminal, project);
      rows.push({
        terminalId: terminal.id,
        setId: set.id,
        ...readingColumns(values, flow),
        conditionsId: conditions?.id ?? null,
        instrumentId: hood?.id ?? null,
        airInstrumentId: air?.id ?? null,
        takenBy: technicianId,
        takenAt: new Date(START + item.minutes * 60_000),
      });
    }
    if (rows.length > 0) await tx.insert(s.terminalReadings).values(rows);
    const version = set.version + rows.length;
    await tx
      .update(s.terminalSets)
      .set({ status: "approved", version, submittedBy: technicianId, submittedAt: new Date(START + 140 * 60_000), updatedAt: new Date(START + 180 * 60_000) })
      .where(eq(s.terminalSets.id, set.id));
    // The commissioning agent's decision on the set, as the review cycle records it.
    await tx.insert(s.reviews).values({
      terminalSetId: set.id,
      reviewerId,
      decision: "approved",
      reason: "Hood readings of all six grilles checked against the balancing sheet; two re-read within 5 %.",
      witnessed: false,
      traverseVersion: version,
      createdAt: new Date(START + 180 * 60_000),
    });
  });
}

async function signSupervisorStatement(project: s.Project, tech: s.User, engineerId: string): Promise<void> {
  const db = await getDb();
  const [designated] = await db.select().from(s.projectSupervisors).where(eq(s.projectSupervisors.projectId, project.id));
  // An invented certifying body and number, for the demo only.
  const certifyingBody = designated?.certifyingBody ?? "Guild of Air Balancing Supervisors (invented for the demo)";
  const certificateNumber = designated?.certificateNumber ?? "GABS-2291";
  if (!designated)
    await db.insert(s.projectSupervisors).values({ projectId: project.id, userId: tech.id, certifyingBody, certificateNumber, designatedBy: engineerId, designatedAt: new Date(START - 86_400_000) });
  const { certificationStatement } = await import("@/lib/server/supervisor");
  const supervisorId = designated?.userId ?? tech.id;
  const [supervisor] = await db.select().from(s.users).where(eq(s.users.id, supervisorId));
  if (!supervisor) return;
  const signed = await db.select({ id: s.supervisorSignatures.id }).from(s.supervisorSignatures).where(and(eq(s.supervisorSignatures.projectId, project.id), eq(s.supervisorSignatures.userId, supervisor.id)));
  if (signed.length > 0) return;
  await db.insert(s.supervisorSignatures).values({
    projectId: project.id,
    userId: supervisor.id,
    name: supervisor.name,
    certifyingBody,
    certificateNumber,
    statement: certificationStatement({ name: supervisor.name, certifyingBody, certificateNumber, projectName: project.name, siteName: project.siteName }),
  });
}

async function issueDemoReport(projectId: string, cx: s.User, engineer: s.User): Promise<DemoReportOutcome> {
  // Imported here: the report builder pulls in the PDF and storage code only when a report is made.
  const { approveReport, issueProjectReport } = await import("@/lib/server/report-approvals");
  await approveReport({ projectId, user: cx, role: "commissioning_agent", comment: "EF-1 witnessed and verified on site." });
  await approveReport({ projectId, user: engineer, role: "engineer", comment: "EF-1 within the design bands; AHU-1 to follow in a later revision." });
  const report = await issueProjectReport({ projectId, user: engineer });
  return { issued: true, note: `Demo closeout report ${report.code} (revision ${report.revision}) issued.` };
}
