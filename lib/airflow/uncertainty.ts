/**
 * Uncertainty of a traverse flow by the GUM (JCGM 100:2008), first order, inputs uncorrelated (§5.1.2):
 *
 *   (u_Q/Q)² = u_dim² + u_reading² + (c_ρ·u_ρ/ρ)² + u_layout² + u_random² + u_sampling²
 *
 * - Instrument figures (±% of reading + floor, ±°C, ±Pa, ±mm, ±% RH) are a maker's specification
 *   limits ±a with no stated distribution: each is taken as rectangular, standard uncertainty a/√3
 *   (GUM §4.3.7). So are the weather swing of an unmeasured barometer and the assumed range of an
 *   unmeasured duct static pressure, and the layout's integration error on the reference profile
 *   (a bound of the method's bias, not a correction).
 * - `repeatabilityPct` is the experimental standard deviation of one time-averaged point reading;
 *   its mean over N points has s/√N (GUM §4.2.3).
 * - c_ρ is the exponent of density in the flow: pitot readings give V ∝ ρ^(−½), so actual flow ∝ ρ^(−½)
 *   and mass and standard flow ∝ ρ^(½); actual velocities give actual flow ∝ ρ⁰, mass and standard
 *   flow ∝ ρ¹; standard velocities (mass flux, referred to the instrument's reference density) give
 *   mass and standard flow ∝ ρ⁰ and actual flow ∝ ρ^(−1). The standard density itself is a defined
 *   constant, without uncertainty.
 * - Sampling (method ours; we could not confirm a published formula in ISO 3966 or ISO 5168 and do not
 *   claim one): a traverse samples the plane at N points, and the more uneven the profile the more the
 *   unsampled area can differ from what the points suggest. We take the spread of the point velocities
 *   about the better of two smooth shapes, flat (the sample coefficient of variation of the velocities)
 *   and fully developed (the coefficient of variation of each velocity divided by the 1/7-law value at
 *   its read position), as the unevenness s, and its standard deviation of the mean s/√N (the form of
 *   GUM §4.2.3) as the sampling term. A plane whose points follow either shape has no sampling term,
 *   so a well-developed profile is not penalised for the wall gradient its layout already integrates
 *   (that is the layout term). On a short straight run the term is multiplied by 1.25 (under 7.5 D
 *   upstream or 2 D downstream) or 1.5 (under 2 D / 0.5 D): the profile there changes between and
 *   across points in ways the readings cannot show (factors ours).
 * - The expanded uncertainty is U = k·u_c with k = 2, about 95 % coverage for a near-normal result
 *   (GUM §6.2.1, §6.3.3). Every figure shown to a user is the expanded one, with k stated: see
 *   formatExpandedUncertainty.
 */
import { barometricPressureFromAltitudePa, densityOf, type AirConditions } from "./air";
import { ASSUMED_STATIC_UNCERTAINTY_PA } from "./constants";
import { COVERAGE_FACTOR } from "./uncertainty-format";
import type { Duct } from "./layout";

/**
 * Accuracies of the instruments used, as the maker states them: specification limits ± (rectangular,
 * see the module comment), except repeatabilityPct, a standard deviation. Defaults are typical field
 * instruments (common practice).
 */
export interface InstrumentAccuracy {
  /** Manometer: ± % of reading… */
  pressureAccuracyPct: number;
  /** …plus ± this many Pa, so low velocity pressures carry large uncertainty. */
  pressureFloorPa: number;
  /** Thermometer, ± °C (dry-bulb and wet-bulb). */
  temperatureAccuracyC: number;
  /** Barometer, ± Pa. */
  barometricAccuracyPa: number;
  /** Duct dimensions (tape or rod), ± m. */
  dimensionAccuracyM: number;
  /** Hygrometer, ± % RH. */
  humidityAccuracyPct: number;
  /** Thermal or vane anemometer: ± % of reading… */
  velocityAccuracyPct: number;
  /** …plus ± this many m/s. */
  velocityFloorMS: number;
  /** Scatter of repeated time-averaged readings at one point, one standard deviation, % of velocity. */
  repeatabilityPct: number;
}

