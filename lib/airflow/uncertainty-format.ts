/**
 * How an expanded uncertainty is shown (see uncertainty.ts for how it is worked out), on its own so a
 * screen that only shows results does not load the calculation with it.
 */

/** Coverage factor of every reported uncertainty: k = 2, about 95 % for a near-normal result (GUM §6.2.1, §6.3.3). */
export const COVERAGE_FACTOR = 2;

/**
 * An expanded uncertainty as screens and reports show it: "± 6.1 % (k = 2, about 95 %)".
 * `relative` is the expanded uncertainty as a fraction (0.061). Not finite → says it cannot be given.
 */
export function formatExpandedUncertainty(relative: number, options: { digits?: number; coverageFactor?: number } = {}): string {
  const k = options.coverageFactor ?? COVERAGE_FACTOR;
  const coverage = k === 2 ? "about 95 %" : `k = ${k}`;
  if (!Number.isFinite(relative)) return `not determinable (k = ${k}, ${coverage})`;
  const digits = options.digits ?? 1;
  return `± ${(relative * 100).toFixed(digits)} % (k = ${k}${k === 2 ? `, ${coverage}` : ""})`;
}
