/**
 * The quantities of a design schedule and the units they are typed in. The API stores and speaks SI
 * (m³/s, mm, Pa, kg/m³, m, m², kW); forms take the user's unit system; a schedule file names its unit
 * in each column header. Conversions go through lib/units where it has the quantity; area and motor
 * power are not display quantities there, so their exact factors are given here (NIST SP 811, appendix B).
 */
import { convert, type UnitId } from "@/lib/units";
import type { UnitSystem } from "@/lib/units";

export type DesignQuantity = "flow" | "dimension" | "run" | "pressure" | "density" | "altitude" | "area" | "power";

export interface DesignUnit {
  /** Short id used in file headers, e.g. "cfm", "l_s", "in", "mm". */
  id: string;
  symbol: string;
  /** A value typed in this unit → the API's SI unit for the quantity. */
  toSi(value: number): number;
  /** The API's SI value → this unit. */
  fromSi(value: number): number;
}

export type DesignUnits = Readonly<Record<DesignQuantity, DesignUnit>>;

function viaLibrary(id: string, symbol: string, from: UnitId, si: UnitId): DesignUnit {
  return { id, symbol, toSi: (v) => convert(v, from, si), fromSi: (v) => convert(v, si, from) };
}
function scaled(id: string, symbol: string, siPerUnit: number): DesignUnit {
  return { id, symbol, toSi: (v) => v * siPerUnit, fromSi: (v) => v / siPerUnit };
}

// International foot 0.3048 m exactly, so 1 ft² = 0.092 903 04 m² and 1 in² = 0.000 645 16 m² (NIST SP 811 B.8).
const M2_PER_FT2 = 0.09290304;
const M2_PER_IN2 = 0.00064516;
// Horsepower (550 ft·lbf/s) = 745.699 9 W (NIST SP 811 B.8: 7.456 999 E+02 W).
const KW_PER_HP = 0.7456999;

/** Every unit a schedule may use, by quantity; the first of each list is the API's own. */
export const UNIT_CHOICES: Readonly<Record<DesignQuantity, readonly DesignUnit[]>> = {
  flow: [
    viaLibrary("m3_s", "m³/s", "m3/s", "m3/s"),
    viaLibrary("l_s", "L/s", "L/s", "m3/s"),
    viaLibrary("m3_h", "m³/h", "m3/h", "m3/s"),
    viaLibrary("cfm", "cfm", "cfm", "m3/s"),
  ],
  dimension: [viaLibrary("mm", "mm", "mm", "mm"), viaLibrary("in", "in.", "in", "mm")],
  run: [viaLibrary("mm", "mm", "mm", "mm"), viaLibrary("m", "m", "m", "mm"), viaLibrary("ft", "ft", "ft", "mm"), viaLibrary("in", "in.", "in", "mm")],
  pressure: [viaLibrary("pa", "Pa", "Pa", "Pa"), viaLibrary("in_wc", "in. w.c.", "inH2O", "Pa")],
  density: [viaLibrary("kg_m3", "kg/m³", "kg/m3", "kg/m3"), viaLibrary("lb_ft3", "lb/ft³", "lb/ft3", "kg/m3")],
  altitude: [viaLibrary("m", "m", "m", "m"), viaLibrary("ft", "ft", "ft", "m")],
  area: [scaled("m2", "m²", 1), scaled("ft2", "ft²", M2_PER_FT2), scaled("in2", "in²", M2_PER_IN2)],
  power: [scaled("kw", "kW", 1), scaled("hp", "hp", KW_PER_HP)],
};

function pick(quantity: DesignQuantity, id: string): DesignUnit {
  const unit = UNIT_CHOICES[quantity].find((u) => u.id === id);
  if (!unit) throw new Error(`No ${quantity} unit "${id}"`);
  return unit;
}

