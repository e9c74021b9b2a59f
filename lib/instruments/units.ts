/**
 * An instrument kind's values in the user's unit system: ranges and accuracy floors are stored in SI
 * (KIND_INFO measure) and typed and shown in the user's units. Floors are differences, so a
 * temperature floor converts without the 32 °F offset.
 */
import type { InstrumentKind } from "@/db/schema";
import { displayUnit, fromDisplay, toDisplay, type UnitSystem } from "@/lib/units";
import { KIND_INFO } from "./kinds";

export interface KindUnit {
  symbol: string;
  /** Decimals worth showing for this unit (the display table's, one more for small floors). */
  decimals: number;
  toDisplay(si: number, opts?: { delta?: boolean }): number;
  fromDisplay(shown: number, opts?: { delta?: boolean }): number;
}

const identity = (symbol: string): KindUnit => ({ symbol, decimals: 0, toDisplay: (v) => v, fromDisplay: (v) => v });

/** The unit a kind's range and floor are shown in, or null when the kind has none. */
export function kindUnit(kind: InstrumentKind, system: UnitSystem): KindUnit | null {
  const measure = KIND_INFO[kind].measure;
  if (measure === null) return null;
  if ("fixedUnit" in measure) return identity(measure.fixedUnit);
  const q = measure.quantity;
  const d = displayUnit(system, q);
  return {
    symbol: d.symbol,
    decimals: d.decimals,
    toDisplay: (si, opts) => (opts?.delta ? toDisplay(system, q, si) - toDisplay(system, q, 0) : toDisplay(system, q, si)),
    fromDisplay: (shown, opts) => (opts?.delta ? fromDisplay(system, q, shown) - fromDisplay(system, q, 0) : fromDisplay(system, q, shown)),
  };
}

/** "15 in. w.c.", "±0.3 °C": up to the unit's decimals plus two, trailing zeros dropped. */
export function formatKindValue(kind: InstrumentKind, si: number, system: UnitSystem, opts: { delta?: boolean } = {}): string {
  const unit = kindUnit(kind, system);
  if (!unit) return String(si);
  const shown = unit.toDisplay(si, opts);
  const text = new Intl.NumberFormat("en-US", { maximumFractionDigits: unit.decimals + 2 }).format(shown);
  return `${text} ${unit.symbol}`;
}

/** "−3,735 to 3,735 Pa", "up to 900 mm", or "—". */
export function formatRange(instrument: { kind: InstrumentKind; rangeMin: number | null; rangeMax: number | null }, system: UnitSystem): string {
  const { kind, rangeMin, rangeMax } = instrument;
  if (rangeMin === null && rangeMax === null) return "—";
  if (rangeMin === null || kind === "pitot_tube") return `up to ${formatKindValue(kind, rangeMax!, system)}`;
  if (rangeMax === null) return `from ${formatKindValue(kind, rangeMin, system)}`;
  const unit = kindUnit(kind, system)!;
  const min = new Intl.NumberFormat("en-US", { maximumFractionDigits: unit.decimals + 2 }).format(unit.toDisplay(rangeMin));
  return `${min} to ${formatKindValue(kind, rangeMax, system)}`;
}

/** "±1 % of reading ±1 Pa", "±0.3 °C, ±2 % RH", or "—". */
export function formatAccuracy(
  instrument: { kind: InstrumentKind; accuracyPct: number | null; accuracyFloor: number | null; humidityAccuracyPct: number | null },
  system: UnitSystem,
): string {
  const parts: string[] = [];
  if (instrument.accuracyPct !== null) parts.push(`±${instrument.accuracyPct} % of reading`);
  if (instrument.accuracyFloor !== null) parts.push(`±${formatKindValue(instrument.kind, instrument.accuracyFloor, system, { delta: true })}`);
  const main = parts.join(" ");
  const rh = instrument.humidityAccuracyPct !== null ? `±${instrument.humidityAccuracyPct} % RH` : "";
  return [main, rh].filter((s) => s !== "").join(", ") || "—";
}
