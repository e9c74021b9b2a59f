import "server-only";
import { inArray } from "drizzle-orm";
import { cachedRead, getDb } from "@/db/client";
import { recordAudit } from "@/db/queries/audit";
import { getConditions } from "@/db/queries/conditions";
import { getSectionInProject } from "@/db/queries/design";
import { isUuid } from "@/db/queries/projects";
import {
  EDITABLE_STATUSES,
  getTraverseById,
  getTraverseInProject,
  getTraverseToEdit,
  insertTraverseRevision,
  listReadingsOfTraverse,
  listRevisionsOfSection,
  saveTraverseReadings,
  type PointValue,
  type TraverseInProject,
  type TraverseSettings,
  type TraverseToEdit,
} from "@/db/queries/traverses";
import { instruments as instrumentsTable, type Instrument, type InstrumentKind, type Project, type Reading, type Traverse } from "@/db/schema";
import { airConditionErrors } from "@/lib/airflow/air";
import { runCalcCommand } from "@/lib/airflow/commands";
import { layoutCountProblem } from "@/lib/airflow/layout";
import { engineAccuracy } from "@/lib/instruments/accuracy";
import { instrumentName, KIND_INFO } from "@/lib/instruments/kinds";
import { calibrationProblems, instrumentUsability } from "@/lib/instruments/usability";
import { camelKey, camelKeys, engineSourceOf, gridOfRows, layoutCalcInput, reduceTraverseSource, type Grid, type PointRef } from "@/lib/traverse/engine-input";
import { READING_LIMITS, type ReadingsSave, type TraverseCreate, type TraversePatch } from "@/lib/validation/traverses";
import { listReviewsOf } from "@/db/queries/reviews";
import { conditionsJson } from "./field-json";

/** What a traverse operation answers: a status and a JSON body. */
export interface Outcome {
  status: number;
  body: unknown;
}

const ok = (status: number, body: unknown): Outcome => ({ status, body });
function fail(status: number, message: string, fields?: Record<string, string>, extra?: Record<string, unknown>): Outcome {
  return { status, body: { error: fields && Object.keys(fields).length > 0 ? { message, fields } : { message }, ...extra } };
}

export const NO_TRAVERSE = "No such traverse in this project.";

type Air = NonNullable<TraverseCreate["air"]>;
type InstrumentChoice = NonNullable<TraverseCreate["instrument"]>;

/** Columns of the air as stored. */
function airColumns(air: Air) {
  return {
    dryBulbC: air.dryBulbC,
    relativeHumidityPct: air.relativeHumidityPct ?? null,
    wetBulbC: air.relativeHumidityPct != null ? null : (air.wetBulbC ?? null),
    staticPa: air.staticPa,
    barometricPa: air.barometricPa ?? null,
  };
}

/** Air that no real air can be (vapour above the absolute pressure), named by the API's field paths. */
function impossibleAir(air: Air, altitudeM: number): Record<string, string> {
  const fields = airConditionErrors(
    {
      dryBulbC: air.dryBulbC,
      altitudeM,
      barometricPa: air.barometricPa ?? undefined,
      staticPa: air.staticPa ?? undefined,
      relativeHumidityPct: air.relativeHumidityPct ?? undefined,
      wetBulbC: air.relativeHumidityPct != null ? undefined : (air.wetBulbC ?? undefined),
    },
    "air",
  );
  return Object.fromEntries(Object.entries(fields).map(([k, v]) => [k.split(".").map(camelKey).join("."), v]));
}

const READING_KINDS_FOR: Record<Traverse["readingsKind"], readonly InstrumentKind[]> = {
  velocity_pressure: ["manometer"],
  velocity_actual: ["thermal_anemometer", "vane_anemometer"],
  velocity_standard: ["thermal_anemometer", "vane_anemometer"],
};
const SLOT_KINDS = {
  probeInstrumentId: ["pitot_tube"],
  airInstrumentId: ["thermo_hygrometer"],
  barometerInstrumentId: ["barometer"],
} as const satisfies Record<string, readonly InstrumentKind[]>;

