/**
 * Gathers the closeout report's model (lib/report/model.ts) from the database: design, the engine's
 * reduction of every traverse (lib/server/airflow-view.ts), terminal readings judged against design,
 * continuity by mass, instruments, photos from object storage, the TAB supervisor's statement and
 * the report approvals. A draft takes the data as they stand; an issued report takes approved data
 * only, and lists everything else as "not approved — excluded".
 *
 * The verification samples and the accepted deviations come through `loadVerificationSample` and
 * `loadAcceptedDeviations` below.
 */
import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { getProjectDesign, listTraversesForProject, type StoredTraverse } from "@/db/queries/airflow";
import { listDeviations } from "@/db/queries/deviations";
import { getSampleInProject, listSamples } from "@/db/queries/samples";
import { listConditionsByIds, listTerminalReadings, listTerminalSets } from "@/db/queries/terminal-readings";
import { instruments, photos, projects, reviews, users, type Instrument } from "@/db/schema";
import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import { percentOfDesign, withinTolerance } from "@/lib/airflow/balancing";
import { formatExpandedUncertainty } from "@/lib/airflow/uncertainty";
import { instrumentName, kindLabel } from "@/lib/instruments/kinds";
import type { ItemStatus, ReportApproval, ReportDeviation, ReportInstrument, ReportModel, ReportPhoto, ReportSystem, ReportTraverse, ReportVerification, SummaryRow, TerminalRow } from "@/lib/report/model";
import { latestByPhase } from "@/lib/terminals/history";
import { judgeReading } from "@/lib/terminals/reading";
import { designFlowAt, METHOD_LABELS, SETPOINT_LABELS, setpointsFor } from "@/lib/terminals/setpoints";
import { buildAirflowView, type SectionView } from "./airflow-view";
import { publicUrl } from "./public-url";
import sharp from "sharp";
import { getObjectBytes } from "./storage";
import { getSupervisorState } from "./supervisor";
import { designOf } from "./terminal-reading-json";

/** The most photos a report embeds (the newest first); each is scaled on its page. */
export const MAX_REPORT_PHOTOS = 24;
/** Photos are embedded at most this many pixels on their longer side: sharp on paper, small in the file. */
const PHOTO_EMBED_PX = 1400;

/** A stored photo as the report embeds it: upright (its EXIF orientation applied), scaled down, JPEG. */
async function photoForReport(key: string): Promise<{ base64: string; width: number; height: number } | null> {
  const bytes = await getObjectBytes(key).catch(() => null);
  if (!bytes) return null;
  try {
    const { data, info } = await sharp(bytes, { limitInputPixels: 50_000_000 })
      .rotate()
      .resize({ width: PHOTO_EMBED_PX, height: PHOTO_EMBED_PX, fit: "inside", withoutEnlargement: true })
      .jpeg({ quality: 82 })
      .toBuffer({ resolveWithObject: true });
    return { base64: data.toString("base64"), width: info.width, height: info.height };
  } catch {
    return null;
  }
}

export interface LoadReportOptions {
  projectId: string;
  kind: "draft" | "issued";
  /** Issued: the revision and code from planReportIssue, printed on every page. */
  plan?: { revision: number; code: string; verifyUrl: string };
  reason?: string;
  /** The approvals and signatures to print (lib/server/report-approvals.ts gives the current ones). */
  approvals?: ReportApproval[];
  /** False: photos are listed without their bytes (the content fingerprint needs no images). */
  withPhotoBytes?: boolean;
}

/**
 * The commissioning agent's verification samples: the newest sample of each system, its items the agent
 * read (the technician's standard airflow against the agent's), and the outcome against the project's
 * rule. Items read under operating conditions that differ from the technician's are not judged (as on the
 * Review screen) and are named in the comment instead.
 */
