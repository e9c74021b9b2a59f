/**
 * Operating conditions in one line of words, for screens that show them beside readings (the traverse
 * screen's results among them): the labels and the summary, kept apart from the comparisons and
 * checks in conditions.ts so a page that only shows conditions does not load those.
 */
import { numberText } from "@/lib/units/number-text";

export type BoxOverride = "none" | "maximum" | "minimum" | "mixed";
export type FilterState = "clean" | "part_loaded" | "loaded" | "unknown";

export interface ConditionsLike {
  id?: string;
  fanSpeedRpm: number | null;
  vfdHz: number | null;
  boxes: BoxOverride;
  /** Outside-air (economizer) damper, % open. */
  outsideAirDamperPct: number | null;
  /** Duct static pressure set point, Pa (gauge). */
  ductStaticSetpointPa: number | null;
  filterState: FilterState;
}

export const BOX_LABELS: Readonly<Record<BoxOverride, string>> = {
  none: "left to their controls",
  maximum: "forced to maximum",
  minimum: "forced to minimum",
  mixed: "some forced, some not",
};

export const FILTER_LABELS: Readonly<Record<FilterState, string>> = {
  clean: "clean",
  part_loaded: "part loaded",
  loaded: "loaded (due for change)",
  unknown: "not checked",
};

export const defaultPressure = (pa: number) => `${roundedText(pa, 0)} Pa`;

/** A number with at most `decimals` decimals and thousands separators, as "1,150". */
export function roundedText(value: number, decimals: number): string {
  return numberText(value, 0, decimals);
}

/** "1,150 rpm · terminal units forced to maximum · outside-air damper 30 % open · static set point 250 Pa · filters clean". */
export function summarizeConditions(c: ConditionsLike, formatPressure: (pa: number) => string = defaultPressure): string {
  const parts: string[] = [];
  if (c.fanSpeedRpm !== null) parts.push(`${roundedText(c.fanSpeedRpm, 0)} rpm`);
  if (c.vfdHz !== null) parts.push(`drive ${roundedText(c.vfdHz, 1)} Hz`);
  parts.push(`terminal units ${BOX_LABELS[c.boxes]}`);
  if (c.outsideAirDamperPct !== null) parts.push(`outside-air damper ${roundedText(c.outsideAirDamperPct, 0)} % open`);
  if (c.ductStaticSetpointPa !== null) parts.push(`static set point ${formatPressure(c.ductStaticSetpointPa)}`);
  parts.push(`filters ${FILTER_LABELS[c.filterState]}`);
  return parts.join(" · ");
}