type Slot = "readingInstrumentId" | keyof typeof SLOT_KINDS;
const SLOTS: readonly Slot[] = ["readingInstrumentId", "probeInstrumentId", "airInstrumentId", "barometerInstrumentId"];
const COLUMN: Record<Slot, "instrumentId" | "probeInstrumentId" | "airInstrumentId" | "barometerInstrumentId"> = {
  readingInstrumentId: "instrumentId",
  probeInstrumentId: "probeInstrumentId",
  airInstrumentId: "airInstrumentId",
  barometerInstrumentId: "barometerInstrumentId",
};

async function instrumentsById(ids: readonly (string | null | undefined)[]): Promise<Map<string, Instrument>> {
  const wanted = [...new Set(ids.filter((x): x is string => typeof x === "string"))];
  if (wanted.length === 0) return new Map();
  wanted.sort();
  const rows = await cachedRead(`instruments:${wanted.join(",")}`, async () => {
    const db = await getDb();
    return db.select().from(instrumentsTable).where(inArray(instrumentsTable.id, wanted));
  });
  return new Map(rows.map((r) => [r.id, r]));
}

/**
 * The instrument columns for a choice: ids checked against the register (kind, not retired), the
 * engine's inputs copied from it (accuracies, probe coefficient and head), the legacy name columns.
 * `current` fills the slots the choice leaves out (a PATCH that changes one instrument).
 */
async function instrumentColumns(choice: InstrumentChoice, readingsKind: Traverse["readingsKind"], current?: TraverseSettings): Promise<{ fields: Record<string, string> } | { values: Partial<Traverse> }> {
  const chosen: Record<Slot, string | null> = {
    readingInstrumentId: choice.readingInstrumentId !== undefined ? choice.readingInstrumentId : (current?.instrumentId ?? null),
    probeInstrumentId: choice.probeInstrumentId !== undefined ? choice.probeInstrumentId : (current?.probeInstrumentId ?? null),
    airInstrumentId: choice.airInstrumentId !== undefined ? choice.airInstrumentId : (current?.airInstrumentId ?? null),
    barometerInstrumentId: choice.barometerInstrumentId !== undefined ? choice.barometerInstrumentId : (current?.barometerInstrumentId ?? null),
  };
  if (readingsKind !== "velocity_pressure") chosen.probeInstrumentId = choice.probeInstrumentId ?? null;
  const extra = {
    ...(choice.overdueReason !== undefined ? { overdueReason: choice.overdueReason } : {}),
    ...(choice.standardDensityKgM3 !== undefined ? { instrumentStandardDensityKgM3: choice.standardDensityKgM3 } : {}),
  };
  // The same instruments as stored: what was copied from the register when they were chosen stays.
  if (current && SLOTS.every((slot) => chosen[slot] === current[COLUMN[slot]])) return { values: extra };
  const found = await instrumentsById(Object.values(chosen));
  const fields: Record<string, string> = {};
  const today = new Date();
  for (const slot of SLOTS) {
    const id = chosen[slot];
    if (id === null) continue;
    const row = found.get(id);
    const kinds = slot === "readingInstrumentId" ? READING_KINDS_FOR[readingsKind] : SLOT_KINDS[slot];
    const path = `instrument.${slot}`;
    if (!row) fields[path] = `names no instrument in the register; got ${JSON.stringify(id)}`;
    else if (!kinds.includes(row.kind))
      fields[path] = `must be a ${kinds.map((k) => KIND_INFO[k].label.toLowerCase()).join(" or ")}${slot === "readingInstrumentId" ? ` for ${readingsKind.replace("_", " ")} readings` : ""}; ${row.serial} is a ${KIND_INFO[row.kind].label.toLowerCase()}`;
    else if (!instrumentUsability(row, today).usable) fields[path] = `${row.serial}: ${instrumentUsability(row, today).message.toLowerCase()}`;
  }
  if (Object.keys(fields).length > 0) return { fields };
  const reading = chosen.readingInstrumentId ? found.get(chosen.readingInstrumentId)! : null;
  const probe = chosen.probeInstrumentId ? found.get(chosen.probeInstrumentId)! : null;
  const air = chosen.airInstrumentId ? found.get(chosen.airInstrumentId)! : null;
  const barometer = chosen.barometerInstrumentId ? found.get(chosen.barometerInstrumentId)! : null;
  return {
    values: {
      instrumentId: chosen.readingInstrumentId,
      probeInstrumentId: chosen.probeInstrumentId,
      airInstrumentId: chosen.airInstrumentId,
      barometerInstrumentId: chosen.barometerInstrumentId,
      instrument: reading ? instrumentName(reading) : "",
      instrumentSerial: reading?.serial ?? "",
      // A standard pitot-static tube reads C = 1.0 (common practice) unless the register says otherwise.
      probeCoefficient: probe?.probeCoefficient ?? 1,
      probeHeadDiameterMm: probe?.probeHeadDiameterMm ?? null,
      instrumentAccuracy: engineAccuracy([reading, air, barometer]),
      ...extra,
    },
  };
}

