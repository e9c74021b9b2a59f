/**
 * Operating conditions: what a system was doing while a set of readings was taken (fan speed or drive
 * frequency, terminal units forced or not, outside-air damper, duct static set point, filters).
 * Readings taken under different conditions are not comparable, and their flows must not be summed
 * without saying so: `compareConditions` lists every difference in plain words for the screens to show.
 *
 * Tolerances are marked by where they come from. Pure functions, SI units (Pa), no I/O.
 */

import { BOX_LABELS, defaultPressure, FILTER_LABELS, roundedText, type ConditionsLike } from "./conditions-summary";

export { BOX_LABELS, FILTER_LABELS, summarizeConditions, type BoxOverride, type ConditionsLike, type FilterState } from "./conditions-summary";

export interface ConditionTolerances {
  /** Fan speeds within this % of each other are the same condition. */
  fanSpeedPct: number;
  /** Drive frequencies within this many Hz. */
  vfdHz: number;
  /** Damper positions within this many percentage points. */
  damperPoints: number;
  /** Static set points within this many Pa… */
  staticPa: number;
  /** …or this % of the larger, whichever is more. */
  staticPct: number;
}

/**
 * Our choice, from the fan laws (Q ∝ N, same fan and density): 2 % in speed is 2 % in airflow, a fifth
 * of the usual ±10 % terminal band (common practice), so readings within it compare fairly.
 * 0.5 Hz is under 1 % of a 60 Hz or 50 Hz base (our choice). Dampers within 5 points and static set points
 * within 10 Pa (≈ 0.04 in. w.c.) or 5 % are one setting as far as a hand-set control can be repeated (our choice).
 */
export const DEFAULT_CONDITION_TOLERANCES: Readonly<ConditionTolerances> = {
  fanSpeedPct: 2,
  vfdHz: 0.5,
  damperPoints: 5,
  staticPa: 10,
  staticPct: 5,
};

export type ConditionField = "conditions" | "fanSpeed" | "boxes" | "outsideAirDamperPct" | "ductStaticSetpointPa" | "filterState";

export interface ConditionDifference {
  field: ConditionField;
  /** "differs": both recorded and not the same; "unknown": recorded for one only, so sameness cannot be shown. */
  kind: "differs" | "unknown";
  /** One sentence for the screen. */
  message: string;
}

export interface CompareOptions {
  /** How the two sets of readings are called in messages; default "the first readings", "the second readings". */
  labels?: readonly [string, string];
  /** Formats a pressure in Pa for messages (the user's units); default "250 Pa". */
  formatPressure?: (pa: number) => string;
  tolerances?: Partial<ConditionTolerances>;
}

/** |a − b| as % of their mean: symmetric, so comparing A with B or B with A gives the same answer. */
export function relativeDifferencePct(a: number, b: number): number {
  const mean = (Math.abs(a) + Math.abs(b)) / 2;
  return mean === 0 ? 0 : (100 * Math.abs(a - b)) / mean;
}

/**
 * Every way two recorded operating conditions differ, in plain words; an empty list means the readings
 * were taken under the same conditions (within the tolerances). `null` stands for "no conditions
 * recorded", which never compares as the same. The same record (same id) is always the same.
 */
export function compareConditions(a: ConditionsLike | null, b: ConditionsLike | null, options: CompareOptions = {}): ConditionDifference[] {
  const [la, lb] = options.labels ?? ["the first readings", "the second readings"];
  const tol = { ...DEFAULT_CONDITION_TOLERANCES, ...options.tolerances };
  const fmtPa = options.formatPressure ?? defaultPressure;

  if (a === null || b === null) {
    if (a === null && b === null) return [{ field: "conditions", kind: "unknown", message: `No operating conditions were recorded for ${la} or ${lb}.` }];
    return [{ field: "conditions", kind: "unknown", message: `No operating conditions were recorded for ${a === null ? la : lb}.` }];
  }
  if (a.id !== undefined && a.id === b.id) return [];

  const out: ConditionDifference[] = [];
  const differs = (field: ConditionField, message: string) => out.push({ field, kind: "differs", message });
  const unknown = (field: ConditionField, message: string) => out.push({ field, kind: "unknown", message });

  // Fan speed: rpm when both have it, else drive frequency; a tachometer reading and a drive display are not comparable.
  if (a.fanSpeedRpm !== null && b.fanSpeedRpm !== null) {
    const pct = relativeDifferencePct(a.fanSpeedRpm, b.fanSpeedRpm);
    if (pct > tol.fanSpeedPct)
      differs("fanSpeed", `Fan speed: ${roundedText(a.fanSpeedRpm, 0)} rpm for ${la}, ${roundedText(b.fanSpeedRpm, 0)} rpm for ${lb} (${roundedText(pct, 1)} % apart; more than ${tol.fanSpeedPct} %).`);
  } else if (a.vfdHz !== null && b.vfdHz !== null) {
    const hz = Math.abs(a.vfdHz - b.vfdHz);
    if (hz > tol.vfdHz) differs("fanSpeed", `Drive frequency: ${roundedText(a.vfdHz, 1)} Hz for ${la}, ${roundedText(b.vfdHz, 1)} Hz for ${lb} (${roundedText(hz, 1)} Hz apart; more than ${tol.vfdHz} Hz).`);
  } else if (a.fanSpeedRpm !== null || a.vfdHz !== null || b.fanSpeedRpm !== null || b.vfdHz !== null) {
    unknown("fanSpeed", `Fan speed was recorded as ${describeSpeed(a)} for ${la} and as ${describeSpeed(b)} for ${lb}; they cannot be compared.`);
  } else {
    unknown("fanSpeed", `Fan speed was not recorded for ${la} or ${lb}.`);
  }

  if (a.boxes !== b.boxes) differs("boxes", `Terminal units: ${BOX_LABELS[a.boxes]} for ${la}, ${BOX_LABELS[b.boxes]} for ${lb}.`);

  if (a.outsideAirDamperPct !== null && b.outsideAirDamperPct !== null) {
    const points = Math.abs(a.outsideAirDamperPct - b.outsideAirDamperPct);
    if (points > tol.damperPoints)
      differs("outsideAirDamperPct", `Outside-air damper: ${roundedText(a.outsideAirDamperPct, 0)} % open for ${la}, ${roundedText(b.outsideAirDamperPct, 0)} % for ${lb} (more than ${tol.damperPoints} points apart).`);
  } else if (a.outsideAirDamperPct !== null || b.outsideAirDamperPct !== null) {
    unknown("outsideAirDamperPct", `Outside-air damper position was recorded for ${a.outsideAirDamperPct !== null ? la : lb} only.`);
  }

  if (a.ductStaticSetpointPa !== null && b.ductStaticSetpointPa !== null) {
    const diff = Math.abs(a.ductStaticSetpointPa - b.ductStaticSetpointPa);
    const allowed = Math.max(tol.staticPa, (tol.staticPct / 100) * Math.max(Math.abs(a.ductStaticSetpointPa), Math.abs(b.ductStaticSetpointPa)));
    if (diff > allowed)
      differs("ductStaticSetpointPa", `Duct static set point: ${fmtPa(a.ductStaticSetpointPa)} for ${la}, ${fmtPa(b.ductStaticSetpointPa)} for ${lb}.`);
  } else if (a.ductStaticSetpointPa !== null || b.ductStaticSetpointPa !== null) {
    unknown("ductStaticSetpointPa", `Duct static set point was recorded for ${a.ductStaticSetpointPa !== null ? la : lb} only.`);
  }

  if (a.filterState !== b.filterState) {
    if (a.filterState === "unknown" || b.filterState === "unknown")
      unknown("filterState", `Filters were not checked for ${a.filterState === "unknown" ? la : lb}.`);
    else differs("filterState", `Filters: ${FILTER_LABELS[a.filterState]} for ${la}, ${FILTER_LABELS[b.filterState]} for ${lb}.`);
  }
  return out;
}