/**
 * Typical field instruments (common practice): ±1 % + 1 Pa manometer, ±0.5 °C, ±200 Pa barometer, ±3 mm,
 * ±3 % RH, anemometer ±3 % + 0.05 m/s; ±2 % repeatability of a time-averaged point reading (from memory).
 */
export const DEFAULT_INSTRUMENT_ACCURACY: InstrumentAccuracy = {
  pressureAccuracyPct: 1,
  pressureFloorPa: 1,
  temperatureAccuracyC: 0.5,
  barometricAccuracyPa: 200,
  dimensionAccuracyM: 0.003,
  humidityAccuracyPct: 3,
  velocityAccuracyPct: 3,
  velocityFloorMS: 0.05,
  repeatabilityPct: 2,
};

/** Day-to-day weather swing of station pressure about the standard atmosphere, a limit ±, used when only altitude is known (from memory). */
export const ALTITUDE_BAROMETRIC_UNCERTAINTY_PA = 3000;

export { COVERAGE_FACTOR, formatExpandedUncertainty } from "./uncertainty-format";

const SQRT3 = Math.sqrt(3);

/** Sampling-term multipliers for a short straight run (ours; see the module comment). */
export const SHORT_RUN_SAMPLING_FACTOR = 1.25;
export const UNSUITABLE_RUN_SAMPLING_FACTOR = 1.5;

/** Relative standard uncertainties (k = 1) of a flow, one per input. Fractions, e.g. 0.01 = 1 %. */
export interface UncertaintyTerms {
  /** The area, from the dimensions. */
  dimension: number;
  /** The mean velocity, from the readings' accuracy (½·u_Pv/Pv for a pitot tube). */
  reading: number;
  /** c_ρ·u_ρ/ρ, c_ρ the exponent of density in this flow. */
  density: number;
  /** Integration error of the layout (and of any gap filling) on the reference profile. */
  layout: number;
  /** Repeatability of a point reading / √N. */
  random: number;
  /** Unevenness of the profile / √N, raised on a short straight run (method ours). */
  sampling: number;
}

/** Root-sum-square of relative terms (GUM §5.1.2, uncorrelated inputs). All fractions, e.g. 0.01 = 1 %. */
export function combineRelative(terms: UncertaintyTerms): number {
  const { dimension, reading, density, layout, random, sampling } = terms;
  // The terms are fractions, far from overflow or underflow, so the plain root-sum-square is exact to
  // rounding (Math.hypot costs more than the rest of the uncertainty); Math.hypot only for the rare
  // Infinity/NaN mix, where it answers Infinity.
  const sum = dimension * dimension + reading * reading + density * density + layout * layout + random * random + sampling * sampling;
  return Number.isFinite(sum) ? Math.sqrt(sum) : Math.hypot(dimension, reading, density, layout, random, sampling);
}

/** Relative uncertainty of the area: 2·u_D/D for round ducts, √((u_W/W)² + (u_H/H)²) for rectangular. */
export function areaRelativeUncertainty(duct: Duct, dimensionAccuracyM: number): number {
  if (duct.shape === "round") return (2 * dimensionAccuracyM) / duct.diameterM;
  const w = dimensionAccuracyM / duct.widthM;
  const h = dimensionAccuracyM / duct.heightM;
  return Math.sqrt(w * w + h * h);
}

/**
 * Relative error bound (a specification limit, not yet a standard uncertainty) of the mean velocity from
 * velocity pressures (Pa) read with a manometer of ±(pct % of reading + floor Pa). Per point, δv ∝ (√(Pv + u) − √(max(Pv − u, 0)))/2 — ½·u/Pv of the
 * velocity when u ≪ Pv, and still finite at Pv ≤ 0. The gauge error is the same instrument at every
 * point, so the point errors are summed (fully correlated) before dividing by the sum of velocities.
 */