async function conditionsColumn(conditionsId: string | null, systemId: string, systemTag: string): Promise<{ field: string } | { value: string | null }> {
  if (conditionsId === null) return { value: null };
  const row = await getConditions({ id: conditionsId });
  if (!row || row.systemId !== systemId)
    return { field: `names no operating conditions recorded for ${systemTag}; conditions recorded on a device reach the server when it has network: try again once they show as saved` };
  return { value: row.id };
}

/** Grid and unreadable points as stored rows, with every shape problem named `readings.L.P` (0-based). */
function pointsOf(t: Pick<Traverse, "lines" | "pointsPerLine" | "readingsKind">, readings: Grid, unreadable: readonly PointRef[]): { fields: Record<string, string> } | { points: PointValue[] } {
  const fields: Record<string, string> = {};
  const limit = READING_LIMITS[t.readingsKind];
  const add = (path: string, message: string) => {
    if (Object.keys(fields).length < 50) fields[path] = message;
  };
  if (readings.length < t.lines) add(`readings.${readings.length}.0`, `is missing: this traverse has ${t.lines} lines of ${t.pointsPerLine} points, and ${readings.length} ${readings.length === 1 ? "line was" : "lines were"} sent (give null for a point not read)`);
  for (let k = t.lines; k < readings.length; k++) add(`readings.${k}.0`, `is beyond the traverse's ${t.lines} lines (lines are counted from 0)`);
  readings.slice(0, t.lines).forEach((row, k) => {
    if (row.length < t.pointsPerLine) add(`readings.${k}.${row.length}`, `is missing: line ${k} has ${row.length} readings; every line needs ${t.pointsPerLine} (give null for a point not read)`);
    for (let i = t.pointsPerLine; i < row.length; i++) add(`readings.${k}.${i}`, `is beyond the ${t.pointsPerLine} points of line ${k} (points are counted from 0)`);
    row.slice(0, t.pointsPerLine).forEach((v, i) => {
      if (v !== null && (v < limit.min || v > limit.max)) add(`readings.${k}.${i}`, `must be ${limit.what} from ${limit.min} to ${limit.max} ${limit.unit} (or null for a point not read); got ${v}`);
    });
  });
  const seen = new Set<string>();
  unreadable.forEach(([k, i], n) => {
    if (k >= t.lines || i >= t.pointsPerLine) add(`unreadable.${n}`, `names line ${k} point ${i}, which this ${t.lines} × ${t.pointsPerLine} traverse does not have (counted from 0)`);
    else if (readings[k]?.[i] != null) add(`readings.${k}.${i}`, `is marked unreadable (unreadable.${n}) but has the value ${readings[k]![i]}: give null, or take it off the unreadable list`);
    seen.add(`${k}:${i}`);
  });
  if (Object.keys(fields).length > 0) return { fields };
  const points: PointValue[] = [];
  readings.forEach((row, k) =>
    row.forEach((v, i) => {
      if (v !== null) points.push({ line: k + 1, point: i + 1, value: v, unreadable: false });
      else if (seen.has(`${k}:${i}`)) points.push({ line: k + 1, point: i + 1, value: null, unreadable: true });
    }),
  );
  return { points };
}