export async function loadVerificationSample({ projectId }: { projectId: string }): Promise<ReportVerification> {
  const newestPerSystem = new Map<string, Awaited<ReturnType<typeof listSamples>>[number]>();
  for (const row of await listSamples({ projectId })) if (!newestPerSystem.has(row.sample.systemId)) newestPerSystem.set(row.sample.systemId, row);
  if (newestPerSystem.size === 0) return { recorded: false };
  const samples = (await Promise.all([...newestPerSystem.values()].map((row) => getSampleInProject({ projectId, sampleId: row.sample.id })))).filter((x) => x !== null);
  const items: Extract<ReportVerification, { recorded: true }>["items"] = [];
  const notes: string[] = [];
  let drawn = 0;
  let population = 0;
  let failed = false;
  for (const { sample, systemTag, drawnByName, items: sampleItems } of samples) {
    drawn += sampleItems.length;
    population += sample.population.length;
    if (sample.recommendReturn || sample.disagreedCount > sample.allowedFailures) failed = true;
    const read = sampleItems.filter((i) => i.agentFlowM3S !== null && i.technicianFlowM3S !== null);
    for (const i of read) {
      if (i.agrees === null) {
        notes.push(`${systemTag} ${i.tag} was read under other operating conditions (${(i.conditionsDiffer ?? []).join("; ") || "they differ"}) and is not judged.`);
        continue;
      }
      items.push({ item: `${systemTag} · ${i.tag}`, reportedM3S: i.technicianFlowM3S!, verifiedM3S: i.agentFlowM3S!, differencePct: i.differencePct ?? 0, pass: i.agrees });
    }
    const witnessed = sampleItems.filter((i) => i.witnessed).length;
    notes.unshift(
      `${systemTag}: ${sampleItems.length} of ${sample.population.length} items drawn ${sample.drawnAt.toISOString().slice(0, 10)}${drawnByName ? ` by ${drawnByName}` : ""} (seed ${sample.seed}, ${sample.samplePct} %, at least ${sample.minCount}); ${sample.agreedCount} agreed, ${sample.disagreedCount} disagreed (${sample.allowedFailures} allowed)${witnessed > 0 ? `, ${witnessed} witnessed` : ""}; ${sampleItems.length - read.length} not read yet.`,
    );
  }
  const newest = samples.reduce((a, b) => (a.sample.drawnAt > b.sample.drawnAt ? a : b));
  const tolerances = [...new Set(samples.map((x) => `±${x.sample.tolerancePct} %`))];
  return {
    recorded: true,
    by: [...new Set(samples.map((x) => x.drawnByName).filter((n): n is string => !!n))].join(", ") || "the commissioning agent",
    at: newest.sample.drawnAt.toISOString(),
    sampleSize: `${drawn} of ${population} items (${population > 0 ? Math.round((100 * drawn) / population) : 0} %)`,
    result: failed ? "failed" : "passed",
    tolerance: tolerances.join(", "),
    items,
    comment: notes.join(" "),
  };
}

/**
 * Deviations from design the engineer of record accepted and has not withdrawn, with their reasons and
 * the value each result was accepted at.
 */
export async function loadAcceptedDeviations({ projectId }: { projectId: string }): Promise<ReportDeviation[]> {
  const rows = await listDeviations({ projectId });
  return rows.map((d) => {
    const isPct = d.valueUnit === "% of design";
    return {
      item: isPct ? `${d.label} (band ${d.tolerance})` : `${d.label}: ${Number(d.acceptedValue.toPrecision(4))} ${d.valueUnit} (band ${d.tolerance})`,
      pctOfDesign: isPct ? d.acceptedValue : null,
      reason: d.reason,
      acceptedBy: d.acceptedByName,
      acceptedAt: d.acceptedAt.toISOString(),
    };
  });
}

const statusOf = (t: StoredTraverse | null | undefined): ItemStatus => (t ? t.status : "not read");

function latestBySection(traverses: readonly StoredTraverse[]): Map<string, StoredTraverse> {
  const out = new Map<string, StoredTraverse>();
  for (const t of traverses) {
    const seen = out.get(t.sectionId);
    if (!seen || t.revision > seen.revision) out.set(t.sectionId, t);
  }
  return out;
}