export function pressureReadingRelativeUncertainty(velocityPressuresPa: ArrayLike<number>, accuracy: Pick<InstrumentAccuracy, "pressureAccuracyPct" | "pressureFloorPa">): number {
  const fraction = accuracy.pressureAccuracyPct / 100;
  let errorSum = 0;
  let rootSum = 0;
  for (let i = 0; i < velocityPressuresPa.length; i++) {
    const pv = velocityPressuresPa[i]!;
    errorSum += pressureReadingErrorBound(pv, fraction, accuracy.pressureFloorPa);
    rootSum += Math.sqrt(Math.max(pv, 0));
  }
  return readingRelativeFromSums(errorSum, rootSum);
}

/**
 * One reading's share of pressureReadingRelativeUncertainty: (√(Pv⁺ + u) − √(max(Pv⁺ − u, 0)))/2 with
 * u = fraction·|Pv| + floor (fraction = % of reading / 100).
 */
export function pressureReadingErrorBound(pv: number, fraction: number, floorPa: number): number {
  const positive = Math.max(pv, 0);
  const u = fraction * Math.abs(pv) + floorPa;
  return (Math.sqrt(positive + u) - Math.sqrt(Math.max(positive - u, 0))) / 2;
}

/**
 * A reading uncertainty from its sums over the readings: of the error bounds (pressureReadingErrorBound or
 * velocityReadingErrorBound) and of what they are relative to (√Pv⁺, or the velocities v⁺).
 */
export function readingRelativeFromSums(errorSum: number, rootSum: number): number {
  return rootSum > 0 ? errorSum / rootSum : Number.POSITIVE_INFINITY;
}

/** Relative error bound of the mean velocity from anemometer velocities (m/s) of ±(pct % + floor m/s), correlated as above. */
export function velocityReadingRelativeUncertainty(velocitiesMS: ArrayLike<number>, accuracy: Pick<InstrumentAccuracy, "velocityAccuracyPct" | "velocityFloorMS">): number {
  const fraction = accuracy.velocityAccuracyPct / 100;
  let errorSum = 0;
  let sum = 0;
  for (let i = 0; i < velocitiesMS.length; i++) {
    const v = velocitiesMS[i]!;
    sum += Math.max(v, 0);
    errorSum += velocityReadingErrorBound(v, fraction, accuracy.velocityFloorMS);
  }
  return readingRelativeFromSums(errorSum, sum);
}

/** One anemometer reading's share of velocityReadingRelativeUncertainty: fraction·|v| + floor (fraction = % of reading / 100). */
export function velocityReadingErrorBound(velocityMS: number, fraction: number, floorMS: number): number {
  return fraction * Math.abs(velocityMS) + floorMS;
}

/**
 * Relative error bound of the air density from the specification limits of temperature, barometric,
 * static and humidity readings (root-sum-square of each limit's effect; divide by √3 for the standard
 * uncertainty, as traverseUncertainty does). An unmeasured static pressure counts ±ASSUMED_STATIC_UNCERTAINTY_PA. Sensitivities are central differences of the density
 * (GUM §5.1.3 allows numerical sensitivity coefficients), one-sided where a step leaves the valid range.
 */
