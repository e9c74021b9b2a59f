/**
 * Airflow at an air outlet, inlet or terminal unit: a capture hood's reading with its correction factor
 * and, where the hood did not correct for density, referred to standard air; velocity × the maker's
 * effective area (Ak); the density of the air at the outlet; and the correction of a terminal unit
 * controller's flow factor from a measured airflow. Pure functions, SI (m³/s, m/s, m², kg/m³, Pa, °C).
 *
 * Standard airflow is mass flow divided by the project's standard density (the basis design airflows
 * are scheduled at); actual airflow is the volume at the air's own density at the outlet.
 */
import { airState, type AirState } from "./air";
import { EngineInputError } from "./errors";

/** Bad input to the terminal arithmetic; fields name camelCase API paths. */
export class TerminalFlowError extends EngineInputError {}

export interface FlowPair {
  /** Volume flow at the air's density at the outlet, m³/s. */
  flowM3S: number;
  /** Volume flow referred to the standard density, m³/s (mass flow ÷ standard density). */
  standardFlowM3S: number;
}

function positiveDensity(name: string, value: number): void {
  if (!(Number.isFinite(value) && value > 0)) throw new TerminalFlowError(`${name} must be a positive density.`, { [name]: `must be a positive number of kg/m³; got ${value}` });
}

/**
 * An actual volume flow referred to standard air: Q_std = Q·ρ/ρ_std (same mass flow, ṁ = ρ·Q).
 */
export function standardFromActualM3S(actualM3S: number, densityKgM3: number, standardDensityKgM3: number): number {
  positiveDensity("densityKgM3", densityKgM3);
  positiveDensity("standardDensityKgM3", standardDensityKgM3);
  return (actualM3S * densityKgM3) / standardDensityKgM3;
}

/** A standard volume flow at the air's actual density: Q = Q_std·ρ_std/ρ. */
export function actualFromStandardM3S(standardM3S: number, densityKgM3: number, standardDensityKgM3: number): number {
  positiveDensity("densityKgM3", densityKgM3);
  positiveDensity("standardDensityKgM3", standardDensityKgM3);
  return (standardM3S * standardDensityKgM3) / densityKgM3;
}

export interface OutletAirInput {
  /** Dry-bulb of the air leaving (or entering) the outlet, °C. */
  dryBulbC: number;
  /** Relative humidity, % (0…100); when not measured, ASSUMED_OUTLET_RH_PCT is used and the result says so. */
  relativeHumidityPct?: number;
  /** Site altitude, m: the barometric pressure of the standard atmosphere when no barometer was read. */
  altitudeM: number;
  /** A measured station barometric pressure, Pa; the altitude then only checks it. */
  barometricPa?: number;
}

export interface OutletAir {
  densityKgM3: number;
  barometricPa: number;
  barometricSource: "measured" | "altitude";
  relativeHumidityPct: number;
  /** True when the humidity was not measured and ASSUMED_OUTLET_RH_PCT was used. */
  humidityAssumed: boolean;
  warnings: string[];
  state: AirState;
}

/**
 * Humidity taken when it was not measured at an outlet (our choice: mid-range indoor air). At 20 °C,
 * dry or saturated air differs from it in density by under 0.5 % (checked against psychrolib in the
 * tests); warmer air widens that.
 */
export const ASSUMED_OUTLET_RH_PCT = 50;

/**
 * The density of the air at an outlet, through the engine's psychrometrics (lib/airflow/air.ts): room
 * pressure (0 Pa gauge: an outlet discharges to, or an inlet draws from, the room), the barometer's
 * reading or the standard atmosphere at the site's altitude, the dry-bulb at the outlet and the
 * humidity (assumed when not measured).
 */
export function outletAir(input: OutletAirInput): OutletAir {
  const humidityAssumed = input.relativeHumidityPct === undefined;
  const relativeHumidityPct = input.relativeHumidityPct ?? ASSUMED_OUTLET_RH_PCT;
  const state = airState(
    {
      dryBulbC: input.dryBulbC,
      altitudeM: input.altitudeM,
      ...(input.barometricPa !== undefined ? { barometricPa: input.barometricPa } : {}),
      staticPa: 0,
      relativeHumidityPct,
    },
    { fieldPrefix: "" },
  );
  return {
    densityKgM3: state.densityKgM3,
    barometricPa: state.barometricPa,
    barometricSource: state.barometricSource,
    relativeHumidityPct,
    humidityAssumed,
    warnings: state.warnings,
    state,
  };
}