function calibrationState(instrument: Instrument, usedAt: Date | null): string {
  if (!instrument.calibratedOn && !instrument.calibrationDueOn) return "no calibration on record";
  if (instrument.calibrationDueOn && usedAt && usedAt.toISOString().slice(0, 10) > instrument.calibrationDueOn) return "overdue at use";
  return "current";
}

export async function loadReportModel(options: LoadReportOptions): Promise<ReportModel> {
  const { projectId, kind } = options;
  const db = await getDb();
  const [project] = await db.select().from(projects).where(eq(projects.id, projectId));
  if (!project) throw new Error(`No project ${projectId}`);
  const [design, allTraverses, sets, readingList, supervisor, verification, deviations] = await Promise.all([
    getProjectDesign({ projectId }),
    listTraversesForProject({ projectId }),
    listTerminalSets({ projectId }),
    listTerminalReadings({ projectId }),
    getSupervisorState({ projectId }),
    loadVerificationSample({ projectId }),
    loadAcceptedDeviations({ projectId }),
  ]);

  const issued = kind === "issued";
  const reported = issued ? allTraverses.filter((t) => t.status === "approved") : allTraverses;
  const view = buildAirflowView(project, design, reported);
  const latestAny = latestBySection(allTraverses);

  // The approving review of each reported traverse version.
  const reportedIds = reported.map((t) => t.id);
  const reviewRows =
    reportedIds.length === 0
      ? []
      : await db
          .select({ traverseId: reviews.traverseId, version: reviews.traverseVersion, decision: reviews.decision, reason: reviews.reason, witnessed: reviews.witnessed, at: reviews.createdAt, by: users.name })
          .from(reviews)
          .innerJoin(users, eq(users.id, reviews.reviewerId))
          .where(and(inArray(reviews.traverseId, reportedIds), eq(reviews.decision, "approved")))
          .orderBy(desc(reviews.createdAt));

  const sectionTraverse = new Map<string, { view: SectionView; systemTag: string }>();
  const systems: ReportSystem[] = view.map((sv) => {
    const system = sv.system;
    const sectionBand = formatTolerance(toleranceFor(project, "section"));
    const rows: SummaryRow[] = [];
    const roots = sv.sections.filter((s) => s.depth === 0);
    const rootFlows = roots.map((r) => (r.reduction?.ok ? r.reduction.result.standardFlowM3S : null));
    const fanMeasured = roots.length > 0 && rootFlows.every((f) => f !== null) ? rootFlows.reduce<number>((a, f) => a + f!, 0) : null;
    const fanBand = toleranceFor(project, "fan");
    const rootStatuses = roots.map((r) => statusOf(latestAny.get(r.section.id)));
    rows.push({
      tag: system.tag,
      location: `Fan total${system.location ? `, ${system.location}` : ""}`,
      depth: 0,
      status: fanMeasured !== null ? (issued ? "approved" : (rootStatuses[0] ?? "not read")) : (rootStatuses.find((s) => s !== "approved") ?? "not read"),
      excluded: issued && fanMeasured === null && rootStatuses.some((s) => s !== "not read"),
      designM3S: system.designFlowM3S,
      measuredM3S: fanMeasured,
      pctOfDesign: fanMeasured === null ? null : percentOfDesign(fanMeasured, system.designFlowM3S),
      pass: fanMeasured === null ? null : withinTolerance(fanMeasured, system.designFlowM3S, fanBand),
      band: formatTolerance(fanBand),
    });
    for (const s of sv.sections) {
      const current = latestAny.get(s.section.id);
      const ok = s.reduction?.ok ? s.reduction.result : null;
      const excluded = issued && !ok && current !== undefined;
      rows.push({
        tag: s.section.tag,
        location: s.section.location,
        depth: s.depth + 1,
        status: issued && ok ? "approved" : statusOf(current),
        excluded,
        designM3S: s.section.designFlowM3S,
        measuredM3S: ok ? ok.standardFlowM3S : null,
        pctOfDesign: s.pctOfDesign,
        pass: s.withinTolerance,
        band: sectionBand,
      });
      if (ok && s.latest) sectionTraverse.set(s.section.id, { view: s, systemTag: system.tag });
    }

    const junctions = sv.junctions.map((j) =>
      j.status === "waiting"
        ? { parentTag: j.parent.tag, childTags: j.children.map((c) => c.tag), status: "waiting" as const, missing: j.missing, parentMassKgS: null, childrenMassKgS: null, imbalanceKgS: null, imbalancePct: null, imbalanceStandardM3S: null, pass: null, note: "" }
        : {
            parentTag: j.parent.tag,
            childTags: j.children.map((c) => c.tag),
            status: "checked" as const,
            missing: [],
            parentMassKgS: j.junction.parentMassFlowKgS,
            childrenMassKgS: j.junction.childrenMassFlowKgS,
            imbalanceKgS: j.junction.imbalanceKgS,
            imbalancePct: j.junction.imbalancePct,
            imbalanceStandardM3S: j.junction.imbalanceStandardM3S,
            pass: j.junction.pass,
            note: j.junction.note,
          },
    );

    // Terminal readings: the system's sets; an issued report reads approved sets only.
    const systemSets = sets.filter((x) => x.systemId === system.id).sort((a, b) => b.revision - a.revision);
    const newest = systemSets[0];
    const usableSetIds = new Set(systemSets.filter((x) => !issued || x.status === "approved").map((x) => x.id));
    const approvedSet = systemSets.find((x) => x.status === "approved");
    const terminalSet = {
      status: (issued ? (approvedSet ? "approved" : (newest?.status ?? "not read")) : (newest?.status ?? "not read")) as ItemStatus,
      excluded: issued && !approvedSet && newest !== undefined,
      revision: (issued ? approvedSet?.revision : newest?.revision) ?? null,
    };
    const sectionIds = new Set(sv.sections.map((s) => s.section.id));
    const systemTerminals = design.terminals.filter((t) => sectionIds.has(t.sectionId));
    const readings = readingList.rows.filter((r) => r.systemId === system.id && usableSetIds.has(r.setId));
    const terminals: TerminalRow[] = [];
    for (const terminal of systemTerminals) {
      const d = designOf(terminal);
      const own = readings.filter((r) => r.terminalId === terminal.id);
      const pairs = latestByPhase(own);
      const unit = terminal.type === "vav_box" || terminal.type === "constant_volume_box";
      for (const setpoint of setpointsFor(d)) {
        const pair = pairs[setpoint];
        const cell = (r: (typeof own)[number] | null | undefined) => {
          if (!r) return null;
          const j = judgeReading({ ...r, velocitiesMS: r.velocitiesMS ?? null, standardFlowM3S: r.standardFlowM3S }, d, project);
          return { standardFlowM3S: r.standardFlowM3S, pctOfDesign: j.pctOfDesign, pass: j.withinTolerance, method: METHOD_LABELS[r.method], takenAt: r.takenAt.toISOString() };
        };
        terminals.push({
          tag: terminal.tag,
          room: terminal.room,
          device: terminal.device,
          kind: unit ? "terminal unit" : "outlet",
          setpoint: SETPOINT_LABELS[setpoint],
          designM3S: designFlowAt(d, setpoint),
          band: formatTolerance(toleranceFor(project, unit ? "terminalUnit" : "outlet")),
          initial: cell(pair?.initial),
          final: cell(pair?.final),
        });
      }
    }
    const conditionIds = [...new Set(readings.map((r) => r.conditionsId).filter((x): x is string => x !== null))];
    return {
      tag: system.tag,
      name: system.name,
      kind: system.kind.replace("_", " ").replace(/^./, (c) => c.toUpperCase()),
      location: system.location,
      designM3S: system.designFlowM3S,
      rows,
      junctions,
      terminalSet,
      terminals,
      conditions: conditionIds,
    };
  });

  // Operating conditions in words, once per record used.
  const conditionRows = await listConditionsByIds({ ids: systems.flatMap((s) => s.conditions) });
  for (const s of systems) {
    s.conditions = s.conditions.map((id) => {
      const c = conditionRows.find((r) => r.id === id);
      if (!c) return "";
      const parts = [
        c.fanSpeedRpm !== null ? `fan ${c.fanSpeedRpm.toFixed(0)} rpm` : null,
        c.vfdHz !== null ? `drive ${c.vfdHz.toFixed(1)} Hz` : null,
        c.boxes !== "none" ? `terminal units held at ${c.boxes}` : null,
        c.outsideAirDamperPct !== null ? `outside-air damper ${c.outsideAirDamperPct.toFixed(0)} % open` : null,
        c.ductStaticSetpointPa !== null ? `duct static setpoint ${c.ductStaticSetpointPa.toFixed(0)} Pa` : null,
        `filters ${c.filterState.replace("_", " ")}`,
        c.notes || null,
      ].filter(Boolean);
      return `${parts.join(", ")} (recorded ${c.recordedAt.toISOString().slice(0, 10)}${c.recordedByName ? ` by ${c.recordedByName}` : ""}).`;
    }).filter(Boolean);
  }

  // One part per reported traverse, in system and section order.
  const instrumentUse = new Map<string, Date | null>();
  const noteUse = (id: string | null, at: Date | null) => {
    if (!id) return;
    const seen = instrumentUse.get(id);
    if (seen === undefined || (at && (!seen || at > seen))) instrumentUse.set(id, at);
  };
  const registered = await db.select().from(instruments);
  const byId = new Map(registered.map((i) => [i.id, i]));
  const traverseParts: ReportTraverse[] = [];
  for (const sv of view)
    for (const s of sv.sections) {
      const entry = sectionTraverse.get(s.section.id);
      if (!entry || !s.latest || !s.reduction?.ok) continue;
      const t = s.latest;
      const r = s.reduction.result;
      for (const id of [t.instrumentId, t.probeInstrumentId, t.airInstrumentId, t.barometerInstrumentId]) noteUse(id, t.takenAt);
      const used = [t.instrumentId, t.probeInstrumentId, t.airInstrumentId, t.barometerInstrumentId].map((id) => (id ? byId.get(id) : undefined)).filter((i): i is Instrument => !!i);
      const review = reviewRows.find((rv) => rv.traverseId === t.id && rv.version === t.version) ?? reviewRows.find((rv) => rv.traverseId === t.id);
      const band = toleranceFor(project, "section");
      traverseParts.push({
        systemTag: entry.systemTag,
        sectionTag: s.section.tag,
        location: s.section.location,
        revision: t.revision,
        status: t.status,
        rule: r.layout.rule === "log-Tchebycheff" ? "Log-Tchebycheff" : r.layout.rule === "log-linear" ? "Log-linear" : "Equal-area",
        duct: s.section.shape === "round" ? { shape: "round", diameterMm: s.section.diameterMm ?? 0 } : { shape: "rectangular", widthMm: s.section.widthMm ?? 0, heightMm: s.section.heightMm ?? 0 },
        lines: t.lines,
        pointsPerLine: t.pointsPerLine,
        layout: r.layout.lines.map((line) => ({
          ...(line.angleDeg !== null ? { angleDeg: line.angleDeg } : {}),
          ...(line.lineXM !== null ? { xMm: line.lineXM * 1000 } : {}),
          points: line.points.map((p) => ({ xMm: p.xM * 1000, yMm: p.yM * 1000, depthMm: p.depthM * 1000, readPositionMm: p.readPositionM * 1000, beyondProbeReach: p.beyondProbeReach })),
        })),
        readingsKind: t.readingsKind,
        points: r.points.map((p) => ({
          line: p.line,
          point: p.point,
          depthMm: p.depthM * 1000,
          readPositionMm: p.readPositionM * 1000,
          reading: p.reading,
          velocityMS: p.velocityMS,
          filledFrom: p.filledFrom ? p.filledFrom.replace("-", " ") : null,
          filledVelocityMS: p.filledVelocityMS,
          beyondReach: p.beyondProbeReach,
        })),
        air: { dryBulbC: r.air.dryBulbC, relativeHumidityPct: r.air.relativeHumidityPct, barometricPa: r.air.barometricPa, barometricSource: r.air.barometricSource, staticPa: r.air.staticPa, staticAssumed: r.air.staticAssumed },
        densityKgM3: r.densityKgM3,
        standardDensityKgM3: r.standardDensityKgM3,
        meanVelocityMS: r.meanVelocityMS,
        areaM2: r.areaM2,
        flowM3S: r.flowM3S,
        standardFlowM3S: r.standardFlowM3S,
        massFlowKgS: r.massFlowKgS,
        designM3S: s.section.designFlowM3S,
        pctOfDesign: percentOfDesign(r.standardFlowM3S, s.section.designFlowM3S),
        pass: withinTolerance(r.standardFlowM3S, s.section.designFlowM3S, band),
        band: formatTolerance(band),
        verdict: r.quality.verdict,
        verdictReasons: r.quality.reasons,
        uncertainty: formatExpandedUncertainty(r.uncertainty.expanded),
        integration: r.integrationRule === "equal-weight" ? `Equal weights${r.filled.length > 0 ? `, ${r.filled.length} point${r.filled.length === 1 ? "" : "s"} filled from counterparts` : ""}` : "Tributary areas (some gaps had no counterpart)",
        warnings: r.warnings,
        instruments: used.length > 0 ? used.map((i) => instrumentName(i)) : [t.instrument, t.instrumentSerial ? `serial ${t.instrumentSerial}` : ""].filter(Boolean),
        takenBy: t.takenByName,
        takenAt: t.takenAt?.toISOString() ?? null,
        notes: t.notes,
        review: review ? { by: review.by, at: review.at.toISOString(), witnessed: review.witnessed, comment: review.reason } : null,
      });
    }

  // Instruments on the reported terminal readings too.
  const reportedSetIds = new Set<string>();
  for (const x of sets) if (!issued || x.status === "approved") reportedSetIds.add(x.id);
  const reportedReadings = readingList.rows.filter((r) => reportedSetIds.has(r.setId));
  for (const r of reportedReadings) {
    noteUse(r.instrumentId, r.takenAt);
    noteUse(r.airInstrumentId, r.takenAt);
  }
  const instrumentRows: ReportInstrument[] = [...instrumentUse.entries()]
    .map(([id, at]) => ({ i: byId.get(id), at }))
    .filter((x): x is { i: Instrument; at: Date | null } => !!x.i)
    .sort((a, b) => a.i.kind.localeCompare(b.i.kind) || a.i.serial.localeCompare(b.i.serial))
    .map(({ i, at }) => ({
      kind: kindLabel(i.kind),
      name: [i.make, i.model].filter(Boolean).join(" ") || kindLabel(i.kind),
      serial: i.serial,
      calibratedOn: i.calibratedOn,
      calibrationDueOn: i.calibrationDueOn,
      certificateNumber: i.certificateNumber,
      state: calibrationState(i, at),
    }));

  // Photos of the reported traverse locations.
  const sectionIds = [...sectionTraverse.keys()];
  const photoRows =
    sectionIds.length === 0
      ? []
      : await db
          .select({ sectionId: photos.sectionId, objectKey: photos.objectKey, contentType: photos.contentType, bytes: photos.bytes, width: photos.width, height: photos.height, caption: photos.caption, createdAt: photos.createdAt, takenBy: users.name })
          .from(photos)
          .leftJoin(users, eq(users.id, photos.takenBy))
          .where(and(eq(photos.projectId, projectId), inArray(photos.sectionId, sectionIds)))
          .orderBy(desc(photos.createdAt))
          .limit(MAX_REPORT_PHOTOS);
  const sectionTag = new Map(design.sections.map((s) => [s.id, s.tag]));
  const systemTagOfSection = new Map(design.sections.map((s) => [s.id, design.systems.find((x) => x.id === s.systemId)?.tag ?? ""]));
  const reportPhotos: ReportPhoto[] = [];
  for (const p of photoRows) {
    if (p.contentType !== "image/jpeg" && p.contentType !== "image/png") continue;
    const embedded = options.withPhotoBytes === false ? null : await photoForReport(p.objectKey);
    reportPhotos.push({
      sectionTag: sectionTag.get(p.sectionId) ?? "",
      systemTag: systemTagOfSection.get(p.sectionId) ?? "",
      caption: p.caption,
      takenBy: p.takenBy,
      takenAt: p.createdAt.toISOString(),
      format: "jpeg",
      base64: embedded?.base64 ?? null,
      width: p.width,
      height: p.height,
    });
  }
  reportPhotos.sort((a, b) => a.systemTag.localeCompare(b.systemTag) || a.sectionTag.localeCompare(b.sectionTag) || a.takenAt.localeCompare(b.takenAt));

  const times = [...reported.map((t) => t.takenAt), ...reportedReadings.map((r) => r.takenAt)].filter((d): d is Date => d !== null).map((d) => d.toISOString()).sort();
  const measuredBy = [...new Set([...reported.map((t) => t.takenByName), ...reportedReadings.map((r) => r.takenByName)].filter((n): n is string => !!n))].sort();
  const sig = supervisor.signature;
  return {
    kind,
    generatedAt: new Date().toISOString(),
    units: project.unitSystem,
    project: { name: project.name, siteName: project.siteName, address: project.address, altitudeM: project.altitudeM, standardDensityKgM3: project.standardDensityKgM3 },
    revision: issued ? (options.plan?.revision ?? null) : null,
    code: issued ? (options.plan?.code ?? null) : null,
    verifyUrl: issued && options.plan ? options.plan.verifyUrl : publicUrl("/verify"),
    reason: options.reason ?? "",
    period: { from: times[0] ?? null, to: times[times.length - 1] ?? null },
    measuredBy,
    tolerances: {
      fan: formatTolerance(toleranceFor(project, "fan")),
      section: formatTolerance(toleranceFor(project, "section")),
      outlet: formatTolerance(toleranceFor(project, "outlet")),
      terminalUnit: formatTolerance(toleranceFor(project, "terminalUnit")),
      continuityPct: project.continuityTolerancePct,
    },
    certification: supervisor.designation
      ? {
          state: sig ? "signed" : "unsigned",
          name: sig?.name ?? supervisor.designation.name,
          certifyingBody: sig?.certifyingBody ?? supervisor.designation.certifyingBody,
          certificateNumber: sig?.certificateNumber ?? supervisor.designation.certificateNumber,
          statement: sig?.statement ?? supervisor.statement,
          signedAt: sig?.signedAt.toISOString() ?? null,
        }
      : { state: "none", name: null, certifyingBody: null, certificateNumber: null, statement: null, signedAt: null },
    systems,
    traverses: traverseParts,
    instruments: instrumentRows,
    photos: reportPhotos,
    verification,
    deviations,
    approvals: options.approvals ?? [],
  };
}

/** The model's content without what changes on every build or is signed separately: what report approvals fingerprint. */
export function reportContent(model: ReportModel): unknown {
  return {
    kind: model.kind,
    units: model.units,
    project: model.project,
    period: model.period,
    measuredBy: model.measuredBy,
    tolerances: model.tolerances,
    systems: model.systems,
    traverses: model.traverses,
    instruments: model.instruments,
    photos: model.photos.map((p) => ({ ...p, base64: null })),
    verification: model.verification,
    deviations: model.deviations,
  };
}