export function densityRelativeUncertainty(conditions: AirConditions, accuracy: InstrumentAccuracy): number {
  // A pure function of its inputs, asked again with the same air on every recalculation of a traverse:
  // the last question is compared field by field, older ones are looked up by key.
  const last = lastDensityUncertainty;
  if (last && sameDensityInputs(last.conditions, last.accuracy, conditions, accuracy)) return last.value;
  const key = `${conditions.dryBulbC}|${conditions.barometricPa}|${conditions.altitudeM}|${conditions.staticPa}|${conditions.relativeHumidityPct}|${conditions.wetBulbC}|${accuracy.temperatureAccuracyC}|${accuracy.barometricAccuracyPa}|${accuracy.pressureAccuracyPct}|${accuracy.pressureFloorPa}|${accuracy.humidityAccuracyPct}`;
  let value = densityUncertaintyMemo.get(key);
  if (value === undefined) {
    value = computeDensityRelativeUncertainty(conditions, accuracy);
    densityUncertaintyMemo.set(key, value);
    if (densityUncertaintyMemo.size > DENSITY_MEMO_SIZE) densityUncertaintyMemo.delete(densityUncertaintyMemo.keys().next().value as string);
  }
  const { dryBulbC, barometricPa, altitudeM, staticPa, relativeHumidityPct, wetBulbC } = conditions;
  const { temperatureAccuracyC, barometricAccuracyPa, pressureAccuracyPct, pressureFloorPa, humidityAccuracyPct } = accuracy;
  lastDensityUncertainty = {
    conditions: { dryBulbC, barometricPa, altitudeM, staticPa, relativeHumidityPct, wetBulbC },
    accuracy: { temperatureAccuracyC, barometricAccuracyPa, pressureAccuracyPct, pressureFloorPa, humidityAccuracyPct },
    value,
  };
  return value;
}

/** Distinct air states remembered by densityRelativeUncertainty (oldest dropped first). */
const DENSITY_MEMO_SIZE = 64;
const densityUncertaintyMemo = new Map<string, number>();
type DensityAccuracy = Pick<InstrumentAccuracy, "temperatureAccuracyC" | "barometricAccuracyPa" | "pressureAccuracyPct" | "pressureFloorPa" | "humidityAccuracyPct">;
let lastDensityUncertainty: { conditions: AirConditions; accuracy: DensityAccuracy; value: number } | null = null;

/** The same inputs as far as the density uncertainty goes (=== as the key's text does, which also equates 0 and −0). */
function sameDensityInputs(c0: AirConditions, a0: DensityAccuracy, c: AirConditions, a: DensityAccuracy): boolean {
  return (
    c0.dryBulbC === c.dryBulbC &&
    c0.barometricPa === c.barometricPa &&
    c0.altitudeM === c.altitudeM &&
    c0.staticPa === c.staticPa &&
    c0.relativeHumidityPct === c.relativeHumidityPct &&
    c0.wetBulbC === c.wetBulbC &&
    a0.temperatureAccuracyC === a.temperatureAccuracyC &&
    a0.barometricAccuracyPa === a.barometricAccuracyPa &&
    a0.pressureAccuracyPct === a.pressureAccuracyPct &&
    a0.pressureFloorPa === a.pressureFloorPa &&
    a0.humidityAccuracyPct === a.humidityAccuracyPct
  );
}

function computeDensityRelativeUncertainty(conditions: AirConditions, accuracy: InstrumentAccuracy): number {
  const rho = densityOf(conditions);
  if (rho === null) return Number.NaN;
  const barometricU = conditions.barometricPa !== undefined ? accuracy.barometricAccuracyPa : ALTITUDE_BAROMETRIC_UNCERTAINTY_PA;
  const staticPa = conditions.staticPa;
  const staticU = staticPa === undefined ? ASSUMED_STATIC_UNCERTAINTY_PA : (accuracy.pressureAccuracyPct / 100) * Math.abs(staticPa) + accuracy.pressureFloorPa;
  const steps: Array<[u: number, shift: (c: AirConditions, d: number) => AirConditions]> = [
    // Dry-bulb alone; when humidity is a wet-bulb it is perturbed separately below.
    [accuracy.temperatureAccuracyC, (c, d) => ({ ...c, dryBulbC: c.dryBulbC + d })],
    [barometricU, (c, d) => ({ ...c, barometricPa: (c.barometricPa ?? barometricPressureFromAltitudePa(c.altitudeM ?? 0)) + d, altitudeM: undefined })],
    [staticU, (c, d) => ({ ...c, staticPa: (c.staticPa ?? 0) + d })],
  ];
  if (conditions.relativeHumidityPct !== undefined) {
    steps.push([accuracy.humidityAccuracyPct, (c, d) => ({ ...c, relativeHumidityPct: Math.min(100, Math.max(0, (c.relativeHumidityPct ?? 0) + d)) })]);
  } else if (conditions.wetBulbC !== undefined) {
    steps.push([accuracy.temperatureAccuracyC, (c, d) => ({ ...c, wetBulbC: Math.min(c.dryBulbC, (c.wetBulbC ?? 0) + d) })]);
  }
  let sumSquares = 0;
  for (const [u, shift] of steps) {
    if (!(u > 0)) continue;
    const up = densityOf(shift(conditions, u));
    const down = densityOf(shift(conditions, -u));
    const slope = up !== null && down !== null ? (up - down) / 2 : up !== null ? up - rho : down !== null ? rho - down : 0;
    sumSquares += (slope / rho) ** 2;
  }
  return Math.sqrt(sumSquares);
}

