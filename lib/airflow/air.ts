/**
 * Moist-air properties at a measuring plane: saturation pressure, humidity ratio,
 * barometric pressure, density and viscosity. Pure functions, SI units.
 * Equations: ASHRAE Handbook Fundamentals ch. 1 (psychrometrics), numbered as there.
 */
import { EngineInputError } from "./errors";
import {
  ASSUMED_STATIC_UNCERTAINTY_PA,
  MOIST_VOLUME_FACTOR,
  MOLAR_MASS_RATIO_WATER_AIR,
  R_DRY_AIR,
  STANDARD_ATMOSPHERE_PA,
  SUTHERLAND_MU_REF_PA_S,
  SUTHERLAND_S_K,
  SUTHERLAND_T_REF_K,
  ZERO_CELSIUS_K,
} from "./constants";

/**
 * Conditions read at the plane. Validated ranges (the zod schema enforces them):
 * dry-bulb −40…120 °C; wet-bulb −40 °C … dry-bulb; RH 0…100 %; barometric 50 000…110 000 Pa;
 * altitude −500…5 000 m; duct static −10 000…10 000 Pa. Exactly one of RH / wet-bulb;
 * a measured barometric pressure wins over altitude when both are given, and the altitude then checks it
 * (a sea-level-corrected weather-report pressure at altitude is warned about).
 */
export interface AirConditions {
  dryBulbC: number;
  /** Measured station (not sea-level-corrected) pressure; if absent, altitudeM is used. */
  barometricPa?: number;
  /** Site altitude, m: the pressure when no barometer was read, and the check of one that was. */
  altitudeM?: number;
  /**
   * Duct static pressure, gauge (negative on return/exhaust). Undefined when it was not measured: 0 Pa
   * (ambient) is then assumed, the state says so (staticAssumed) and the density uncertainty widens.
   */
  staticPa?: number;
  relativeHumidityPct?: number;
  wetBulbC?: number;
}

export interface AirState {
  dryBulbC: number;
  barometricPa: number;
  /** Where barometricPa came from. */
  barometricSource: "measured" | "altitude";
  /** Duct static pressure used, gauge Pa (0 when it was not measured). */
  staticPa: number;
  /** True when no static pressure was given and 0 Pa was assumed. */
  staticAssumed: boolean;
  absolutePressurePa: number;
  /** kg water per kg dry air. */
  humidityRatio: number;
  vapourPressurePa: number;
  /** Relative humidity at the plane (over ice below 0 °C), whichever way humidity was given. */
  relativeHumidityPct: number;
  densityKgM3: number;
  viscosityPaS: number;
  /** Implausible-but-possible states, in words a technician can act on. */
  warnings: string[];
}

/** A physically impossible combination of otherwise valid conditions; fields use the API's dotted snake_case paths. */
export class AirStateError extends EngineInputError {}

/** Warning thresholds (common practice, our own choice of limits). */
const STATIC_WARN_PA = 2_500;
const DENSITY_WARN_MIN_KG_M3 = 0.7;
const DENSITY_WARN_MAX_KG_M3 = 1.5;
/** Day-to-day weather rarely moves station pressure more than about ±3 kPa (from memory); beyond 4 kPa suspect a sea-level-corrected reading. */
const BAROMETRIC_VS_ALTITUDE_WARN_PA = 4_000;

/**
 * Saturation vapour pressure, Pa (Hyland–Wexler). Over ice below 0 °C (ASHRAE Fundamentals ch. 1 eq. 5,
 * valid −100…0 °C), over liquid water from 0 °C (eq. 6, valid 0…200 °C). The formulas are within 300 ppm of the ASHRAE table.
 */
export function saturationPressurePa(tempC: number): number {
  const t = tempC + ZERO_CELSIUS_K;
  const lnP =
    tempC < 0
      ? -5.6745359e3 / t + 6.3925247 - 9.677843e-3 * t + 6.2215701e-7 * t ** 2 + 2.0747825e-9 * t ** 3 - 9.484024e-13 * t ** 4 + 4.1635019 * Math.log(t)
      : -5.8002206e3 / t + 1.3914993 - 4.8640239e-2 * t + 4.1764768e-5 * t ** 2 - 1.4452093e-8 * t ** 3 + 6.5459673 * Math.log(t);
  return Math.exp(lnP);
}

/** Standard-atmosphere barometric pressure, Pa, at altitude in m (ASHRAE Fundamentals ch. 1 eq. 3; valid −500…11 000 m). */
export function barometricPressureFromAltitudePa(altitudeM: number): number {
  return STANDARD_ATMOSPHERE_PA * (1 - 2.25577e-5 * altitudeM) ** 5.2559;
}

