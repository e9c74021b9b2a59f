import "server-only";
import { recordAudit } from "@/db/queries/audit";
import { getConditions, type ConditionsRow } from "@/db/queries/conditions";
import { getInstrument, listInstruments } from "@/db/queries/instruments";
import { submittedSetOfSystem } from "./review";
import { getTerminalReading, getTraverseWithSection, listTerminalReadings, recordTerminalReading, type NewTerminalReading } from "@/db/queries/terminal-readings";
import type { SessionUser } from "@/db/queries/users";
import type { AirSystem, DuctSection, Instrument, InstrumentKind, Project, Terminal, TerminalSetpoint } from "@/db/schema";
import { EngineInputError } from "@/lib/airflow/errors";
import { compareConditions, BOX_LABELS } from "@/lib/airflow/conditions";
import { instrumentName, KIND_INFO } from "@/lib/instruments/kinds";
import { calibrationProblems } from "@/lib/instruments/usability";
import { computeReadingFlow, ReadingInputError, readingColumns, readingValuesFromBody, verdictWords } from "@/lib/terminals/reading";
import { SETPOINT_LABELS, setpointsFor } from "@/lib/terminals/setpoints";
import { isTerminalUnit } from "@/lib/validation/design";
import { formatQuantity, unitSystemFor } from "@/lib/units";
import type { TerminalReadingCreate } from "@/lib/validation/terminal-readings";
import { reduceStoredTraverse } from "./airflow-view";
import { designOf, formatFor, terminalReadingJson, type TerminalReadingJson } from "./terminal-reading-json";

export interface TerminalPlace {
  terminal: Terminal;
  section: DuctSection;
  system: AirSystem;
}

export type RecordOutcome =
  | { status: 201 | 200; reading: TerminalReadingJson; warnings: string[] }
  | { status: 400 | 409; message: string; fields?: Record<string, string> };

/** The instrument kinds each method reads with. */
const READING_KINDS: Record<"hood" | "velocity_area", readonly InstrumentKind[]> = {
  hood: ["capture_hood"],
  velocity_area: ["thermal_anemometer", "vane_anemometer"],
};
const AIR_KINDS: readonly InstrumentKind[] = ["thermo_hygrometer"];

const kindList = (kinds: readonly InstrumentKind[]) => kinds.map((k) => KIND_INFO[k].label.toLowerCase()).join(" or ");

/** The register as a map, for naming instruments and their ranges in a list of readings. */
export async function instrumentMap(): Promise<Map<string, Instrument>> {
  return new Map((await listInstruments({ includeRetired: true })).map((i) => [i.id, i]));
}

/**
 * Records one reading of a terminal: checks it against the terminal (setpoint, method, the fields a
 * terminal unit alone has), the operating conditions (of this system), the instruments (their kind
 * and calibration on the reading's date) and, for a traverse, that it is one of the terminal's own
 * duct; works out the airflow; stores it in the system's open terminal set; audits it. A retried
 * create (same client id) answers 200 with what is stored.
 */
