/**
 * Readings that may be typing or probe errors, flagged in their cell in words (never dropped, never
 * changed): below zero, far from the points beside them, or beyond the instrument's range. Pure; the
 * grid is in SI (Pa or m/s) as stored.
 */
import type { Grid } from "./engine-input";

export type FlagKind = "negative" | "far-from-neighbours" | "beyond-range";

export interface CellFlag {
  kind: FlagKind;
  /** A few words for the cell, e.g. "Below zero". */
  short: string;
  /** One sentence for the cell's description. */
  message: string;
}

/**
 * A point whose velocity is more than this many times the median of its neighbours', or less than its
 * reciprocal, is flagged (common practice: a developed profile changes by well under 2× from one
 * traverse point to the next; 2.5× leaves room for wall points and distorted planes).
 */
export const NEIGHBOUR_RATIO = 2.5;

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 === 1 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

export interface PlausibilityOptions {
  /** "pressure": Pa from a pitot tube (compared as velocities, ∝ √Pv); "velocity": m/s. */
  kind: "pressure" | "velocity";
  /** The reading instrument's range in the same unit, when the register has it. */
  rangeMin?: number | null;
  rangeMax?: number | null;
  /** Formats a reading for messages (the user's units). */
  format?: (value: number) => string;
}

/** Flags per cell, keyed "line:point" (0-based); cells without a flag are absent. */
export function plausibilityFlags(grid: Grid, options: PlausibilityOptions): Map<string, CellFlag[]> {
  const fmt = options.format ?? ((v: number) => String(v));
  const speed = (v: number) => (options.kind === "pressure" ? Math.sqrt(Math.max(v, 0)) : Math.max(v, 0));
  const out = new Map<string, CellFlag[]>();
  const add = (k: number, i: number, flag: CellFlag) => {
    const key = `${k}:${i}`;
    out.set(key, [...(out.get(key) ?? []), flag]);
  };
  grid.forEach((row, k) =>
    row.forEach((v, i) => {
      if (v === null) return;
      if (v < 0) add(k, i, { kind: "negative", short: "Below zero", message: `${fmt(v)} is below zero: reverse flow here, or the tubes are connected the wrong way round.` });
      if (options.rangeMax != null && v > options.rangeMax)
        add(k, i, { kind: "beyond-range", short: "Over range", message: `${fmt(v)} is above the instrument's range (up to ${fmt(options.rangeMax)}): check the reading.` });
      else if (options.rangeMin != null && v < options.rangeMin && v >= 0)
        add(k, i, { kind: "beyond-range", short: "Under range", message: `${fmt(v)} is below the instrument's range (from ${fmt(options.rangeMin)}): the instrument cannot read it reliably.` });
      // Neighbours along the line and across to the same point of the other lines.
      const near: number[] = [];
      for (const [a, b] of [[k, i - 1], [k, i + 1], [k - 1, i], [k + 1, i]] as const) {
        const n = grid[a]?.[b];
        if (n !== null && n !== undefined && n > 0) near.push(speed(n));
      }
      if (near.length < 2 || v <= 0) return;
      const m = median(near);
      const s = speed(v);
      if (m > 0 && (s > NEIGHBOUR_RATIO * m || s < m / NEIGHBOUR_RATIO)) {
        const ratio = s > m ? s / m : m / s;
        add(k, i, {
          kind: "far-from-neighbours",
          short: s > m ? "Much higher than beside it" : "Much lower than beside it",
          message: `${fmt(v)} gives a velocity ${ratio.toFixed(1)} × ${s > m ? "above" : "below"} the points beside it: check for a typing slip or a blocked probe.`,
        });
      }
    }),
  );
  return out;
}