/**
 * Humidity ratio, kg/kg, from the partial pressure of water vapour (ASHRAE Fundamentals ch. 1 eq. 20).
 * Returns Infinity when the vapour pressure reaches the total pressure (no dry air left).
 */
export function humidityRatioFromVapourPressure(vapourPressurePa: number, pressurePa: number): number {
  if (vapourPressurePa >= pressurePa) return Number.POSITIVE_INFINITY;
  return (MOLAR_MASS_RATIO_WATER_AIR * vapourPressurePa) / (pressurePa - vapourPressurePa);
}

/** Partial pressure of water vapour, Pa, from the humidity ratio (ASHRAE Fundamentals ch. 1 eq. 20 solved for p_w). */
export function vapourPressureFromHumidityRatioPa(humidityRatio: number, pressurePa: number): number {
  return (pressurePa * humidityRatio) / (MOLAR_MASS_RATIO_WATER_AIR + humidityRatio);
}

/** Humidity ratio, kg/kg, from relative humidity in % (0…100), dry-bulb °C and total pressure Pa (ASHRAE Fundamentals ch. 1 eqs. 20, 24). */
export function humidityRatioFromRelativeHumidity(dryBulbC: number, rhPct: number, pressurePa: number): number {
  return humidityRatioFromVapourPressure((rhPct / 100) * saturationPressurePa(dryBulbC), pressurePa);
}

/**
 * Humidity ratio, kg/kg, from a psychrometer: dry-bulb and wet-bulb °C, total pressure Pa.
 * ASHRAE Fundamentals ch. 1 eq. 33 (wet-bulb ≥ 0 °C, wetted wick) or eq. 35 (wet-bulb below 0 °C, iced wick).
 * Negative when the wet-bulb is lower than even dry air could show (an impossible reading); callers flag it.
 */
export function humidityRatioFromWetBulb(dryBulbC: number, wetBulbC: number, pressurePa: number): number {
  const wsStar = humidityRatioFromVapourPressure(saturationPressurePa(wetBulbC), pressurePa);
  const depression = dryBulbC - wetBulbC;
  if (wetBulbC >= 0) {
    return ((2501 - 2.326 * wetBulbC) * wsStar - 1.006 * depression) / (2501 + 1.86 * dryBulbC - 4.186 * wetBulbC);
  }
  return ((2830 - 0.24 * wetBulbC) * wsStar - 1.006 * depression) / (2830 + 1.86 * dryBulbC - 2.1 * wetBulbC);
}

/** Moist-air density, kg/m³ of mixture, at dry-bulb °C, humidity ratio kg/kg and absolute pressure Pa (ASHRAE Fundamentals ch. 1 eqs. 11, 26). */
export function moistAirDensityKgM3(dryBulbC: number, humidityRatio: number, pressurePa: number): number {
  const tK = dryBulbC + ZERO_CELSIUS_K;
  return ((1 + humidityRatio) * pressurePa) / (R_DRY_AIR * tK * (1 + MOIST_VOLUME_FACTOR * humidityRatio));
}

/** Dynamic viscosity of air, Pa·s, at temperature °C (Sutherland's law; water vapour's small effect neglected). */
export function dynamicViscosityPaS(tempC: number): number {
  const tK = tempC + ZERO_CELSIUS_K;
  return SUTHERLAND_MU_REF_PA_S * (tK / SUTHERLAND_T_REF_K) ** 1.5 * ((SUTHERLAND_T_REF_K + SUTHERLAND_S_K) / (tK + SUTHERLAND_S_K));
}

function fmt(value: number, digits = 0): string {
  return value.toLocaleString("en-US", { maximumFractionDigits: digits, minimumFractionDigits: digits });
}

/**
 * Field errors for combinations of individually valid conditions that cannot exist together
 * (vapour pressure at or above the total pressure, a missing pressure or humidity input, wet-bulb above dry-bulb).
 * Keys are dotted snake_case API paths under `fieldPrefix` (default "air"). Empty when the conditions are usable.
 */
