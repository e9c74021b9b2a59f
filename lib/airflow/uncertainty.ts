/**
 * Uncertainty of a traverse flow by the GUM law of propagation of uncertainty (JCGM 100:2008 §5.1),
 * first order, the inputs taken as uncorrelated:
 *
 *   (u_Q/Q)² = dimension² + (½·u_Pv/Pv)² + (½·u_ρ/ρ)² + u_layout² + u_random²/N
 *
 * Each stated instrument accuracy is used as the standard uncertainty of that input, so the result
 * has the same coverage as the accuracies given. The ½ factors come from V ∝ √(Pv/ρ).
 *
 * u_random is the scatter of repeated readings at one point (turbulence, gauge damping), which averages
 * down over N points. The spatial spread of a steady profile is not random: its effect on the mean is
 * the layout's integration error (u_layout); a distorted plane is reported by the plane-quality verdict.
 */
import { airState, barometricPressureFromAltitudePa, type AirConditions } from "./air";
import type { Duct } from "./layout";

/** Accuracies of the instruments used. Defaults are typical field instruments (common practice). */
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
  /** Scatter of repeated time-averaged readings at one point, ± % of velocity. */
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

/** Day-to-day weather swing of station pressure about the standard atmosphere, used when only altitude is known (from memory). */
export const ALTITUDE_BAROMETRIC_UNCERTAINTY_PA = 3000;

export interface UncertaintyTerms {
  /** Relative uncertainty of the area from the dimensions. */
  dimension: number;
  /** Relative uncertainty of the mean velocity from the readings (½·u_Pv/Pv for a pitot tube). */
  reading: number;
  /** ½·u_ρ/ρ for pitot readings. */
  density: number;
  /** Integration error of the layout. */
  layout: number;
  /** Repeatability of a point reading / √N. */
  random: number;
}

/** Root-sum-square of relative terms (GUM, uncorrelated inputs). All fractions, e.g. 0.01 = 1 %. */
export function combineRelative(terms: UncertaintyTerms): number {
  return Math.hypot(terms.dimension, terms.reading, terms.density, terms.layout, terms.random);
}

/** Relative uncertainty of the area: 2·u_D/D for round ducts, √((u_W/W)² + (u_H/H)²) for rectangular. */
export function areaRelativeUncertainty(duct: Duct, dimensionAccuracyM: number): number {
  return duct.shape === "round"
    ? (2 * dimensionAccuracyM) / duct.diameterM
    : Math.hypot(dimensionAccuracyM / duct.widthM, dimensionAccuracyM / duct.heightM);
}

/**
 * Relative uncertainty of the mean velocity from velocity pressures (Pa) read with a manometer of
 * ±(pct % of reading + floor Pa). Per point, δv ∝ (√(Pv + u) − √(max(Pv − u, 0)))/2 — ½·u/Pv of the
 * velocity when u ≪ Pv, and still finite at Pv ≤ 0. The gauge error is the same instrument at every
 * point, so the point errors are summed (fully correlated) before dividing by the sum of velocities.
 */
export function pressureReadingRelativeUncertainty(velocityPressuresPa: readonly number[], accuracy: Pick<InstrumentAccuracy, "pressureAccuracyPct" | "pressureFloorPa">): number {
  let errorSum = 0;
  let velocitySum = 0;
  for (const pv of velocityPressuresPa) {
    const positive = Math.max(pv, 0);
    const u = (accuracy.pressureAccuracyPct / 100) * Math.abs(pv) + accuracy.pressureFloorPa;
    errorSum += (Math.sqrt(positive + u) - Math.sqrt(Math.max(positive - u, 0))) / 2;
    velocitySum += Math.sqrt(positive);
  }
  return velocitySum > 0 ? errorSum / velocitySum : Number.POSITIVE_INFINITY;
}

/** Relative uncertainty of the mean velocity from anemometer velocities (m/s) of ±(pct % + floor m/s), correlated as above. */
export function velocityReadingRelativeUncertainty(velocitiesMS: readonly number[], accuracy: Pick<InstrumentAccuracy, "velocityAccuracyPct" | "velocityFloorMS">): number {
  const sum = velocitiesMS.reduce((a, v) => a + Math.max(v, 0), 0);
  const err = velocitiesMS.reduce((a, v) => a + (accuracy.velocityAccuracyPct / 100) * Math.abs(v) + accuracy.velocityFloorMS, 0);
  return sum > 0 ? err / sum : Number.POSITIVE_INFINITY;
}

