/**
 * Physical constants shared by the airflow engine. SI throughout.
 * Each value names where it comes from; "common practice" marks a trade convention.
 */

/** Standard air, dry, 20 °C, 101.325 kPa (ASHRAE SI convention; common practice). A project setting may override it. */
export const STANDARD_DENSITY_KG_M3 = 1.204;

/** Ratio of specific heats of air, cp/cv (ideal diatomic gas; used by ISO 3966 for the compressibility correction). */
export const KAPPA_AIR = 1.4;

/** Gas constant of dry air, J/(kg·K) (ASHRAE Handbook Fundamentals ch. 1). */
export const R_DRY_AIR = 287.042;

/** Gas constant of water vapour, J/(kg·K) (ASHRAE Handbook Fundamentals ch. 1). */
export const R_WATER_VAPOUR = 461.524;

/** Ratio of the molar masses of water and dry air, 18.015268/28.966 (ASHRAE Handbook Fundamentals ch. 1 eq. 20). */
export const MOLAR_MASS_RATIO_WATER_AIR = 0.621945;

/** 1/0.621945 − 1, the factor in the moist-air specific volume (ASHRAE Handbook Fundamentals ch. 1 eq. 26). */
export const MOIST_VOLUME_FACTOR = 1.607858;

/** Standard atmosphere at sea level, Pa (ASHRAE Handbook Fundamentals ch. 1 table 1; ICAO). */
export const STANDARD_ATMOSPHERE_PA = 101_325;

/** 0 °C in kelvin (SI definition). */
export const ZERO_CELSIUS_K = 273.15;

/** Sutherland's law for air: reference viscosity Pa·s at 273.15 K and Sutherland temperature K (values from memory; widely tabulated). */
export const SUTHERLAND_MU_REF_PA_S = 1.716e-5;
export const SUTHERLAND_T_REF_K = 273.15;
export const SUTHERLAND_S_K = 110.4;

/** ISO 3966: the pitot-static method is limited to Mach numbers up to 0.25. */
export const MACH_LIMIT_ISO_3966 = 0.25;

/** Range ± of an unmeasured duct static pressure about the 0 Pa then assumed (our choice: most supply and return ducts sit within ±1 kPa). */
export const ASSUMED_STATIC_UNCERTAINTY_PA = 1000;
