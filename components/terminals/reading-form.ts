/**
 * The entry panel's values as typed (text in the user's units) and the reading they make (SI JSON,
 * the API's body): parsing, the checks the server would make that the device can make too (so a
 * technician hears about them while still at the outlet), and the field each problem belongs to.
 */
import type { TerminalSetpoint } from "@/db/schema";
import type { TerminalReadingBody } from "@/lib/api-client/terminals";
import type { Instrument } from "@/lib/api-client/field";
import { FORM_UNITS } from "@/lib/design/quantities";
import { calibrationProblems } from "@/lib/instruments/usability";
import { setpointsFor, type ReadingMethod, type ReadingPhase } from "@/lib/terminals/setpoints";
import { fromDisplay, type UnitSystem } from "@/lib/units";
import { parseDecimal } from "@/lib/validation/decimal";
import { zodFieldErrors } from "@/lib/validation/result";
import { terminalReadingCreateSchema, type VELOCITY_BASES } from "@/lib/validation/terminal-readings";
import { isTerminalUnit } from "@/lib/validation/design";
import type { BoardTerminal } from "./model";

export type VelocityBasisChoice = (typeof VELOCITY_BASES)[number];

export interface PanelValues {
  phase: ReadingPhase;
  setpoint: TerminalSetpoint;
  method: ReadingMethod;
  hoodReading: string;
  hoodFactor: string;
  hoodDensityCorrected: "yes" | "no";
  hoodBackPressure: "yes" | "no";
  velocities: string[];
  velocityBasis: VelocityBasisChoice;
  effectiveArea: string;
  traverseId: string | null;
  dryBulb: string;
  rh: string;
  controllerFlow: string;
  controllerFactor: string;
  damperMarked: boolean;
  instrumentId: string | null;
  airInstrumentId: string | null;
  overdueReason: string;
  notes: string;
}

/** What the technician used last on this project, on this device: the next panel starts from it. */
export interface Habits {
  method: ReadingMethod;
  hoodDensityCorrected: "yes" | "no";
  hoodBackPressure: "yes" | "no";
  velocityBasis: VelocityBasisChoice;
  dryBulb: string;
  rh: string;
  hoodInstrumentId: string | null;
  anemometerId: string | null;
  airInstrumentId: string | null;
}

export const DEFAULT_HABITS: Habits = {
  method: "hood",
  hoodDensityCorrected: "no",
  hoodBackPressure: "yes",
  velocityBasis: "actual",
  dryBulb: "",
  rh: "",
  hoodInstrumentId: null,
  anemometerId: null,
  airInstrumentId: null,
};

/** Velocity cells offered at first; more can be added. */
export const FIRST_VELOCITY_CELLS = 4;

export function initialValues(terminal: BoardTerminal, setpoint: TerminalSetpoint, phase: ReadingPhase, habits: Habits): PanelValues {
  const method = habits.method === "velocity_area" && isTerminalUnit(terminal.kind) ? "hood" : habits.method;
  return {
    phase,
    setpoint,
    method,
    hoodReading: "",
    hoodFactor: "",
    hoodDensityCorrected: habits.hoodDensityCorrected,
    hoodBackPressure: habits.hoodBackPressure,
    velocities: Array(FIRST_VELOCITY_CELLS).fill(""),
    velocityBasis: habits.velocityBasis,
    effectiveArea: "",
    traverseId: null,
    dryBulb: habits.dryBulb,
    rh: habits.rh,
    controllerFlow: "",
    controllerFactor: "",
    damperMarked: false,
    instrumentId: method === "velocity_area" ? habits.anemometerId : method === "hood" ? habits.hoodInstrumentId : null,
    airInstrumentId: habits.airInstrumentId,
    overdueReason: "",
    notes: "",
  };
}

/** Form field ↔ API field: errors from the schema land beside the field that was typed. */
const FIELD_OF_API: Record<string, keyof PanelValues> = {
  phase: "phase",
  setpoint: "setpoint",
  method: "method",
  hoodFlowM3S: "hoodReading",
  hoodCorrectionFactor: "hoodFactor",
  hoodDensityCorrected: "hoodDensityCorrected",
  hoodBackPressureCompensated: "hoodBackPressure",
  velocitiesMS: "velocities",
  velocityBasis: "velocityBasis",
  effectiveAreaM2: "effectiveArea",
  traverseId: "traverseId",
  dryBulbC: "dryBulb",
  relativeHumidityPct: "rh",
  controllerFlowM3S: "controllerFlow",
  controllerFlowFactor: "controllerFactor",
  damperMarked: "damperMarked",
  instrumentId: "instrumentId",
  airInstrumentId: "airInstrumentId",
  overdueReason: "overdueReason",
  notes: "notes",
  conditionsId: "conditions" as keyof PanelValues,
};