function densityAt(conditions: AirConditions): number | null {
  try {
    return airState(conditions).densityKgM3;
  } catch {
    return null;
  }
}

/**
 * Relative standard uncertainty of the air density, u_ρ/ρ, from the accuracy of temperature,
 * barometric, static and humidity readings. Sensitivities are central differences of the density
 * (GUM §5.1.3 allows numerical sensitivity coefficients), one-sided where a step leaves the valid range.
 */
export function densityRelativeUncertainty(conditions: AirConditions, accuracy: InstrumentAccuracy): number {
  const rho = densityAt(conditions);
  if (rho === null) return Number.NaN;
  const barometricU = conditions.barometricPa !== undefined ? accuracy.barometricAccuracyPa : ALTITUDE_BAROMETRIC_UNCERTAINTY_PA;
  const staticU = (accuracy.pressureAccuracyPct / 100) * Math.abs(conditions.staticPa) + accuracy.pressureFloorPa;
  const steps: Array<[u: number, shift: (c: AirConditions, d: number) => AirConditions]> = [
    // Dry-bulb alone; when humidity is a wet-bulb it is perturbed separately below.
    [accuracy.temperatureAccuracyC, (c, d) => ({ ...c, dryBulbC: c.dryBulbC + d })],
    [barometricU, (c, d) => ({ ...c, barometricPa: (c.barometricPa ?? barometricPressureFromAltitudePa(c.altitudeM ?? 0)) + d, altitudeM: undefined })],
    [staticU, (c, d) => ({ ...c, staticPa: c.staticPa + d })],
  ];
  if (conditions.relativeHumidityPct !== undefined) {
    steps.push([accuracy.humidityAccuracyPct, (c, d) => ({ ...c, relativeHumidityPct: Math.min(100, Math.max(0, (c.relativeHumidityPct ?? 0) + d)) })]);
  } else if (conditions.wetBulbC !== undefined) {
    steps.push([accuracy.temperatureAccuracyC, (c, d) => ({ ...c, wetBulbC: Math.min(c.dryBulbC, (c.wetBulbC ?? 0) + d) })]);
  }
  let sumSquares = 0;
  for (const [u, shift] of steps) {
    if (!(u > 0)) continue;
    const up = densityAt(shift(conditions, u));
    const down = densityAt(shift(conditions, -u));
    const slope = up !== null && down !== null ? (up - down) / 2 : up !== null ? up - rho : down !== null ? rho - down : 0;
    sumSquares += (slope / rho) ** 2;
  }
  return Math.sqrt(sumSquares);
}

export interface TraverseUncertaintyInput {
  duct: Duct;
  accuracy: InstrumentAccuracy;
  /** Relative uncertainty of the mean velocity from the readings (see the *ReadingRelativeUncertainty functions). */
  readingRelative: number;
  /** u_ρ/ρ. */
  densityRelative: number;
  /** Exponent of ρ in the flow: ½ from pitot readings (default), 0 from actual velocities, 1 from standard velocities. */
  densitySensitivity?: number;
  /** Integration error of the layout as a fraction (sign ignored). */
  layoutError: number;
  /** Number of points read: the repeatability of each averages down by √N. */
  pointCount: number;
}

/** The terms and the combined relative standard uncertainty of a traverse flow (fractions). */
export function traverseUncertainty(input: TraverseUncertaintyInput): { terms: UncertaintyTerms; combined: number } {
  const terms: UncertaintyTerms = {
    dimension: areaRelativeUncertainty(input.duct, input.accuracy.dimensionAccuracyM),
    reading: input.readingRelative,
    density: (input.densitySensitivity ?? 0.5) * input.densityRelative,
    layout: Math.abs(input.layoutError),
    random: input.pointCount > 0 ? input.accuracy.repeatabilityPct / 100 / Math.sqrt(input.pointCount) : 0,
  };
  return { terms, combined: combineRelative(terms) };
}
