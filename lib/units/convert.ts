/**
 * Inch-pound ↔ SI conversion for every quantity Airtally shows. mathjs supplies the unit algebra;
 * the units it lacks are defined here from NIST SP 811 (appendix B). Each (from, to) pair is resolved
 * through mathjs once and cached as an affine map, so conversions in tables cost a multiply-add.
 */
import { create, createUnitDependencies, unitDependencies } from "mathjs";

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
  /** mathjs expression. */
  math: string;
  /** Printed symbol. */
  symbol: string;
  /** What kind of thing it measures; pressures and barometric share "pressure", lengths and dimensions "length". */
  kind: "pressure" | "velocity" | "flow" | "temperature" | "length" | "density" | "massFlow";
}

const math = create({ ...unitDependencies, ...createUnitDependencies });

// Inch of water, conventional: 1 in × 1 000 kg/m³ × g_n (9.806 65 m/s²) = 249.088 91 Pa (NIST SP 811 B.8: 2.490 889 E+02 Pa),
// i.e. water near its 4 °C density maximum. Chosen over the 60 °F inch (248.84 Pa, 0.1 % lower) because it is exact and conventional.
math.createUnit("inH2O", "249.08891 Pa");
// Inch of mercury, conventional: 25.4 × the conventional mmHg (133.322 387 415 Pa) = 1 in × 13 595.1 kg/m³ × g_n
// = 3 386.389 Pa (NIST SP 811 B.8: 3.386 389 E+03 Pa; mercury at 0 °C / 32 °F).
math.createUnit("inHg", "3386.388640341 Pa");
// Cubic foot per minute and foot per minute, exact from the international foot (0.3048 m, NIST SP 811 B.8).
math.createUnit("cfm", "1 ft^3/min");
math.createUnit("fpm", "1 ft/min");

export const UNITS: Readonly<Record<UnitId, UnitInfo>> = {
  Pa: { math: "Pa", symbol: "Pa", kind: "pressure" },
  kPa: { math: "kPa", symbol: "kPa", kind: "pressure" },
  inH2O: { math: "inH2O", symbol: "in. w.c.", kind: "pressure" },
  inHg: { math: "inHg", symbol: "in. Hg", kind: "pressure" },
  "m/s": { math: "m/s", symbol: "m/s", kind: "velocity" },
  fpm: { math: "fpm", symbol: "fpm", kind: "velocity" },
  "m3/s": { math: "m^3/s", symbol: "m³/s", kind: "flow" },
  "L/s": { math: "L/s", symbol: "L/s", kind: "flow" },
  "m3/h": { math: "m^3/h", symbol: "m³/h", kind: "flow" },
  cfm: { math: "cfm", symbol: "cfm", kind: "flow" },
  degC: { math: "degC", symbol: "°C", kind: "temperature" },
  degF: { math: "degF", symbol: "°F", kind: "temperature" },
  m: { math: "m", symbol: "m", kind: "length" },
  mm: { math: "mm", symbol: "mm", kind: "length" },
  ft: { math: "ft", symbol: "ft", kind: "length" },
  in: { math: "in", symbol: "in.", kind: "length" },
  "kg/m3": { math: "kg/m^3", symbol: "kg/m³", kind: "density" },
  "lb/ft3": { math: "lbm/ft^3", symbol: "lb/ft³", kind: "density" },
  "kg/s": { math: "kg/s", symbol: "kg/s", kind: "massFlow" },
  "lb/min": { math: "lbm/min", symbol: "lb/min", kind: "massFlow" },
  "lb/h": { math: "lbm/h", symbol: "lb/h", kind: "massFlow" },
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

/** y = scale·x + offset; offset is non-zero only for temperatures. */
interface Affine {
  scale: number;
  offset: number;
}
const cache = new Map<string, Affine>();

function info(unit: string): UnitInfo {
  const found = (UNITS as Record<string, UnitInfo | undefined>)[unit];
  if (!found) throw new UnitError(`Unit "${unit}" is not known; use one of ${Object.keys(UNITS).join(", ")}.`);
  return found;
}

function affine(from: UnitId, to: UnitId): Affine {
  const key = `${from}>${to}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const a = info(from);
  const b = info(to);
  if (a.kind !== b.kind) throw new UnitError(`Cannot convert ${a.symbol} (${a.kind}) to ${b.symbol} (${b.kind}).`);
  const at0 = math.unit(0, a.math).toNumber(b.math);
  const at1 = math.unit(1, a.math).toNumber(b.math);
  const map = { scale: at1 - at0, offset: at0 };
  cache.set(key, map);
  return map;
}

/** Converts a value between two units of the same kind, e.g. convert(1000, "cfm", "L/s"). Throws UnitError otherwise. */
export function convert(value: number, from: UnitId, to: UnitId): number {
  if (from === to) return value;
  const { scale, offset } = affine(from, to);
  return value * scale + offset;
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