function summarize(fields: Record<string, string>, what: string): string {
  const names = Object.keys(fields);
  return `The ${what} is not valid: check ${names.slice(0, 3).join(", ")}${names.length > 3 ? ` and ${names.length - 3} more` : ""}.`;
}

/** The traverse as the API returns it: stored fields, readings grid, layout, the engine's input and result. */
export async function traverseResource(found: TraverseInProject, project: Project, rows?: Reading[], options: { history?: boolean } = {}) {
  const { traverse: t, section, system } = found;
  const readingRows = rows ?? (await listReadingsOfTraverse({ traverseId: t.id }));
  const { readings, unreadable } = gridOfRows(t.lines, t.pointsPerLine, readingRows);
  const source = engineSourceOf(t, section, project);
  const [instruments, conditions, revisions, decisions] = await Promise.all([
    instrumentsById([t.instrumentId, t.probeInstrumentId, t.airInstrumentId, t.barometerInstrumentId]),
    t.conditionsId ? cachedRead(`conditions:${t.conditionsId}`, () => getConditions({ id: t.conditionsId! })) : Promise.resolve(null),
    options.history ? listRevisionsOfSection({ sectionId: section.id }) : Promise.resolve(null),
    // Asked again on every save of the grid; they change only when someone reviews.
    cachedRead(`reviews-of-traverse:${t.id}`, () => listReviewsOf({ traverseIds: [t.id] })),
  ]);
  const last = decisions[0];
  const layout = runCalcCommand("layout", layoutCalcInput(source));
  const reduction = reduceTraverseSource(source, readings, unreadable);
  const onDate = t.takenAt ?? new Date();
  const described = (id: string | null) => {
    const row = id ? instruments.get(id) : undefined;
    return row
      ? { id: row.id, kind: row.kind, name: instrumentName(row), serial: row.serial, rangeMin: row.rangeMin, rangeMax: row.rangeMax, calibrationStatus: instrumentUsability(row, onDate) }
      : null;
  };
  const uses = SLOTS.map((slot) => ({ field: `instrument.${slot}`, instrument: instruments.get((t[COLUMN[slot]] as string | null) ?? "") })).filter(
    (u): u is { field: string; instrument: Instrument } => !!u.instrument,
  );
  const result = reduction.ok
    ? {
        ...(camelKeys(reduction.output) as Record<string, unknown>),
        pctOfDesign: (100 * (reduction.output.standard_flow_m3_s as number)) / section.designFlowM3S,
        counts: reduction.counts,
        complete: reduction.counts.notRead === 0,
      }
    : null;
  return {
    id: t.id,
    sectionId: section.id,
    sectionTag: section.tag,
    systemId: system.id,
    systemTag: system.tag,
    revision: t.revision,
    status: t.status,
    version: t.version,
    method: t.method,
    lines: t.lines,
    pointsPerLine: t.pointsPerLine,
    portOffsetMm: t.portOffsetMm,
    readingsKind: t.readingsKind,
    air: { dryBulbC: t.dryBulbC, relativeHumidityPct: t.relativeHumidityPct, wetBulbC: t.wetBulbC, staticPa: t.staticPa, barometricPa: t.barometricPa },
    instrument: {
      readingInstrumentId: t.instrumentId,
      probeInstrumentId: t.probeInstrumentId,
      airInstrumentId: t.airInstrumentId,
      barometerInstrumentId: t.barometerInstrumentId,
      overdueReason: t.overdueReason,
      standardDensityKgM3: t.instrumentStandardDensityKgM3,
      probeCoefficient: t.probeCoefficient,
      probeHeadDiameterMm: t.probeHeadDiameterMm,
      accuracy: t.instrumentAccuracy,
      reading: described(t.instrumentId),
      probe: described(t.probeInstrumentId),
      airMeter: described(t.airInstrumentId),
      barometer: described(t.barometerInstrumentId),
      calibrationProblems: calibrationProblems(uses, onDate, t.overdueReason, "instrument.overdueReason"),
    },
    conditionsId: t.conditionsId,
    conditions: conditions ? conditionsJson(conditions) : null,
    notes: t.notes,
    takenBy: t.takenBy,
    takenByName: found.takenByName,
    takenAt: t.takenAt,
    createdAt: t.createdAt,
    updatedAt: t.updatedAt,
    section: {
      id: section.id,
      tag: section.tag,
      shape: section.shape,
      diameterMm: section.diameterMm,
      widthMm: section.widthMm,
      heightMm: section.heightMm,
      designFlowM3S: section.designFlowM3S,
      straightUpstreamMm: section.straightUpstreamMm,
      straightDownstreamMm: section.straightDownstreamMm,
      location: section.location,
    },
    system: { id: system.id, tag: system.tag, name: system.name, kind: system.kind, fanSpeedRpm: system.fanSpeedRpm, hasVfd: system.hasVfd },
    project: { altitudeM: project.altitudeM, standardDensityKgM3: project.standardDensityKgM3 },
    readings,
    unreadable,
    layout: layout.ok ? camelKeys(layout.value) : null,
    /** Exactly what `npm run -s calc -- traverse` takes to give `result`. */
    engineInput: reduction.input,
    result,
    resultError: reduction.ok ? null : { message: reduction.message, ...(reduction.fields ? { fields: reduction.fields } : {}) },
    ...(revisions ? { revisions } : {}),
    submittedAt: t.submittedAt,
    /** The commissioning agent's latest decision on this traverse (a return's comment is what to correct). */
    lastReview: last ? { decision: last.decision, comment: last.reason, reviewerName: last.reviewerName, witnessed: last.witnessed, at: last.createdAt, version: last.traverseVersion } : null,
  };
}
export type TraverseResource = Awaited<ReturnType<typeof traverseResource>>;

