/** A measured figure of `npm run bench`: the median of repeated runs, its spread, and its budget. */
export interface Figure {
  section: "engine" | "report" | "pages" | "browser" | "api";
  name: string;
  unit: string;
  median: number;
  min: number;
  max: number;
  runs: number;
  /** The budget, when the figure has one: at most or at least this value. */
  budget?: { atMost?: number; atLeast?: number };
  /** Whether the budget holds (null: no budget). */
  ok: boolean | null;
}

export function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/** A figure from repeated measurements, judged against its budget by the median. */
export function figure(section: Figure["section"], name: string, unit: string, values: readonly number[], budget?: Figure["budget"]): Figure {
  if (values.length === 0) throw new Error(`${name}: no measurement`);
  const m = median(values);
  const ok = budget ? (budget.atMost === undefined || m <= budget.atMost) && (budget.atLeast === undefined || m >= budget.atLeast) : null;
  return { section, name, unit, median: m, min: Math.min(...values), max: Math.max(...values), runs: values.length, budget, ok };
}