export interface TraverseUncertaintyInput {
  duct: Duct;
  accuracy: InstrumentAccuracy;
  /** Relative error bound of the mean velocity from the readings (see the *ReadingRelativeUncertainty functions). */
  readingRelative: number;
  /** Relative error bound of the density (see densityRelativeUncertainty). */
  densityRelative: number;
  /** Exponent of ρ in the flow (sign ignored): ½ for any flow from pitot readings (default), see the module comment. */
  densitySensitivity?: number;
  /** Integration error of the layout as a fraction (sign ignored), a bound. */
  layoutError: number;
  /** Number of points read: the repeatability of each averages down by √N. */
  pointCount: number;
  /** Relative standard uncertainty from sampling (see samplingUncertainty); 0 when omitted. */
  samplingRelative?: number;
}

export interface FlowUncertainty {
  /** Terms as relative standard uncertainties (k = 1). */
  terms: UncertaintyTerms;
  /** Combined relative standard uncertainty u_c (k = 1). */
  combined: number;
  /** Expanded relative uncertainty U = k·u_c. */
  expanded: number;
  coverageFactor: number;
}

/** The terms, combined standard and expanded (k = 2) relative uncertainty of one traverse flow. */
export function traverseUncertainty(input: TraverseUncertaintyInput, densitySensitivity = input.densitySensitivity ?? 0.5): FlowUncertainty {
  return flowUncertainty(sharedTerms(input), densitySensitivity, input.densityRelative);
}

/**
 * traverseUncertainty of the actual, standard and mass flow of one traverse, each with its exponent of
 * density: the terms they share (all but density) are worked out once.
 */
export function traverseFlowUncertainties(
  input: TraverseUncertaintyInput,
  densitySensitivity: { actual: number; standard: number; mass: number },
): { actual: FlowUncertainty; standard: FlowUncertainty; mass: FlowUncertainty } {
  const shared = sharedTerms(input);
  return {
    actual: flowUncertainty(shared, densitySensitivity.actual, input.densityRelative),
    standard: flowUncertainty(shared, densitySensitivity.standard, input.densityRelative),
    mass: flowUncertainty(shared, densitySensitivity.mass, input.densityRelative),
  };
}

/** The terms that do not depend on the flow's exponent of density. */
function sharedTerms(input: TraverseUncertaintyInput): Omit<UncertaintyTerms, "density"> {
  return {
    dimension: areaRelativeUncertainty(input.duct, input.accuracy.dimensionAccuracyM) / SQRT3,
    reading: input.readingRelative / SQRT3,
    layout: Math.abs(input.layoutError) / SQRT3,
    random: input.pointCount > 0 ? input.accuracy.repeatabilityPct / 100 / Math.sqrt(input.pointCount) : 0,
    sampling: input.samplingRelative ?? 0,
  };
}