async function reload(project: Project, traverseId: string, options?: { history?: boolean }) {
  const found = await getTraverseInProject({ projectId: project.id, traverseId });
  return found ? traverseResource(found, project, undefined, options) : null;
}

export async function getTraverse(project: Project, traverseId: string): Promise<Outcome> {
  if (!isUuid(traverseId)) return fail(404, NO_TRAVERSE);
  const resource = await reload(project, traverseId, { history: true });
  return resource ? ok(200, { traverse: resource }) : fail(404, NO_TRAVERSE);
}

export async function createTraverse(user: { id: string }, project: Project, body: TraverseCreate): Promise<Outcome> {
  if (body.id) {
    // A device retrying a create whose answer it never got: the stored traverse, not a second one.
    const existing = await getTraverseById({ traverseId: body.id });
    if (existing) {
      const mine = existing.sectionId === body.sectionId && existing.takenBy === user.id ? await reload(project, existing.id) : null;
      return mine ? ok(200, { traverse: mine }) : fail(409, "That id belongs to another traverse; the device should choose a new one.", { id: "is already used by another traverse" });
    }
  }
  const found = await getSectionInProject({ projectId: project.id, sectionId: body.sectionId });
  if (!found) return fail(400, "The traverse is not valid: check sectionId.", { sectionId: `names no duct section of this project; got ${JSON.stringify(body.sectionId)}` });
  const { section, system } = found;
  const fields: Record<string, string> = {};
  const readingsKind = body.readingsKind ?? "velocity_pressure";
  const lines = body.lines;
  const pointsPerLine = body.pointsPerLine;
  const counts = layoutCountProblem(section.shape, body.method, { lines, pointsPerLine });
  if (counts) fields[counts.field === "lines" ? "lines" : "pointsPerLine"] = counts.message;
  Object.assign(fields, impossibleAir(body.air, project.altitudeM));
  const instrument = await instrumentColumns(body.instrument ?? {}, readingsKind);
  if ("fields" in instrument) Object.assign(fields, instrument.fields);
  const conditions = await conditionsColumn(body.conditionsId ?? null, system.id, system.tag);
  if ("field" in conditions) fields.conditionsId = conditions.field;
  if (Object.keys(fields).length > 0) return fail(400, summarize(fields, "traverse"), fields);

  // Counts left out are the engine's recommendation for this duct and straight run.
  const source = engineSourceOf(
    { method: body.method, lines: lines ?? 0, pointsPerLine: pointsPerLine ?? 0, portOffsetMm: body.portOffsetMm ?? 0, readingsKind, probeCoefficient: 1, probeHeadDiameterMm: null, instrumentAccuracy: {}, instrumentStandardDensityKgM3: null, ...airColumns(body.air) },
    section,
    project,
  );
  const layoutInput = layoutCalcInput(source);
  if (lines === undefined) delete layoutInput.lines;
  if (pointsPerLine === undefined) delete layoutInput.points_per_line;
  const layout = runCalcCommand("layout", layoutInput);
  if (!layout.ok) return fail(400, layout.error.message, layout.error.fields);
  const planned = layout.value as { line_count: number; points_per_line: number };

  const row = await insertTraverseRevision({
    ...(body.id ? { id: body.id } : {}),
    sectionId: section.id,
    method: body.method,
    lines: planned.line_count,
    pointsPerLine: planned.points_per_line,
    readingsKind,
    portOffsetMm: body.portOffsetMm ?? 0,
    ...airColumns(body.air),
    ...("values" in instrument ? instrument.values : {}),
    conditionsId: "value" in conditions ? conditions.value : null,
    notes: body.notes ?? "",
    takenBy: user.id,
    takenAt: new Date(),
  });
  await recordAudit({
    userId: user.id,
    projectId: project.id,
    action: row.revision > 1 ? "traverse.retraversed" : "traverse.started",
    entityType: "traverse",
    entityId: row.id,
    detail: { sectionId: section.id, sectionTag: section.tag, systemTag: system.tag, revision: row.revision, method: row.method, lines: row.lines, pointsPerLine: row.pointsPerLine },
  });
  const resource = await reload(project, row.id, { history: true });
  return ok(201, { traverse: resource });
}