export interface HoodInput {
  /** The figure the hood shows, m³/s. */
  readingM3S: number;
  /** The hood's correction factor for the top and outlet in use (multiplies the reading); 1 when none applies. */
  correctionFactor: number;
  /**
   * True when the hood corrected for density itself and shows standard airflow (per its instructions);
   * false when its figure is the airflow at the outlet's own air, to be referred to standard air here.
   */
  densityCorrected: boolean;
  /** Density of the air at the outlet, kg/m³ (outletAir). */
  densityKgM3: number;
  standardDensityKgM3: number;
}

export interface HoodFlow extends FlowPair {
  /** The reading × the correction factor, m³/s, on the hood's own basis. */
  correctedReadingM3S: number;
  /** ρ/ρ_std applied to refer an uncorrected reading to standard air; null when the hood did it itself. */
  densityRatio: number | null;
}

/**
 * A capture hood's reading as actual and standard airflow. The correction factor multiplies the
 * reading (the maker's factor for a hood top or outlet type). A density-corrected hood already shows
 * standard airflow; otherwise the figure is the airflow at the outlet's air and is referred to standard
 * air with the density there: Q_std = Q·ρ/ρ_std.
 */
export function hoodFlow(input: HoodInput): HoodFlow {
  const fields: Record<string, string> = {};
  if (!Number.isFinite(input.readingM3S)) fields.hoodFlowM3S = `must be a number of m³/s; got ${input.readingM3S}`;
  if (!(Number.isFinite(input.correctionFactor) && input.correctionFactor > 0)) fields.hoodCorrectionFactor = `must be a positive number; got ${input.correctionFactor}`;
  if (Object.keys(fields).length > 0) throw new TerminalFlowError("The hood reading cannot be used.", fields);
  const corrected = input.readingM3S * input.correctionFactor;
  if (input.densityCorrected) {
    return {
      correctedReadingM3S: corrected,
      densityRatio: null,
      standardFlowM3S: corrected,
      flowM3S: actualFromStandardM3S(corrected, input.densityKgM3, input.standardDensityKgM3),
    };
  }
  return {
    correctedReadingM3S: corrected,
    densityRatio: input.densityKgM3 / input.standardDensityKgM3,
    flowM3S: corrected,
    standardFlowM3S: standardFromActualM3S(corrected, input.densityKgM3, input.standardDensityKgM3),
  };
}

export type VelocityBasis = "actual" | "standard";

export interface VelocityAreaInput {
  /** Anemometer readings across the outlet face, m/s, as the maker's Ak method prescribes. */
  velocitiesMS: readonly number[];
  /**
   * "actual": velocities at the air's own density (vane anemometers, or a thermal anemometer set to actual);
   * "standard": velocities referred to the standard density (a thermal anemometer's usual display).
   */
  basis: VelocityBasis;
  /** The maker's effective-area factor Ak, m². */
  effectiveAreaM2: number;
  densityKgM3: number;
  standardDensityKgM3: number;
}

export interface VelocityAreaFlow extends FlowPair {
  /** The mean of the velocities, m/s, on their own basis. */
  meanVelocityMS: number;
  readingCount: number;
}

/** At most this many velocity readings on one outlet (our bound: a 1.2 m slot read every 20 mm). */
export const MAX_VELOCITY_READINGS = 60;

/**
 * Airflow from velocity × effective area: Q = mean(v)·Ak. The velocities are averaged (never their
 * squares or pressures), as Ak factors are defined for the average velocity over the outlet.
 * Standard velocities give standard airflow directly; actual ones give actual airflow.
 */