export async function recordReadingOfTerminal({ user, project, place, body }: { user: SessionUser; project: Project; place: TerminalPlace; body: TerminalReadingCreate }): Promise<RecordOutcome> {
  const { terminal, system, section } = place;
  const unit = isTerminalUnit(terminal.type);
  const fields: Record<string, string> = {};
  const takenAt = body.takenAt ? new Date(body.takenAt) : new Date();

  // A retry of a reading already stored answers with it, whatever has changed since (the register, the design).
  if (body.id) {
    const prior = await findExisting(body.id, user, project, place);
    if (prior) return prior;
  }
  // A submitted set is locked while the commissioning agent reviews it; after a decision new readings open the next set.
  const locked = await submittedSetOfSystem(system.id);
  if (locked)
    return {
      status: 409,
      message: `The terminal readings of ${system.tag} (set ${locked.revision}) are submitted for review and locked; nothing was recorded. Once the commissioning agent approves or returns them, new readings can be taken (after approval they open set ${locked.revision + 1}).`,
    };

  const allowed = setpointsFor(designOf(terminal));
  const setpoint: TerminalSetpoint | undefined = body.setpoint ?? (unit ? undefined : "design");
  if (setpoint === undefined) fields.setpoint = `say which setpoint ${terminal.tag} was forced to: ${allowed.map((s) => `"${s}"`).join(", ")}`;
  else if (!allowed.includes(setpoint))
    fields.setpoint = unit
      ? `${terminal.tag} has no ${SETPOINT_LABELS[setpoint].toLowerCase()} airflow scheduled; read it at ${allowed.map((s) => `"${s}"`).join(", ")}; got "${setpoint}"`
      : `an outlet or inlet is read at "design"; got "${setpoint}"`;
  if (!unit) {
    if (body.controllerFlowM3S != null) fields.controllerFlowM3S = "belongs to terminal units (a box's controller display); leave it out for an outlet or inlet";
    if (body.controllerFlowFactor != null) fields.controllerFlowFactor = "belongs to terminal units; leave it out for an outlet or inlet";
  }

  // Instruments: the reading instrument for hood and velocity × area, an optional air instrument.
  let instrument: Instrument | null = null;
  let airInstrument: Instrument | null = null;
  if (body.method !== "traverse") {
    const kinds = READING_KINDS[body.method];
    if (!body.instrumentId) fields.instrumentId = `name the ${kindList(kinds)} from the register`;
    else {
      instrument = await getInstrument({ id: body.instrumentId });
      if (!instrument) fields.instrumentId = "is not an instrument in the register";
      else if (!kinds.includes(instrument.kind)) fields.instrumentId = `${instrumentName(instrument)} is not a ${kindList(kinds)}`;
    }
    if (body.airInstrumentId) {
      airInstrument = await getInstrument({ id: body.airInstrumentId });
      if (!airInstrument) fields.airInstrumentId = "is not an instrument in the register";
      else if (!AIR_KINDS.includes(airInstrument.kind)) fields.airInstrumentId = `${instrumentName(airInstrument)} is not a ${kindList(AIR_KINDS)}`;
    }
  } else if (body.instrumentId) fields.instrumentId = "a traverse names its own instruments; leave it out";

  // A traverse of the terminal's own duct.
  let traverseFlow: { flowM3S: number; standardFlowM3S: number; densityKgM3: number; version: number; conditionsId: string | null } | null = null;
  if (body.method === "traverse" && body.traverseId) {
    const found = await getTraverseWithSection({ projectId: project.id, traverseId: body.traverseId });
    if (!found) fields.traverseId = "is not a traverse in this project";
    else if (found.section.id !== terminal.sectionId) fields.traverseId = `is a traverse of ${found.section.tag}; ${terminal.tag}'s own duct is ${section.tag}`;
    else if (found.terminalsOnSection > 1) fields.traverseId = `${section.tag} feeds ${found.terminalsOnSection} terminals: its traverse measures them together, not ${terminal.tag} alone`;
    else if (found.traverse.status === "returned") fields.traverseId = "was returned by the commissioning agent: correct it (or re-traverse) before taking its airflow";
    else {
      const reduced = reduceStoredTraverse(found.traverse, found.section, project);
      if (!reduced.ok) fields.traverseId = `cannot give an airflow yet: ${reduced.message}`;
      else
        traverseFlow = {
          flowM3S: reduced.result.flowM3S,
          standardFlowM3S: reduced.result.standardFlowM3S,
          densityKgM3: reduced.result.densityKgM3,
          version: found.traverse.version,
          conditionsId: found.traverse.conditionsId,
        };
    }
  }

  // Operating conditions of this system.
  const conditionsId = body.conditionsId ?? (body.method === "traverse" ? (traverseFlow?.conditionsId ?? null) : null);
  let conditions: ConditionsRow | null = null;
  if (!conditionsId) {
    if (!fields.traverseId) fields.conditionsId = `name the operating conditions ${system.tag} was running under (record them first if there are none)`;
  } else {
    conditions = await getConditions({ id: conditionsId });
    if (!conditions || conditions.systemId !== system.id) fields.conditionsId = `is not a record of ${system.tag}'s operating conditions`;
  }

  // Calibration on the day of the reading: past due (or no due date) needs a reason; retired cannot be used.
  const uses = [
    ...(instrument ? [{ field: "instrumentId", instrument }] : []),
    ...(airInstrument ? [{ field: "airInstrumentId", instrument: airInstrument }] : []),
  ];
  Object.assign(fields, calibrationProblems(uses, takenAt, body.overdueReason) ?? {});
  if (Object.keys(fields).length > 0) return invalid(fields);

  // The airflow.
  const values = readingValuesFromBody(body, setpoint!, { isUnit: unit, effectiveAreaM2: terminal.effectiveAreaM2, controllerFlowFactor: terminal.controllerFlowFactor }, instrument);
  let flow: { flowM3S: number; standardFlowM3S: number; densityKgM3: number | null; warnings: string[] };
  if (traverseFlow) flow = { ...traverseFlow, warnings: [] };
  else {
    try {
      flow = computeReadingFlow(values, designOf(terminal), project, { format: formatFor(user, project) });
    } catch (err) {
      if (err instanceof ReadingInputError || err instanceof EngineInputError) return invalid(err.fields);
      throw err;
    }
  }

  const stored: NewTerminalReading = {
    ...(body.id ? { id: body.id } : {}),
    ...readingColumns(values, flow),
    traverseId: body.method === "traverse" ? body.traverseId! : null,
    traverseVersion: traverseFlow?.version ?? null,
    conditionsId,
    instrumentId: instrument?.id ?? null,
    airInstrumentId: airInstrument?.id ?? null,
    overdueReason: body.overdueReason,
    notes: body.notes,
    takenAt,
  };
  const outcome = await recordTerminalReading({ systemId: system.id, terminalId: terminal.id, takenBy: user.id, values: stored });
  if (outcome.status === "conflict") return { status: 409, message: "That id belongs to another reading; the device should choose a new one.", fields: { id: "is already used by another reading" } };
  const instruments = await instrumentMap();
  const reading = terminalReadingJson(outcome.row, { terminal, project, instruments, format: formatFor(user, project) });
  const warnings = [...flow.warnings.filter((w) => !reading.warnings.includes(w)), ...(await conditionWarnings(outcome.row.id, user, project, place, conditions, values.setpoint))];
  if (outcome.status === "existing") return { status: 200, reading, warnings };

  await recordAudit({
    userId: user.id,
    projectId: project.id,
    action: "terminal.reading_recorded",
    entityType: "terminal_reading",
    entityId: reading.id,
    detail: {
      systemTag: system.tag,
      terminalTag: terminal.tag,
      setId: outcome.row.setId,
      phase: reading.phase,
      setpoint: reading.setpoint,
      method: reading.method,
      after: { flowM3S: reading.flowM3S, standardFlowM3S: reading.standardFlowM3S, pctOfDesign: reading.pctOfDesign, withinTolerance: reading.withinTolerance },
      verdict: verdictWords(reading),
      flags: reading.flags,
      takenAt: takenAt.toISOString(),
    },
  });
  return { status: 201, reading, warnings };
}