export function airConditionErrors(conditions: AirConditions, fieldPrefix = "air"): Record<string, string> {
  const key = (name: string) => (fieldPrefix ? `${fieldPrefix}.${name}` : name);
  const fields: Record<string, string> = {};
  const { dryBulbC, relativeHumidityPct: rh, wetBulbC: wb } = conditions;
  if (conditions.barometricPa === undefined && conditions.altitudeM === undefined) {
    fields[key("barometric_pa")] = "Give the measured barometric pressure (Pa) or the site altitude (m).";
  }
  if ((rh === undefined) === (wb === undefined)) {
    fields[key("relative_humidity_pct")] = "Give exactly one of relative humidity (%) or wet-bulb (°C).";
  }
  if (wb !== undefined && wb > dryBulbC) {
    fields[key("wet_bulb_c")] = `Wet-bulb ${wb} °C is above the dry-bulb ${dryBulbC} °C; it must be at or below it.`;
  }
  if (Object.keys(fields).length > 0) return fields;

  const absolutePa = barometric(conditions) + (conditions.staticPa ?? 0);
  if (rh !== undefined) {
    const pwPa = (rh / 100) * saturationPressurePa(dryBulbC);
    if (pwPa >= absolutePa) {
      fields[key("relative_humidity_pct")] =
        `At ${dryBulbC} °C, ${rh} % RH means ${fmt(pwPa)} Pa of water vapour, at or above the ${fmt(absolutePa)} Pa absolute pressure at the plane; no such air exists. Check RH, dry-bulb and pressures.`;
    }
  } else if (wb !== undefined) {
    const pwsPa = saturationPressurePa(wb);
    if (pwsPa >= absolutePa) {
      fields[key("wet_bulb_c")] =
        `A wet-bulb of ${wb} °C needs ${fmt(pwsPa)} Pa of saturated vapour, at or above the ${fmt(absolutePa)} Pa absolute pressure at the plane; no such air exists.`;
    }
  }
  return fields;
}

function barometric(conditions: AirConditions): number {
  if (conditions.barometricPa !== undefined) return conditions.barometricPa;
  return barometricPressureFromAltitudePa(conditions.altitudeM ?? 0);
}

/** Humidity ratio from whichever humidity reading the conditions give (negative for an impossible wet-bulb). */
function rawHumidityRatio(conditions: AirConditions, absolutePressurePa: number): number {
  if (conditions.relativeHumidityPct !== undefined) return humidityRatioFromRelativeHumidity(conditions.dryBulbC, conditions.relativeHumidityPct, absolutePressurePa);
  return humidityRatioFromWetBulb(conditions.dryBulbC, conditions.wetBulbC ?? conditions.dryBulbC, absolutePressurePa);
}

/**
 * The density airState gives for these conditions, or null where airState refuses them, without building
 * its messages: for callers that evaluate the density many times (sensitivity coefficients).
 */
export function densityOf(conditions: AirConditions): number | null {
  if (Object.keys(airConditionErrors(conditions)).length > 0) return null;
  const absolutePressurePa = barometric(conditions) + (conditions.staticPa ?? 0);
  return moistAirDensityKgM3(conditions.dryBulbC, Math.max(0, rawHumidityRatio(conditions, absolutePressurePa)), absolutePressurePa);
}

/**
 * The state of the air at the measuring plane. Absolute pressure = barometric + duct static;
 * humidity is evaluated at that absolute pressure (the sensor sits in the duct).
 * Throws AirStateError (with per-field messages) for impossible combinations; see airConditionErrors.
 */