/** The form key of an API field error ("velocitiesMS.2" → "velocities.2"). */
export function formKey(apiField: string): string {
  const [head, ...rest] = apiField.split(".");
  const mapped = FIELD_OF_API[head!] ?? head!;
  return [mapped, ...rest].join(".");
}

export interface BuildContext {
  terminal: BoardTerminal;
  units: UnitSystem;
  conditionsId: string | null;
  /** The register as kept on the device, to check calibration before sending. */
  instruments: readonly Instrument[];
  /** The chosen traverse carries its own conditions. */
  traverseConditionsId: string | null;
  /** For the live result: skip what only recording needs (instrument, conditions, calibration reason). */
  preview?: boolean;
}

export type BuildResult = { ok: true; body: TerminalReadingBody } | { ok: false; errors: Record<string, string> };

/**
 * The reading the panel describes, or the problems with it, keyed by form field (velocity cells as
 * "velocities.<index>"). `id` and `takenAt` are chosen by the caller when it records.
 */
export function buildBody(v: PanelValues, ctx: BuildContext, stamp: { id: string; takenAt: string }): BuildResult {
  const errors: Record<string, string> = {};
  const num = (field: string, text: string) => {
    const n = parseDecimal(text);
    if (n === "invalid") {
      errors[field] = `must be a number; got "${text.trim()}"`;
      return null;
    }
    return n;
  };
  const { units, terminal } = ctx;
  const unit = isTerminalUnit(terminal.kind);
  const body: Record<string, unknown> = { id: stamp.id, takenAt: stamp.takenAt, phase: v.phase, method: v.method };
  if (unit) body.setpoint = v.setpoint;
  if (v.method === "hood") {
    const reading = num("hoodReading", v.hoodReading);
    if (reading === null && !errors.hoodReading) errors.hoodReading = "type the hood's reading";
    else if (reading !== null) body.hoodFlowM3S = fromDisplay(units, "flow", reading);
    const factor = num("hoodFactor", v.hoodFactor);
    if (factor !== null) body.hoodCorrectionFactor = factor;
    body.hoodDensityCorrected = v.hoodDensityCorrected === "yes";
    body.hoodBackPressureCompensated = v.hoodBackPressure === "yes";
  } else if (v.method === "velocity_area") {
    const velocities: number[] = [];
    v.velocities.forEach((text, i) => {
      const n = num(`velocities.${i}`, text);
      if (n !== null) velocities.push(fromDisplay(units, "velocity", n));
    });
    if (velocities.length === 0 && !Object.keys(errors).some((k) => k.startsWith("velocities."))) errors["velocities.0"] = "type at least one velocity reading";
    else body.velocitiesMS = velocities;
    body.velocityBasis = v.velocityBasis;
    const area = num("effectiveArea", v.effectiveArea);
    if (area !== null) body.effectiveAreaM2 = FORM_UNITS[units].area.toSi(area);
    else if (terminal.effectiveAreaM2 === null && !errors.effectiveArea) errors.effectiveArea = `type the maker's effective-area factor (Ak): ${terminal.tag} has none on record`;
  } else {
    if (!v.traverseId) errors.traverseId = "choose the traverse of this terminal's own duct";
    else body.traverseId = v.traverseId;
  }
  if (v.method !== "traverse") {
    const dryBulb = num("dryBulb", v.dryBulb);
    if (dryBulb === null && !errors.dryBulb) errors.dryBulb = "type the dry-bulb at the outlet: the air's density refers the reading to standard air";
    else if (dryBulb !== null) body.dryBulbC = fromDisplay(units, "temperature", dryBulb);
    const rh = num("rh", v.rh);
    if (rh !== null) body.relativeHumidityPct = rh;
    if (v.airInstrumentId) body.airInstrumentId = v.airInstrumentId;
    if (v.instrumentId) body.instrumentId = v.instrumentId;
    else if (!ctx.preview) errors.instrumentId = `choose the ${v.method === "hood" ? "capture hood" : "anemometer"} from the register`;
  }
  if (unit) {
    const shown = num("controllerFlow", v.controllerFlow);
    if (shown !== null) body.controllerFlowM3S = fromDisplay(units, "flow", shown);
    const factor = num("controllerFactor", v.controllerFactor);
    if (factor !== null) body.controllerFlowFactor = factor;
  }
  if (!unit && v.phase === "final") body.damperMarked = v.damperMarked;
  const conditionsId = ctx.conditionsId ?? (v.method === "traverse" ? ctx.traverseConditionsId : null);
  if (conditionsId) body.conditionsId = conditionsId;
  else if (!ctx.preview) errors.conditions = "record the operating conditions the system is running under (above), then record the reading";
  if (v.overdueReason.trim()) body.overdueReason = v.overdueReason;
  if (v.notes.trim()) body.notes = v.notes;
  if (unit && !setpointsFor(terminal).includes(v.setpoint)) errors.setpoint = `choose ${setpointsFor(terminal).join(", ")}`;

  const parsed = terminalReadingCreateSchema.safeParse(body);
  if (!parsed.success) for (const [k, message] of Object.entries(zodFieldErrors(parsed.error))) errors[formKey(k)] ??= message;

  const uses = [v.method !== "traverse" ? v.instrumentId : null, v.method !== "traverse" ? v.airInstrumentId : null]
    .map((id, i) => ({ id, field: i === 0 ? "instrumentId" : "airInstrumentId" }))
    .flatMap(({ id, field }) => {
      const instrument = id ? ctx.instruments.find((x) => x.id === id) : undefined;
      return instrument ? [{ field, instrument }] : [];
    });
  if (!ctx.preview) for (const [k, message] of Object.entries(calibrationProblems(uses, new Date(stamp.takenAt), v.overdueReason) ?? {})) errors[k] ??= message;

  return Object.keys(errors).length > 0 ? { ok: false, errors } : { ok: true, body: body as TerminalReadingBody };
}