function invalid(fields: Record<string, string>): RecordOutcome {
  const names = Object.keys(fields);
  return { status: 400, message: `The reading is not valid: check ${names.slice(0, 3).join(", ")}${names.length > 3 ? ` and ${names.length - 3} more` : ""}.`, fields };
}

async function findExisting(id: string, user: SessionUser, project: Project, place: TerminalPlace): Promise<RecordOutcome | null> {
  const row = await getTerminalReading({ id });
  if (!row) return null;
  if (row.terminalId !== place.terminal.id) return { status: 409, message: "That id belongs to another reading; the device should choose a new one.", fields: { id: "is already used by another reading" } };
  const reading = terminalReadingJson(row, { terminal: place.terminal, project, instruments: await instrumentMap(), format: formatFor(user, project) });
  return { status: 200, reading, warnings: [] };
}

/**
 * Readings under different recorded operating conditions are not compared without saying so: the new
 * reading against the terminal's previous one at the same setpoint, and a terminal unit read at a
 * setpoint other than the one the recorded conditions forced the units to.
 */
async function conditionWarnings(readingId: string, user: SessionUser, project: Project, place: TerminalPlace, conditions: ConditionsRow | null, setpoint: TerminalSetpoint): Promise<string[]> {
  const out: string[] = [];
  const { rows } = await listTerminalReadings({ projectId: project.id, terminalId: place.terminal.id, limit: 50 });
  const index = rows.findIndex((r) => r.id === readingId);
  const previous = rows.slice(index + 1).find((r) => r.setpoint === setpoint);
  if (previous && conditions) {
    const previousConditions = previous.conditionsId ? await getConditions({ id: previous.conditionsId }) : null;
    const differences = compareConditions(previousConditions, conditions, { labels: [`the previous ${previous.phase} reading`, "this reading"], formatPressure: (pa) => formatQuantity(unitSystemFor(user, project), "pressure", pa) });
    if (differences.length > 0)
      out.push(`Not comparable with the previous ${previous.phase} reading of ${place.terminal.tag} without care: ${differences.map((d) => d.message).join(" ")}`);
  }
  if (conditions && isTerminalUnit(place.terminal.type) && (setpoint === "maximum" || setpoint === "minimum") && conditions.boxes !== "none" && conditions.boxes !== "mixed" && conditions.boxes !== setpoint)
    out.push(`Read at ${SETPOINT_LABELS[setpoint].toLowerCase()}, but the recorded conditions have the terminal units ${BOX_LABELS[conditions.boxes]}: record the conditions the unit was read under.`);
  return out;
}