export function velocityAreaFlow(input: VelocityAreaInput): VelocityAreaFlow {
  const fields: Record<string, string> = {};
  const n = input.velocitiesMS.length;
  if (n === 0) fields.velocitiesMS = "give at least one velocity reading";
  else if (n > MAX_VELOCITY_READINGS) fields.velocitiesMS = `give at most ${MAX_VELOCITY_READINGS} velocity readings; got ${n}`;
  input.velocitiesMS.forEach((v, i) => {
    if (!Number.isFinite(v)) fields[`velocitiesMS.${i}`] = `must be a number of m/s; got ${v}`;
  });
  if (!(Number.isFinite(input.effectiveAreaM2) && input.effectiveAreaM2 > 0)) fields.effectiveAreaM2 = `must be a positive area in m²; got ${input.effectiveAreaM2}`;
  if (Object.keys(fields).length > 0) throw new TerminalFlowError("The velocity readings cannot be used.", fields);
  const meanVelocityMS = input.velocitiesMS.reduce((a, v) => a + v, 0) / n;
  const q = meanVelocityMS * input.effectiveAreaM2;
  return input.basis === "actual"
    ? { meanVelocityMS, readingCount: n, flowM3S: q, standardFlowM3S: standardFromActualM3S(q, input.densityKgM3, input.standardDensityKgM3) }
    : { meanVelocityMS, readingCount: n, standardFlowM3S: q, flowM3S: actualFromStandardM3S(q, input.densityKgM3, input.standardDensityKgM3) };
}

export interface FlowFactorInput {
  /** The airflow measured at the unit (by hood, velocity × area or traverse), m³/s at standard air. */
  measuredM3S: number;
  /** The airflow the unit's controller displayed at the same moment, m³/s. */
  displayedM3S: number;
  /** The flow factor configured in the controller now; null when not known. */
  flowFactor: number | null;
}

export interface FlowFactorCorrection {
  /** measured ÷ displayed; null when the display read zero. */
  ratio: number | null;
  /** The factor that would make the display read the measured airflow; null without a ratio or a factor. */
  suggestedFlowFactor: number | null;
}

/**
 * The controller flow factor that makes a terminal unit's display agree with a measured airflow.
 *
 * The controller's factor multiplies the velocity pressure its sensor reads, and the airflow it shows
 * goes as the square root of velocity pressure (Q = A·√(2·Δp/ρ) for the pitot-type cross or ring in
 * the inlet). The display therefore scales as √factor, and to move it by the ratio r = measured ÷
 * displayed the factor must move by r²: new factor = old factor × (measured/displayed)².
 */
export function correctedFlowFactor(input: FlowFactorInput): FlowFactorCorrection {
  if (!(Number.isFinite(input.displayedM3S) && input.displayedM3S > 0) || !Number.isFinite(input.measuredM3S)) return { ratio: null, suggestedFlowFactor: null };
  const ratio = input.measuredM3S / input.displayedM3S;
  const suggestedFlowFactor = input.flowFactor !== null && Number.isFinite(input.flowFactor) && input.flowFactor > 0 && ratio > 0 ? input.flowFactor * ratio * ratio : null;
  return { ratio, suggestedFlowFactor };
}

/**
 * Readings this far from design are implausible enough to say so on the reading (never refused):
 * above 3× design or below a tenth of it (our choice: beyond what a damper or a wrong setting explains;
 * look for a wrong outlet, a wrong hood top, a unit slip or a closed damper).
 */
export const IMPLAUSIBLE_ABOVE_DESIGN_RATIO = 3;
export const IMPLAUSIBLE_BELOW_DESIGN_RATIO = 0.1;

export type PlausibilityIssue =
  | { kind: "negative"; valueM3S: number }
  | { kind: "above-design"; ratio: number }
  | { kind: "below-design"; ratio: number };

/** What is implausible about a measured standard airflow against its design (null design: only the sign is judged). */
export function flowPlausibility(standardFlowM3S: number, designM3S: number | null): PlausibilityIssue[] {
  if (standardFlowM3S < 0) return [{ kind: "negative", valueM3S: standardFlowM3S }];
  if (designM3S === null || !(designM3S > 0)) return [];
  const ratio = standardFlowM3S / designM3S;
  if (ratio > IMPLAUSIBLE_ABOVE_DESIGN_RATIO) return [{ kind: "above-design", ratio }];
  if (ratio < IMPLAUSIBLE_BELOW_DESIGN_RATIO) return [{ kind: "below-design", ratio }];
  return [];
}

/** The readings outside an instrument's stated range (inclusive bounds; either may be missing). */
export function outOfRange(values: readonly number[], range: { min: number | null; max: number | null }): { index: number; value: number; side: "below" | "above" }[] {
  const out: { index: number; value: number; side: "below" | "above" }[] = [];
  values.forEach((value, index) => {
    if (range.min !== null && value < range.min) out.push({ index, value, side: "below" });
    else if (range.max !== null && value > range.max) out.push({ index, value, side: "above" });
  });
  return out;
}