function flowUncertainty(shared: Omit<UncertaintyTerms, "density">, densitySensitivity: number, densityRelative: number): FlowUncertainty {
  const terms: UncertaintyTerms = {
    dimension: shared.dimension,
    reading: shared.reading,
    density: (Math.abs(densitySensitivity) * densityRelative) / SQRT3,
    layout: shared.layout,
    random: shared.random,
    sampling: shared.sampling,
  };
  const combined = combineRelative(terms);
  return { terms, combined, expanded: COVERAGE_FACTOR * combined, coverageFactor: COVERAGE_FACTOR };
}

/** Straight run at the plane, as the layout judged it. */
export type StraightRun = "unknown" | "good" | "short" | "unsuitable";

export interface SamplingUncertainty {
  /** Relative standard uncertainty from sampling, u = factor·s/√N. */
  relative: number;
  /** s: the smaller of the spread about a flat and about a fully developed profile (coefficients of variation). */
  unevenness: number;
  /** Straight-run multiplier: 1, 1.25 (short) or 1.5 (unsuitable). */
  factor: number;
  pointCount: number;
}

/** Coefficient of variation of the values (sample standard deviation over the mean); 0 for fewer than two. */
export function coefficientOfVariation(values: ArrayLike<number>): number {
  const n = values.length;
  if (n < 2) return 0;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += values[i]!;
  const mean = sum / n;
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const d = values[i]! - mean;
    ss += d * d;
  }
  return spreadFromSums(n, sum, ss);
}

/**
 * coefficientOfVariation from the sums over the values: `sum` of them, and `squares` of their deviations
 * from sum/count (for a caller that gathers them while walking the values for something else).
 */
export function spreadFromSums(count: number, sum: number, squares: number): number {
  if (count < 2) return 0;
  const mean = sum / count;
  if (!(mean > 0)) return Number.POSITIVE_INFINITY;
  return Math.sqrt(squares / (count - 1)) / mean;
}

/** A velocity over the developed profile's value at its point (each value taken as at least 1e-6): the sampling term's shaped spread is the CV of these. */
export function velocityOverProfile(velocityMS: number, developed: number): number {
  return velocityMS / Math.max(developed, 1e-6);
}

/**
 * Sampling term of a traverse (method ours; see the module comment). `velocitiesMS[i]` is the velocity
 * read at a point and `developed[i]` the fully developed reference profile at that point's read position
 * (any positive scale). Points not read are left out of both.
 */
export function samplingUncertainty(velocitiesMS: ArrayLike<number>, developed: ArrayLike<number>, straightRun: StraightRun = "unknown"): SamplingUncertainty {
  const n = velocitiesMS.length;
  if (n === 0) return samplingFromSpreads(Number.POSITIVE_INFINITY, Number.POSITIVE_INFINITY, 0, straightRun);
  const ratios = new Array<number>(n);
  for (let i = 0; i < n; i++) ratios[i] = velocityOverProfile(velocitiesMS[i]!, developed[i] ?? 1);
  return samplingFromSpreads(coefficientOfVariation(velocitiesMS), coefficientOfVariation(ratios), n, straightRun);
}

/**
 * samplingUncertainty from the two spreads of the same N points: about a flat profile (the CV of the
 * velocities) and about the developed one (the CV of velocityOverProfile; see spreadFromSums).
 */
export function samplingFromSpreads(flat: number, shaped: number, pointCount: number, straightRun: StraightRun = "unknown"): SamplingUncertainty {
  const factor = straightRun === "unsuitable" ? UNSUITABLE_RUN_SAMPLING_FACTOR : straightRun === "short" ? SHORT_RUN_SAMPLING_FACTOR : 1;
  if (pointCount === 0) return { relative: Number.POSITIVE_INFINITY, unevenness: Number.POSITIVE_INFINITY, factor, pointCount: 0 };
  const unevenness = Math.min(flat, shaped);
  return { relative: (factor * unevenness) / Math.sqrt(pointCount), unevenness, factor, pointCount };
}
