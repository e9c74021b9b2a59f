/**
 * Which unit, and how many decimals, each quantity is shown in for a unit system.
 * Decimals follow the resolution field instruments usually give (common practice).
 */
import { UNITS, fromSi, toSi, type Quantity, type UnitId } from "./convert";
import { numberText } from "./number-text";

export type UnitSystem = "IP" | "SI";

export interface DisplayUnit {
  unit: UnitId;
  symbol: string;
  decimals: number;
}

const entry = (unit: UnitId, decimals: number): DisplayUnit => ({ unit, symbol: UNITS[unit].symbol, decimals });

export const DISPLAY_UNITS: Readonly<Record<UnitSystem, Readonly<Record<Quantity, DisplayUnit>>>> = {
  SI: {
    pressure: entry("Pa", 1),
    velocity: entry("m/s", 2),
    flow: entry("L/s", 0),
    temperature: entry("degC", 1),
    length: entry("m", 2),
    dimension: entry("mm", 0),
    density: entry("kg/m3", 3),
    barometric: entry("kPa", 2),
    massFlow: entry("kg/s", 3),
  },
  IP: {
    pressure: entry("inH2O", 3),
    velocity: entry("fpm", 0),
    flow: entry("cfm", 0),
    temperature: entry("degF", 1),
    length: entry("ft", 1),
    dimension: entry("in", 1),
    density: entry("lb/ft3", 4),
    barometric: entry("inHg", 2),
    massFlow: entry("lb/min", 1),
  },
};

/** The unit system a user sees: their own choice, else the project's. */
export function unitSystemFor(user: { unitSystem: UnitSystem | null }, project: { unitSystem: UnitSystem }): UnitSystem {
  return user.unitSystem ?? project.unitSystem;
}

/** The display unit and decimals for a quantity in a unit system. */
export function displayUnit(system: UnitSystem, quantity: Quantity): DisplayUnit {
  return DISPLAY_UNITS[system][quantity];
}

/** An engine value (ENGINE_UNITS) in the system's display unit, unrounded. */
export function toDisplay(system: UnitSystem, quantity: Quantity, engineValue: number): number {
  return fromSi(quantity, engineValue, displayUnit(system, quantity).unit);
}

/** A value typed in the system's display unit, back in the engine unit. */
export function fromDisplay(system: UnitSystem, quantity: Quantity, displayValue: number): number {
  return toSi(quantity, displayValue, displayUnit(system, quantity).unit);
}

/**
 * An engine value formatted for display, e.g. formatQuantity("IP", "flow", 0.4719) → "1,000 cfm".
 * `decimals` overrides the table; `withUnit: false` leaves the symbol off (for table cells under a unit header).
 */
export function formatQuantity(
  system: UnitSystem,
  quantity: Quantity,
  engineValue: number,
  options: { decimals?: number; withUnit?: boolean } = {},
): string {
  const d = displayUnit(system, quantity);
  const text = numberText(toDisplay(system, quantity, engineValue), options.decimals ?? d.decimals);
  // "-0" reads as a sign error in a report; show plain zero.
  const clean = /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
  return options.withUnit === false ? clean : `${clean} ${d.symbol}`;
}
