/**
 * Reducing point values (velocities) over a traverse plane to a plane mean.
 *
 * Two rules:
 * - "equal-weight": the mean of all points, which is what every standard layout (equal-area,
 *   log-linear, log-Tchebycheff) prescribes for a complete grid;
 * - "tributary-area": each point stands for the area nearer to it than to its neighbours along the
 *   same line, used when readings are missing. Round ducts: each radius (half-diameter) is split into
 *   annular bands whose boundaries lie midway in r² (midway by area) between neighbouring points, the
 *   outer band running to the wall; the band-weighted means of all radii are then averaged.
 *   Rectangular ducts: along each line the strip boundaries lie midway between neighbouring points
 *   (walls at the ends), then the lines are weighted the same way across the width.
 *   On a complete equal-area grid both rules give the same weights.
 */
import type { Duct, Layout, LayoutPoint } from "./layout";

export type IntegrationRule = "equal-weight" | "tributary-area";

/** Equal-weight mean of every value on a complete standard grid. */
export function standardGridMean(values: readonly (readonly number[])[]): number {
  let sum = 0;
  let count = 0;
  for (const line of values) {
    for (const v of line) {
      sum += v;
      count++;
    }
  }
  if (count === 0) throw new RangeError("standardGridMean needs at least one value");
  return sum / count;
}

/** Weights (summing to 1) of sorted coordinates on [0, span] with boundaries midway between neighbours. */
function stripWeights(coords: readonly number[], span: number): number[] {
  return coords.map((c, i) => {
    const lo = i === 0 ? 0 : (c + (coords[i - 1] ?? 0)) / 2;
    const hi = i === coords.length - 1 ? span : (c + (coords[i + 1] ?? span)) / 2;
    return (hi - lo) / span;
  });
}

interface Sample { point: LayoutPoint; value: number }

function roundTributaryMean(duct: Extract<Duct, { shape: "round" }>, lines: Sample[][]): number {
  const radiusM = duct.diameterM / 2;
  const sideMeans: number[] = [];
  for (const line of lines) {
    // Port side: positions up to the centre; far side: beyond it. Radii are distances from the centre.
    const sides = [
      line.filter((s) => s.point.positionM <= radiusM).map((s) => ({ r: radiusM - s.point.positionM, v: s.value })),
      line.filter((s) => s.point.positionM > radiusM).map((s) => ({ r: s.point.positionM - radiusM, v: s.value })),
    ];
    for (const side of sides) {
      if (side.length === 0) continue;
      side.sort((a, b) => a.r - b.r);
      // Weights are band areas, so the coordinate is r² on [0, R²].
      const w = stripWeights(side.map((s) => s.r * s.r), radiusM * radiusM);
      sideMeans.push(side.reduce((acc, s, i) => acc + s.v * (w[i] ?? 0), 0));
    }
  }
  return sideMeans.reduce((a, b) => a + b, 0) / sideMeans.length;
}

function rectTributaryMean(duct: Extract<Duct, { shape: "rectangular" }>, lines: Sample[][]): number {
  const lineMeans = lines
    .filter((line) => line.length > 0)
    .map((line) => {
      const sorted = [...line].sort((a, b) => a.point.yM - b.point.yM);
      const w = stripWeights(sorted.map((s) => s.point.yM), duct.heightM);
      return { x: sorted[0]?.point.xM ?? 0, mean: sorted.reduce((acc, s, i) => acc + s.value * (w[i] ?? 0), 0) };
    })
    .sort((a, b) => a.x - b.x);
  const w = stripWeights(lineMeans.map((l) => l.x), duct.widthM);
  return lineMeans.reduce((acc, l, i) => acc + l.mean * (w[i] ?? 0), 0);
}

/**
 * Tributary-area mean of values taken at the layout's points; `null` marks a point not read.
 * Throws RangeError when no point was read or the shape of `values` does not match the layout.
 */
export function tributaryAreaMean(layout: Layout, values: readonly (readonly (number | null)[])[]): number {
  if (values.length !== layout.lines.length) throw new RangeError(`expected ${layout.lines.length} lines of values, got ${values.length}`);
  const lines: Sample[][] = layout.lines.map((line, k) => {
    const row = values[k] ?? [];
    if (row.length !== line.points.length) throw new RangeError(`line ${k}: expected ${line.points.length} values, got ${row.length}`);
    const samples: Sample[] = [];
    line.points.forEach((point, p) => {
      const value = row[p];
      if (value !== null && value !== undefined) samples.push({ point, value });
    });
    return samples;
  });
  if (lines.every((l) => l.length === 0)) throw new RangeError("tributaryAreaMean needs at least one value");
  return layout.duct.shape === "round" ? roundTributaryMean(layout.duct, lines) : rectTributaryMean(layout.duct, lines);
}

/** Plane mean by the layout's own equal weights when every point was read, else by tributary areas. */
export function planeMean(layout: Layout, values: readonly (readonly (number | null)[])[]): { mean: number; rule: IntegrationRule } {
  const complete = values.length === layout.lines.length && values.every((row, k) => row.length === layout.lines[k]?.points.length && row.every((v) => v !== null));
  if (complete) return { mean: standardGridMean(values as readonly (readonly number[])[]), rule: "equal-weight" };
  return { mean: tributaryAreaMean(layout, values), rule: "tributary-area" };
}

/** Power-law exponent of the reference turbulent profile (the 1/7 law). */
const REFERENCE_PROFILE_N = 7;

/**
 * Signed error of the layout (and rule) on the 1/7 power-law profile, as a fraction of the exact mean.
 * Round: u/u_max = (1 − r/R)^(1/n), exact mean 2n²/((n+1)(2n+1)). Rectangular: the product of the
 * same law across each side, u/u_max = (2s)^(1/n)·(2t)^(1/n) with s, t distances to the nearer wall
 * as fractions of the side, exact mean (n/(n+1))². Used as the layout term of the uncertainty.
 */
export function powerLawLayoutError(layout: Layout, read?: readonly (readonly boolean[])[]): number {
  const n = REFERENCE_PROFILE_N;
  const { duct } = layout;
  const profile = (p: LayoutPoint): number => {
    if (duct.shape === "round") {
      const r = Math.min(1, Math.hypot(p.xM, p.yM) / (duct.diameterM / 2));
      return (1 - r) ** (1 / n);
    }
    const s = Math.min(p.xM, duct.widthM - p.xM) / duct.widthM;
    const t = Math.min(p.yM, duct.heightM - p.yM) / duct.heightM;
    return Math.max(0, 2 * s) ** (1 / n) * Math.max(0, 2 * t) ** (1 / n);
  };
  const values = layout.lines.map((line, k) => line.points.map((p, i) => (read && read[k]?.[i] === false ? null : profile(p))));
  const exact = duct.shape === "round" ? (2 * n * n) / ((n + 1) * (2 * n + 1)) : (n / (n + 1)) ** 2;
  return planeMean(layout, values).mean / exact - 1;
}