export function airState(conditions: AirConditions, options: { fieldPrefix?: string } = {}): AirState {
  const prefix = options.fieldPrefix ?? "air";
  const errors = airConditionErrors(conditions, prefix);
  if (Object.keys(errors).length > 0) {
    throw new AirStateError(`Air conditions are not possible: check ${Object.keys(errors).join(", ")}.`, errors);
  }
  const { dryBulbC } = conditions;
  const staticAssumed = conditions.staticPa === undefined;
  const staticPa = conditions.staticPa ?? 0;
  const warnings: string[] = [];
  const barometricPa = barometric(conditions);
  const absolutePressurePa = barometricPa + staticPa;

  if (conditions.barometricPa !== undefined && conditions.altitudeM !== undefined) {
    const standardPa = barometricPressureFromAltitudePa(conditions.altitudeM);
    if (Math.abs(barometricPa - standardPa) > BAROMETRIC_VS_ALTITUDE_WARN_PA) {
      // If the reading is wrong and the site is near standard, pitot flows scale with ρ^(−½) ∝ p^(−½).
      const flowEffectPct = (Math.sqrt(standardPa / barometricPa) - 1) * 100;
      warnings.push(
        `Barometric ${fmt(barometricPa)} Pa differs from the standard atmosphere at ${fmt(conditions.altitudeM)} m (${fmt(standardPa)} Pa) by more than ${fmt(BAROMETRIC_VS_ALTITUDE_WARN_PA)} Pa: was it a sea-level-corrected weather report? Use the station reading (a barometer on site); if this one is wrong, pitot flows come out ${fmt(Math.abs(flowEffectPct), 1)} % too ${flowEffectPct < 0 ? "low" : "high"}. The measured value was used.`,
      );
    }
  }
  if (staticAssumed) {
    warnings.push(`Duct static pressure was not given: 0 Pa (ambient) was assumed, and the density uncertainty allows for ±${fmt(ASSUMED_STATIC_UNCERTAINTY_PA)} Pa. Measure it at the plane for a better density.`);
  }
  if (Math.abs(staticPa) > STATIC_WARN_PA) {
    warnings.push(
      `Duct static ${fmt(staticPa)} Pa is more than ±${fmt(STATIC_WARN_PA)} Pa from ambient; unusual for air-handling ducts. Check the gauge reference and units.`,
    );
  }

  let humidityRatio = rawHumidityRatio(conditions, absolutePressurePa);
  if (conditions.relativeHumidityPct !== undefined) {
    const rh = conditions.relativeHumidityPct;
    if (rh >= 100 && dryBulbC < 0) {
      warnings.push(
        `RH ${rh} % at ${dryBulbC} °C: saturated air below freezing usually means an iced or wetted sensor. Humidity was taken relative to ice; check the reading.`,
      );
    }
  } else if (humidityRatio < 0) {
    const wb = conditions.wetBulbC ?? dryBulbC;
    warnings.push(
      `Wet-bulb ${wb} °C is lower than perfectly dry air at ${dryBulbC} °C would read (humidity ratio ${humidityRatio.toFixed(4)}); the wick was probably dry or the reading wrong. Dry air was assumed.`,
    );
    humidityRatio = 0;
  }

  const vapourPressurePa = vapourPressureFromHumidityRatioPa(humidityRatio, absolutePressurePa);
  const relativeHumidityPct = (100 * vapourPressurePa) / saturationPressurePa(dryBulbC);
  const densityKgM3 = moistAirDensityKgM3(dryBulbC, humidityRatio, absolutePressurePa);
  if (densityKgM3 < DENSITY_WARN_MIN_KG_M3 || densityKgM3 > DENSITY_WARN_MAX_KG_M3) {
    warnings.push(
      `Air density ${densityKgM3.toFixed(3)} kg/m³ is outside ${DENSITY_WARN_MIN_KG_M3}–${DENSITY_WARN_MAX_KG_M3} kg/m³, unusual for building air; check temperature, humidity and pressure inputs.`,
    );
  }

  return {
    dryBulbC,
    barometricPa,
    barometricSource: conditions.barometricPa !== undefined ? "measured" : "altitude",
    staticPa,
    staticAssumed,
    absolutePressurePa,
    humidityRatio,
    vapourPressurePa,
    relativeHumidityPct,
    densityKgM3,
    viscosityPaS: dynamicViscosityPaS(dryBulbC),
    warnings,
  };
}

/** How many distinct air states airStateFor keeps: a project's traverses, with room to spare. */
const AIR_STATE_MEMO_SIZE = 128;
const airStates = new Map<string, AirState>();
let lastAir: { conditions: AirConditions; state: AirState } | null = null;

function sameConditions(a: AirConditions, b: AirConditions): boolean {
  return (
    Object.is(a.dryBulbC, b.dryBulbC) &&
    Object.is(a.barometricPa, b.barometricPa) &&
    Object.is(a.altitudeM, b.altitudeM) &&
    Object.is(a.staticPa, b.staticPa) &&
    Object.is(a.relativeHumidityPct, b.relativeHumidityPct) &&
    Object.is(a.wetBulbC, b.wetBulbC)
  );
}

/** A number (or undefined) as a key part that keeps −0 apart from 0, as Object.is does. */
const keyPart = (x: number | undefined) => (Object.is(x, -0) ? "-0" : String(x));

/**
 * airState, remembered: the state depends only on the conditions, and every recalculation of a traverse
 * (each reading as it lands, every screen and report that shows it) asks again with the same air. The
 * state is frozen, so no caller can change the shared copy; least recently used states are dropped
 * beyond AIR_STATE_MEMO_SIZE. Impossible air throws AirStateError as airState does, and is not remembered.
 */
export function airStateFor(conditions: AirConditions): AirState {
  if (lastAir && sameConditions(lastAir.conditions, conditions)) return lastAir.state;
  const key = [conditions.dryBulbC, conditions.barometricPa, conditions.altitudeM, conditions.staticPa, conditions.relativeHumidityPct, conditions.wetBulbC].map(keyPart).join("|");
  let state = airStates.get(key);
  if (state) {
    airStates.delete(key);
    airStates.set(key, state);
  } else {
    state = airState(conditions);
    Object.freeze(state.warnings);
    Object.freeze(state);
    airStates.set(key, state);
    if (airStates.size > AIR_STATE_MEMO_SIZE) airStates.delete(airStates.keys().next().value as string);
  }
  const { dryBulbC, barometricPa, altitudeM, staticPa, relativeHumidityPct, wetBulbC } = conditions;
  lastAir = { conditions: { dryBulbC, barometricPa, altitudeM, staticPa, relativeHumidityPct, wetBulbC }, state };
  return state;
}
