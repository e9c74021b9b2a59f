/**
 * Point velocity from a pitot-static velocity pressure, Mach number, and the
 * standard/actual velocity conversion for thermal anemometers. Pure functions, SI units.
 */
import { KAPPA_AIR, MACH_LIMIT_ISO_3966, R_DRY_AIR, STANDARD_DENSITY_KG_M3, ZERO_CELSIUS_K } from "./constants";

export { MACH_LIMIT_ISO_3966 };

/**
 * Velocity, m/s, from velocity pressure Pv (Pa) by the isentropic (compressible, subsonic) pitot relation:
 * V = C·√( 2κ/(κ−1) · (p/ρ) · [(1 + Pv/p)^((κ−1)/κ) − 1] ), κ = 1.4.
 * ρ is the static density at the plane (kg/m³), p the absolute static pressure there (Pa), C the probe
 * coefficient (1.0 for a standard pitot-static tube, common practice; validated 0.5…1.2).
 * Pv ≤ 0 (validated −500…5 000 Pa) gives 0: the caller counts and flags it, never a root of a negative.
 */
export function velocityFromPressureMS(
  velocityPressurePa: number,
  densityKgM3: number,
  absolutePressurePa: number,
  coefficient = 1,
): number {
  if (!(velocityPressurePa > 0)) return 0;
  return velocityFromPressureAtStateMS(velocityPressurePa, absolutePressurePa, pitotStateFactor(densityKgM3, absolutePressurePa), coefficient);
}

/** 2κ/(κ−1) and (κ−1)/κ of the isentropic pitot relation. */
const PITOT_FACTOR = (2 * KAPPA_AIR) / (KAPPA_AIR - 1);
const PITOT_EXPONENT = (KAPPA_AIR - 1) / KAPPA_AIR;

/** The part of velocityFromPressureMS that depends only on the air: 2κ/(κ−1)·p/ρ (ρ kg/m³, p absolute Pa). */
export function pitotStateFactor(densityKgM3: number, absolutePressurePa: number): number {
  return PITOT_FACTOR * (absolutePressurePa / densityKgM3);
}

/**
 * velocityFromPressureMS with its air-state factor worked out once (pitotStateFactor): the same arithmetic
 * and the same result, for many readings at one state. Pv ≤ 0 gives 0.
 */
export function velocityFromPressureAtStateMS(velocityPressurePa: number, absolutePressurePa: number, stateFactor: number, coefficient = 1): number {
  if (!(velocityPressurePa > 0)) return 0;
  // expm1/log1p keep full precision when Pv/p is tiny (the usual case: ~1e-4).
  const bracket = Math.expm1(PITOT_EXPONENT * Math.log1p(velocityPressurePa / absolutePressurePa));
  return coefficient * Math.sqrt(stateFactor * bracket);
}

/** Velocity, m/s, by the incompressible relation V = C·√(2·Pv/ρ); over-reads by about Pv/(4κp). Pv ≤ 0 gives 0. */
export function velocityFromPressureIncompressibleMS(velocityPressurePa: number, densityKgM3: number, coefficient = 1): number {
  if (!(velocityPressurePa > 0)) return 0;
  return coefficient * Math.sqrt((2 * velocityPressurePa) / densityKgM3);
}

/**
 * Velocity pressure, Pa, that a probe of coefficient C shows for a true velocity (m/s): the inverse of
 * velocityFromPressureMS, Pv = p·[(1 + (κ−1)/(2κ)·ρ(V/C)²/p)^(κ/(κ−1)) − 1]. Useful to simulate readings.
 */
export function velocityPressureFromVelocityPa(
  velocityMS: number,
  densityKgM3: number,
  absolutePressurePa: number,
  coefficient = 1,
): number {
  const v = velocityMS / coefficient;
  const x = ((KAPPA_AIR - 1) / (2 * KAPPA_AIR)) * ((densityKgM3 * v * v) / absolutePressurePa);
  return absolutePressurePa * Math.expm1((KAPPA_AIR / (KAPPA_AIR - 1)) * Math.log1p(x));
}

/**
 * Thermal anemometers sense mass flux and report "standard" velocity, V_std = ρ·V/ρ_std.
 * Actual velocity, m/s, at the plane's density: V = V_std·ρ_std/ρ.
 */
export function actualVelocityFromStandardMS(
  standardVelocityMS: number,
  densityKgM3: number,
  standardDensityKgM3 = STANDARD_DENSITY_KG_M3,
): number {
  return (standardVelocityMS * standardDensityKgM3) / densityKgM3;
}

/** Standard velocity, m/s (referred to ρ_std), from an actual velocity at density ρ: V_std = V·ρ/ρ_std. */
export function standardVelocityFromActualMS(
  actualVelocityMS: number,
  densityKgM3: number,
  standardDensityKgM3 = STANDARD_DENSITY_KG_M3,
): number {
  return (actualVelocityMS * densityKgM3) / standardDensityKgM3;
}

/** Speed of sound in dry air, m/s, at temperature °C: a = √(κ·R·T). Humidity raises it by well under 1 % in building air. */
export function speedOfSoundMS(tempC: number): number {
  return Math.sqrt(KAPPA_AIR * R_DRY_AIR * (tempC + ZERO_CELSIUS_K));
}

/** Mach number of a velocity (m/s) at static temperature °C. */
export function machNumber(velocityMS: number, tempC: number): number {
  return Math.abs(velocityMS) / speedOfSoundMS(tempC);
}

/** True when the Mach number is beyond the ISO 3966 limit (0.25) for pitot-static measurement; the caller warns. */
export function exceedsMachLimit(mach: number): boolean {
  return mach > MACH_LIMIT_ISO_3966;
}
