/**
 * What each kind of instrument in the register measures, and in which unit its range and accuracy are
 * stored (SI, as everywhere) and typed (the user's unit system). Framework-free: the API, the forms and
 * the engine helpers all read this one table.
 */
import type { InstrumentKind } from "@/db/schema";
import type { Quantity } from "@/lib/units";

export const INSTRUMENT_KINDS = [
  "manometer",
  "pitot_tube",
  "capture_hood",
  "thermal_anemometer",
  "vane_anemometer",
  "tachometer",
  "clamp_meter",
  "thermo_hygrometer",
  "barometer",
] as const satisfies readonly InstrumentKind[];

/**
 * The unit of a kind's range and accuracy floor: a display quantity of lib/units (converted between
 * SI and inch-pound), or a unit that is the same in both systems (rpm, A).
 */
export type KindMeasure = { quantity: Quantity } | { fixedUnit: "rpm" | "A" };

export interface InstrumentKindInfo {
  kind: InstrumentKind;
  /** The trade's name for it, singular, sentence case. */
  label: string;
  /** What it is used for, in a few words. */
  use: string;
  /** What the range means for this kind: "Range", or "Usable length" for a pitot tube. */
  rangeLabel: string;
  /** Null when the kind has no range or accuracy of its own (a pitot tube's accuracy is the manometer's). */
  measure: KindMeasure | null;
  /** Whether the maker states accuracy as ± % of reading (anemometers, hoods, manometers). */
  hasAccuracyPct: boolean;
  /** The label of the accuracy floor (± in the kind's unit): "± °C" for a thermometer, "± Pa" for a manometer. */
  floorLabel: string | null;
  /** Pitot tubes: coefficient and head diameter. Capture hoods: correction factor. Thermo-hygrometers: % RH accuracy. */
  probeFields: boolean;
  hoodFields: boolean;
  humidityFields: boolean;
}

const info = (kind: InstrumentKind, label: string, use: string, rest: Partial<InstrumentKindInfo> & { measure: KindMeasure | null }): InstrumentKindInfo => ({
  kind,
  label,
  use,
  rangeLabel: "Range",
  hasAccuracyPct: rest.measure !== null,
  floorLabel: rest.measure === null ? null : "Accuracy floor",
  probeFields: false,
  hoodFields: false,
  humidityFields: false,
  ...rest,
});

export const KIND_INFO: Readonly<Record<InstrumentKind, InstrumentKindInfo>> = {
  manometer: info("manometer", "Manometer", "velocity and static pressure", { measure: { quantity: "pressure" } }),
  pitot_tube: info("pitot_tube", "Pitot-static tube", "traverses, read with a manometer", {
    measure: { quantity: "dimension" },
    rangeLabel: "Usable insertion length",
    hasAccuracyPct: false,
    floorLabel: null,
    probeFields: true,
  }),
  capture_hood: info("capture_hood", "Capture hood", "outlet and inlet airflow", { measure: { quantity: "flow" }, hoodFields: true }),
  thermal_anemometer: info("thermal_anemometer", "Thermal anemometer", "low air velocities", { measure: { quantity: "velocity" } }),
  vane_anemometer: info("vane_anemometer", "Vane anemometer", "face velocities at grilles and coils", { measure: { quantity: "velocity" } }),
  tachometer: info("tachometer", "Tachometer", "fan and motor speed", { measure: { fixedUnit: "rpm" } }),
  clamp_meter: info("clamp_meter", "Clamp meter", "motor current", { measure: { fixedUnit: "A" } }),
  thermo_hygrometer: info("thermo_hygrometer", "Thermo-hygrometer", "dry-bulb and relative humidity", {
    measure: { quantity: "temperature" },
    hasAccuracyPct: false,
    floorLabel: "Temperature accuracy",
    humidityFields: true,
  }),
  barometer: info("barometer", "Barometer", "barometric pressure for air density", { measure: { quantity: "barometric" }, hasAccuracyPct: false }),
};

/** The kinds whose readings feed a pitot or anemometer traverse, and those that read the air. */
export const TRAVERSE_READING_KINDS: readonly InstrumentKind[] = ["manometer", "thermal_anemometer", "vane_anemometer"];
export const PROBE_KINDS: readonly InstrumentKind[] = ["pitot_tube"];
export const AIR_KINDS: readonly InstrumentKind[] = ["thermo_hygrometer", "barometer"];
export const TERMINAL_READING_KINDS: readonly InstrumentKind[] = ["capture_hood", "thermal_anemometer", "vane_anemometer", "manometer"];

export function kindLabel(kind: InstrumentKind): string {
  return KIND_INFO[kind].label;
}

/** "Manometer · Airdex DM-40 · SN MM-30418": how an instrument is named on screens and in reports. */
export function instrumentName(instrument: { kind: InstrumentKind; make: string; model: string; serial: string }): string {
  const makeModel = [instrument.make, instrument.model].filter((s) => s.trim() !== "").join(" ");
  return [kindLabel(instrument.kind), makeModel, `SN ${instrument.serial}`].filter((s) => s !== "").join(" · ");
}