function describeSpeed(c: ConditionsLike): string {
  if (c.fanSpeedRpm !== null) return `${roundedText(c.fanSpeedRpm, 0)} rpm`;
  if (c.vfdHz !== null) return `${roundedText(c.vfdHz, 1)} Hz at the drive`;
  return "nothing";
}

/** Whether two sets of readings were taken under the same recorded conditions. */
export function sameConditions(a: ConditionsLike | null, b: ConditionsLike | null, options?: CompareOptions): boolean {
  return compareConditions(a, b, options).length === 0;
}

/**
 * The differences across many sets of readings (e.g. every traverse summed at a junction), each set
 * compared with the first that has conditions. Labels name the sets in messages.
 */
export function compareConditionsAcross(sets: readonly { label: string; conditions: ConditionsLike | null }[], options: Omit<CompareOptions, "labels"> = {}): ConditionDifference[] {
  if (sets.length < 2) return [];
  const reference = sets.find((s) => s.conditions !== null) ?? sets[0]!;
  const out: ConditionDifference[] = [];
  for (const s of sets) {
    if (s === reference) continue;
    if (s.conditions === null && reference.conditions === null) continue;
    out.push(...compareConditions(reference.conditions, s.conditions, { ...options, labels: [reference.label, s.label] }));
  }
  if (reference.conditions === null) out.unshift({ field: "conditions", kind: "unknown", message: "No operating conditions were recorded for any of these readings." });
  return out;
}

/** What the system was designed to run at, for plausibility checks. */
export interface SystemSchedule {
  fanSpeedRpm: number | null;
  hasVfd: boolean;
}

/** A recorded fan speed this far from the scheduled speed is flagged for a second look (our choice). */
export const FAN_SPEED_CHECK_PCT = 25;
/** Drive frequencies outside this band are unusual for a supply or exhaust fan (our choice; most drives run 20–60 Hz). */
export const VFD_USUAL_HZ = { min: 15, max: 66 };

/**
 * Readings that are possible but unlikely, flagged rather than refused: a fan speed far from the
 * schedule (a tachometer on the motor pulley, a slipping belt, a typo), a drive frequency out of the
 * usual band, a drive frequency on a system scheduled without a drive.
 */
export function conditionsWarnings(c: ConditionsLike, system: SystemSchedule): string[] {
  const out: string[] = [];
  if (c.fanSpeedRpm !== null && system.fanSpeedRpm !== null && system.fanSpeedRpm > 0) {
    const pct = (100 * (c.fanSpeedRpm - system.fanSpeedRpm)) / system.fanSpeedRpm;
    if (Math.abs(pct) > FAN_SPEED_CHECK_PCT)
      out.push(
        `Fan speed ${roundedText(c.fanSpeedRpm, 0)} rpm is ${roundedText(Math.abs(pct), 0)} % ${pct > 0 ? "above" : "below"} the scheduled ${roundedText(system.fanSpeedRpm, 0)} rpm: check that the tachometer read the fan, not the motor pulley.`,
      );
  }
  if (c.vfdHz !== null && (c.vfdHz < VFD_USUAL_HZ.min || c.vfdHz > VFD_USUAL_HZ.max))
    out.push(`Drive frequency ${roundedText(c.vfdHz, 1)} Hz is outside the usual ${VFD_USUAL_HZ.min}–${VFD_USUAL_HZ.max} Hz: check the drive display.`);
  if (c.vfdHz !== null && !system.hasVfd) out.push("A drive frequency was recorded, but the system is not scheduled with a variable-frequency drive.");
  return out;
}