/** The traverse, or the refusal when it does not exist here or may no longer change. `read` is how it is looked up. */
async function editable<T extends TraverseToEdit>(
  project: Project,
  traverseId: string,
  read: (q: { projectId: string; traverseId: string }) => Promise<T | null>,
): Promise<{ found: T } | { outcome: Outcome }> {
  if (!isUuid(traverseId)) return { outcome: fail(404, NO_TRAVERSE) };
  const found = await read({ projectId: project.id, traverseId });
  if (!found) return { outcome: fail(404, NO_TRAVERSE) };
  if (!EDITABLE_STATUSES.includes(found.traverse.status)) {
    const word = found.traverse.status === "approved" ? "approved" : "submitted for review";
    return {
      outcome: fail(409, `Traverse ${found.section.tag} revision ${found.traverse.revision} was ${word}; its readings are locked. Start a re-traverse of ${found.section.tag} to take new readings.`, undefined, { status: found.traverse.status }),
    };
  }
  return { found };
}

/** 409 with the traverse as it stands now; `found` when the caller has just read it. */
async function stale(project: Project, traverseId: string, found?: TraverseInProject): Promise<Outcome> {
  const current = found ? await traverseResource(found, project) : await reload(project, traverseId);
  return fail(409, `Someone saved this traverse first (it is now at version ${current?.version ?? "?"}); nothing was changed. Compare both versions and choose which to keep.`, undefined, { traverse: current });
}

/** A guarded save changed nothing: the traverse was submitted meanwhile (409 locked), or saved by someone else first. */
async function notSaved(project: Project, traverseId: string): Promise<Outcome> {
  const again = await editable(project, traverseId, getTraverseInProject);
  return "outcome" in again ? again.outcome : stale(project, traverseId, again.found);
}

/** Column changes shared by PUT readings and PATCH: air, instruments, conditions. */
async function settingsColumns(project: Project, found: TraverseToEdit, body: { air?: Air; instrument?: InstrumentChoice; conditionsId?: string | null }) {
  const fields: Record<string, string> = {};
  const values: Partial<Traverse> = {};
  if (body.air) {
    Object.assign(fields, impossibleAir(body.air, project.altitudeM));
    Object.assign(values, airColumns(body.air));
  }
  if (body.instrument) {
    const chosen = await instrumentColumns(body.instrument, found.traverse.readingsKind, found.traverse);
    if ("fields" in chosen) Object.assign(fields, chosen.fields);
    else Object.assign(values, chosen.values);
  }
  if (body.conditionsId !== undefined) {
    const c = await conditionsColumn(body.conditionsId, found.system.id, found.system.tag);
    if ("field" in c) fields.conditionsId = c.field;
    else values.conditionsId = c.value;
  }
  return { fields, values };
}