/** The panel's values from a reading kept on the device (to edit one the server refused). */
export function panelFromBody(body: TerminalReadingBody, units: UnitSystem, fallback: PanelValues): PanelValues {
  const show = (q: "flow" | "velocity" | "temperature", si: number | null | undefined) => {
    if (si === null || si === undefined) return "";
    const factor = fromDisplay(units, q, 1) - fromDisplay(units, q, 0);
    const shown = (si - fromDisplay(units, q, 0)) / factor;
    return String(Number.parseFloat(shown.toPrecision(6)));
  };
  return {
    ...fallback,
    phase: body.phase,
    setpoint: body.setpoint ?? fallback.setpoint,
    method: body.method,
    hoodReading: show("flow", body.hoodFlowM3S),
    hoodFactor: body.hoodCorrectionFactor == null ? "" : String(body.hoodCorrectionFactor),
    hoodDensityCorrected: body.hoodDensityCorrected === undefined ? fallback.hoodDensityCorrected : body.hoodDensityCorrected ? "yes" : "no",
    hoodBackPressure: body.hoodBackPressureCompensated === undefined ? fallback.hoodBackPressure : body.hoodBackPressureCompensated ? "yes" : "no",
    velocities: body.velocitiesMS?.map((x) => show("velocity", x)) ?? fallback.velocities,
    velocityBasis: body.velocityBasis ?? fallback.velocityBasis,
    effectiveArea: body.effectiveAreaM2 == null ? "" : String(Number.parseFloat(FORM_UNITS[units].area.fromSi(body.effectiveAreaM2).toPrecision(6))),
    traverseId: body.traverseId ?? null,
    dryBulb: show("temperature", body.dryBulbC),
    rh: body.relativeHumidityPct == null ? "" : String(body.relativeHumidityPct),
    controllerFlow: show("flow", body.controllerFlowM3S),
    controllerFactor: body.controllerFlowFactor == null ? "" : String(body.controllerFlowFactor),
    damperMarked: body.damperMarked ?? false,
    instrumentId: body.instrumentId ?? null,
    airInstrumentId: body.airInstrumentId ?? null,
    overdueReason: body.overdueReason ?? "",
    notes: body.notes ?? "",
  };
}