/** The API's own units: what the JSON carries and what its messages state. */
export const API_UNITS: DesignUnits = {
  flow: pick("flow", "m3_s"),
  dimension: pick("dimension", "mm"),
  run: pick("run", "mm"),
  pressure: pick("pressure", "pa"),
  density: pick("density", "kg_m3"),
  altitude: pick("altitude", "m"),
  area: pick("area", "m2"),
  power: pick("power", "kw"),
};

/** What a person types in each unit system (the trade's usual units for a schedule). */
export const FORM_UNITS: Readonly<Record<UnitSystem, DesignUnits>> = {
  SI: {
    flow: pick("flow", "l_s"),
    dimension: pick("dimension", "mm"),
    run: pick("run", "m"),
    pressure: pick("pressure", "pa"),
    density: pick("density", "kg_m3"),
    altitude: pick("altitude", "m"),
    area: pick("area", "m2"),
    power: pick("power", "kw"),
  },
  IP: {
    flow: pick("flow", "cfm"),
    dimension: pick("dimension", "in"),
    run: pick("run", "ft"),
    pressure: pick("pressure", "in_wc"),
    density: pick("density", "lb_ft3"),
    altitude: pick("altitude", "ft"),
    area: pick("area", "ft2"),
    power: pick("power", "hp"),
  },
};

export function findUnit(quantity: DesignQuantity, id: string): DesignUnit | undefined {
  return UNIT_CHOICES[quantity].find((u) => u.id === id);
}

const plain = new Map<number, Intl.NumberFormat>();
function numberFormat(maxDecimals: number): Intl.NumberFormat {
  let f = plain.get(maxDecimals);
  if (!f) {
    f = new Intl.NumberFormat("en-US", { maximumFractionDigits: maxDecimals });
    plain.set(maxDecimals, f);
  }
  return f;
}

/**
 * A number as a person would write it: at most `significant` significant digits, no trailing zeros,
 * thousands separated ("1,000", "0.075", "24"). Used in messages and for the values put into edit forms.
 */
export function tidyNumber(value: number, significant = 6, grouping = true): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return "0";
  const rounded = Number.parseFloat(value.toPrecision(significant));
  const decimals = Math.max(0, significant - 1 - Math.floor(Math.log10(Math.abs(rounded))));
  const text = grouping ? numberFormat(Math.min(decimals, 20)).format(rounded) : String(rounded);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** An SI value in a unit, tidied, with its symbol: "1,000 cfm". */
export function formatIn(unit: DesignUnit, siValue: number, significant = 6): string {
  return `${tidyNumber(unit.fromSi(siValue), significant)} ${unit.symbol}`;
}

/** The value to put into an input for editing (no grouping, so it parses back as typed). */
export function inputValue(unit: DesignUnit | undefined, siValue: number | null | undefined): string {
  if (siValue === null || siValue === undefined) return "";
  return tidyNumber(unit ? unit.fromSi(siValue) : siValue, 6, false);
}

/**
 * Parses a number as typed in a form or a schedule file: "1000", "1,000", "12.5", " 0.075 ".
 * A comma is taken as a thousands separator only in groups of three ("1,000.5"); "1,5" is refused
 * with a message, since a decimal comma would silently be read a thousand times too large.
 */
export function parseDecimal(text: string): { ok: true; value: number } | { ok: false; message: string } {
  const t = text.trim();
  if (t === "") return { ok: false, message: "empty" };
  if (/^[-+]?\d{1,3}(,\d{3})+(\.\d+)?$/.test(t)) return { ok: true, value: Number(t.replace(/,/g, "")) };
  if (/,/.test(t)) return { ok: false, message: `"${t}" is not a number: write decimals with a point (12.5) and thousands as 1000 or 1,000.` };
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return { ok: false, message: `"${t.slice(0, 40)}" is not a number.` };
  const value = Number(t);
  if (!Number.isFinite(value)) return { ok: false, message: `"${t.slice(0, 40)}" is out of range.` };
  return { ok: true, value };
}
