/**
 * Inch-pound ↔ SI conversion for every quantity Airtally shows. Each unit is an exact affine map to its
 * kind's SI unit, from the definitions in NIST SP 811 (appendix B): the international foot (0.3048 m),
 * the avoirdupois pound (0.453 592 37 kg), the conventional inch of water and of mercury, and
 * t/°C = (t/°F − 32)/1.8. The table ships to the tablet as a few numbers; tests/units/convert.test.ts
 * checks every pair against mathjs's unit algebra (a general-purpose reference library).
 */

/** What a number measures; each quantity has one engine unit (ENGINE_UNITS). */
export type Quantity = "pressure" | "velocity" | "flow" | "temperature" | "length" | "dimension" | "density" | "barometric" | "massFlow";

/** Units Airtally accepts and shows. */
export type UnitId =
  | "Pa" | "kPa" | "inH2O" | "inHg"
  | "m/s" | "fpm"
  | "m3/s" | "L/s" | "m3/h" | "cfm"
  | "degC" | "degF"
  | "m" | "mm" | "ft" | "in"
  | "kg/m3" | "lb/ft3"
  | "kg/s" | "lb/min" | "lb/h";

interface UnitInfo {
  /** The same unit in mathjs's notation (the reference the tests check the factors against). */
  math: string;
  /** Printed symbol. */
  symbol: string;
  /** What kind of thing it measures; pressures and barometric share "pressure", lengths and dimensions "length". */
  kind: "pressure" | "velocity" | "flow" | "temperature" | "length" | "density" | "massFlow";
  /** value in the kind's SI unit (Pa, m/s, m³/s, °C, m, kg/m³, kg/s) = scale × value in this unit + offset. */
  scale: number;
  offset?: number;
}

const FOOT_M = 0.3048;
const POUND_KG = 0.45359237;
const MINUTE_S = 60;
const HOUR_S = 3600;

export const UNITS: Readonly<Record<UnitId, UnitInfo>> = {
  Pa: { math: "Pa", symbol: "Pa", kind: "pressure", scale: 1 },
  kPa: { math: "kPa", symbol: "kPa", kind: "pressure", scale: 1000 },
  // Inch of water, conventional: 1 in × 1 000 kg/m³ × g_n (9.806 65 m/s²) = 249.088 91 Pa (NIST SP 811 B.8: 2.490 889 E+02 Pa),
  // i.e. water near its 4 °C density maximum. Chosen over the 60 °F inch (248.84 Pa, 0.1 % lower) because it is exact and conventional.
  inH2O: { math: "inH2O", symbol: "in. w.c.", kind: "pressure", scale: 249.08891 },
  // Inch of mercury, conventional: 25.4 × the conventional mmHg (133.322 387 415 Pa) = 1 in × 13 595.1 kg/m³ × g_n
  // = 3 386.389 Pa (NIST SP 811 B.8: 3.386 389 E+03 Pa; mercury at 0 °C / 32 °F).
  inHg: { math: "inHg", symbol: "in. Hg", kind: "pressure", scale: 3386.388640341 },
  "m/s": { math: "m/s", symbol: "m/s", kind: "velocity", scale: 1 },
  fpm: { math: "ft/min", symbol: "fpm", kind: "velocity", scale: FOOT_M / MINUTE_S },
  "m3/s": { math: "m^3/s", symbol: "m³/s", kind: "flow", scale: 1 },
  "L/s": { math: "L/s", symbol: "L/s", kind: "flow", scale: 0.001 },
  "m3/h": { math: "m^3/h", symbol: "m³/h", kind: "flow", scale: 1 / HOUR_S },
  cfm: { math: "ft^3/min", symbol: "cfm", kind: "flow", scale: FOOT_M ** 3 / MINUTE_S },
  degC: { math: "degC", symbol: "°C", kind: "temperature", scale: 1 },
  degF: { math: "degF", symbol: "°F", kind: "temperature", scale: 1 / 1.8, offset: -32 / 1.8 },
  m: { math: "m", symbol: "m", kind: "length", scale: 1 },
  mm: { math: "mm", symbol: "mm", kind: "length", scale: 0.001 },
  ft: { math: "ft", symbol: "ft", kind: "length", scale: FOOT_M },
  in: { math: "in", symbol: "in.", kind: "length", scale: FOOT_M / 12 },
  "kg/m3": { math: "kg/m^3", symbol: "kg/m³", kind: "density", scale: 1 },
  "lb/ft3": { math: "lbm/ft^3", symbol: "lb/ft³", kind: "density", scale: POUND_KG / FOOT_M ** 3 },
  "kg/s": { math: "kg/s", symbol: "kg/s", kind: "massFlow", scale: 1 },
  "lb/min": { math: "lbm/min", symbol: "lb/min", kind: "massFlow", scale: POUND_KG / MINUTE_S },
  "lb/h": { math: "lbm/h", symbol: "lb/h", kind: "massFlow", scale: POUND_KG / HOUR_S },
};

/** The unit the engine works in for each quantity (SI; lengths of duct dimensions in mm, as in the API). */
export const ENGINE_UNITS: Readonly<Record<Quantity, UnitId>> = {
  pressure: "Pa",
  velocity: "m/s",
  flow: "m3/s",
  temperature: "degC",
  length: "m",
  dimension: "mm",
  density: "kg/m3",
  barometric: "Pa",
  massFlow: "kg/s",
};

const QUANTITY_KIND: Readonly<Record<Quantity, UnitInfo["kind"]>> = {
  pressure: "pressure",
  velocity: "velocity",
  flow: "flow",
  temperature: "temperature",
  length: "length",
  dimension: "length",
  density: "density",
  barometric: "pressure",
  massFlow: "massFlow",
};

/** A unit that does not exist here or does not fit the quantity. */
export class UnitError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "UnitError";
  }
}

function info(unit: string): UnitInfo {
  const found = (UNITS as Record<string, UnitInfo | undefined>)[unit];
  if (!found) throw new UnitError(`Unit "${unit}" is not known; use one of ${Object.keys(UNITS).join(", ")}.`);
  return found;
}

/** Converts a value between two units of the same kind, e.g. convert(1000, "cfm", "L/s"). Throws UnitError otherwise. */
export function convert(value: number, from: UnitId, to: UnitId): number {
  if (from === to) return value;
  const a = info(from);
  const b = info(to);
  if (a.kind !== b.kind) throw new UnitError(`Cannot convert ${a.symbol} (${a.kind}) to ${b.symbol} (${b.kind}).`);
  const si = value * a.scale + (a.offset ?? 0);
  return (si - (b.offset ?? 0)) / b.scale;
}

function checkFits(quantity: Quantity, unit: UnitId): void {
  const kind = info(unit).kind;
  if (kind !== QUANTITY_KIND[quantity]) throw new UnitError(`${info(unit).symbol} is a ${kind} unit and cannot express ${quantity}.`);
}

/** A value given in `unit` expressed in the engine unit of `quantity` (see ENGINE_UNITS). */
export function toSi(quantity: Quantity, value: number, unit: UnitId): number {
  checkFits(quantity, unit);
  return convert(value, unit, ENGINE_UNITS[quantity]);
}

/** An engine value of `quantity` expressed in `unit`. */
export function fromSi(quantity: Quantity, value: number, unit: UnitId): number {
  checkFits(quantity, unit);
  return convert(value, ENGINE_UNITS[quantity], unit);
}