function changedColumns(before: TraverseSettings, values: Partial<Traverse>) {
  const b: Record<string, unknown> = {};
  const a: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(values)) {
    const old = (before as Record<string, unknown>)[key];
    if (JSON.stringify(old) !== JSON.stringify(value)) {
      b[key] = old ?? null;
      a[key] = value ?? null;
    }
  }
  return { before: b, after: a };
}

export async function saveReadings(user: { id: string }, project: Project, traverseId: string, body: ReadingsSave): Promise<Outcome> {
  // The traverse as last read (without its version, which every save changes): the save's own guarded
  // UPDATE checks the version and the status against the database.
  const got = await editable(project, traverseId, getTraverseToEdit);
  if ("outcome" in got) return got.outcome;
  const { found } = got;
  const t = found.traverse;
  const points = pointsOf(t, body.readings, body.unreadable ?? []);
  const settings = await settingsColumns(project, found, body);
  const fields = { ...("fields" in points ? points.fields : {}), ...settings.fields };
  if (Object.keys(fields).length > 0) {
    // A stale version is answered before anything else is judged: the device needs the current state.
    const current = await getTraverseInProject({ projectId: project.id, traverseId });
    if (current && current.traverse.version !== body.version) return stale(project, traverseId, current);
    return fail(400, summarize(fields, "readings save"), fields);
  }
  const saved = await saveTraverseReadings({
    traverseId,
    version: body.version,
    points: "points" in points ? points.points : [],
    values: settings.values,
  });
  if (saved.status === "stale") return notSaved(project, traverseId);
  const columns = changedColumns(t, settings.values);
  if (saved.changes.length > 0 || Object.keys(columns.after).length > 0) {
    await recordAudit({
      userId: user.id,
      projectId: project.id,
      action: "traverse.readings_saved",
      entityType: "traverse",
      entityId: traverseId,
      detail: {
        sectionTag: found.section.tag,
        revision: t.revision,
        version: saved.traverse.version,
        changedPoints: saved.changes.length,
        // Lines and points 1-based, as a technician counts them; at most 200 listed.
        changes: saved.changes.slice(0, 200),
        ...(Object.keys(columns.after).length > 0 ? columns : {}),
      },
    });
  }
  const resource = await traverseResource({ ...found, traverse: saved.traverse }, project, saved.rows ?? undefined);
  return ok(200, { traverse: resource });
}

export async function patchTraverse(user: { id: string }, project: Project, traverseId: string, body: TraversePatch): Promise<Outcome> {
  const got = await editable(project, traverseId, getTraverseInProject);
  if ("outcome" in got) return got.outcome;
  const { found } = got;
  if (body.version !== found.traverse.version) return stale(project, traverseId);
  const settings = await settingsColumns(project, found, body);
  if (Object.keys(settings.fields).length > 0) return fail(400, summarize(settings.fields, "traverse change"), settings.fields);
  const values: Partial<Traverse> = { ...settings.values };
  if (body.portOffsetMm !== undefined) values.portOffsetMm = body.portOffsetMm ?? 0;
  if (body.notes !== undefined) values.notes = body.notes;
  const saved = await saveTraverseReadings({ traverseId, version: body.version, points: null, values });
  if (saved.status === "stale") return notSaved(project, traverseId);
  const columns = changedColumns(found.traverse, values);
  if (Object.keys(columns.after).length > 0)
    await recordAudit({ userId: user.id, projectId: project.id, action: "traverse.changed", entityType: "traverse", entityId: traverseId, detail: { sectionTag: found.section.tag, revision: found.traverse.revision, ...columns } });
  const resource = await traverseResource({ ...found, traverse: saved.traverse }, project);
  return ok(200, { traverse: resource });
}

export function respond(outcome: Outcome): Response {
  return Response.json(outcome.body, { status: outcome.status });
}
