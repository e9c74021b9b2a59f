/**
 * Reducing point values (velocities) over a traverse plane to a plane mean.
 *
 * Every standard layout (equal-area, log-linear, log-Tchebycheff) prescribes equal weights for its
 * points: the plane mean is the mean of all points. When points could not be read, the method's own
 * weights are kept and each gap is filled from its counterpart, in this order:
 * - round ducts: the point at the same radius on the same diameter ("mirror"), else the mean of the
 *   points at the same radius on the other diameters ("same-radius"), else linear interpolation along
 *   the diameter between the nearest points read on both sides ("along-line");
 * - rectangular ducts: interpolation along the line ("along-line"), else across the lines at the same
 *   point index ("across-lines"), else the point mirrored about the centre of the line or of the width
 *   ("mirror"; the published positions are symmetric).
 * Only read values are used to fill, never other filled values. When some gap cannot be filled that
 * way (too many points missing), the plane falls back to tributary areas:
 * - "tributary-area": each point stands for the area nearer to it than to its neighbours along the
 *   same line. Round ducts: each radius (half-diameter) is split into annular bands whose boundaries lie
 *   midway in r² (midway by area) between neighbouring points, the outer band running to the wall; the
 *   band-weighted means of all radii are then averaged. Rectangular ducts: along each line the strip
 *   boundaries lie midway between neighbouring points (walls at the ends), then the lines are weighted
 *   the same way across the width. On a complete equal-area grid both rules give the same weights, but
 *   on log-linear and log-Tchebycheff grids tributary weights are not the method's (on the 1/7 law a full
 *   log-Tchebycheff 5 × 5 grid reads +1.4 % with them against −0.2 % with equal weights), so they are the
 *   last resort.
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

/** How a gap was filled (see the module comment). */
export type GapFillSource = "mirror" | "along-line" | "across-lines" | "same-radius";

export interface FilledPoint {
  line: number;
  point: number;
  /** The value used in place of the missing reading. */
  value: number;
  from: GapFillSource;
}

type Grid = readonly (readonly (number | null)[])[];

/** Linear interpolation at index i of a row between the nearest read values on both sides, by coordinate. */
function interpolate(values: readonly (number | null)[], coords: readonly number[], i: number): number | null {
  let lo = i - 1;
  while (lo >= 0 && values[lo] === null) lo--;
  let hi = i + 1;
  while (hi < values.length && values[hi] === null) hi++;
  if (lo < 0 || hi >= values.length) return null;
  const a = values[lo] as number;
  const b = values[hi] as number;
  const x0 = coords[lo] ?? 0;
  const x1 = coords[hi] ?? 0;
  return x1 === x0 ? (a + b) / 2 : a + ((b - a) * ((coords[i] ?? 0) - x0)) / (x1 - x0);
}

function fillRound(layout: Layout, values: Grid, k: number, i: number): FilledPoint | null {
  const row = values[k] ?? [];
  const n = row.length;
  const mirror = row[n - 1 - i];
  if (mirror !== null && mirror !== undefined) return { line: k, point: i, value: mirror, from: "mirror" };
  let sum = 0;
  let count = 0;
  values.forEach((other, kk) => {
    if (kk === k) return;
    for (const v of [other[i], other[n - 1 - i]]) {
      if (v !== null && v !== undefined) {
        sum += v;
        count++;
      }
    }
  });
  if (count > 0) return { line: k, point: i, value: sum / count, from: "same-radius" };
  const along = interpolate(row, (layout.lines[k]?.points ?? []).map((p) => p.positionM), i);
  return along !== null ? { line: k, point: i, value: along, from: "along-line" } : null;
}

function fillRect(layout: Layout, values: Grid, k: number, i: number): FilledPoint | null {
  const row = values[k] ?? [];
  const along = interpolate(row, (layout.lines[k]?.points ?? []).map((p) => p.positionM), i);
  if (along !== null) return { line: k, point: i, value: along, from: "along-line" };
  const column = values.map((r) => r[i] ?? null);
  const across = interpolate(column, layout.lines.map((l) => l.lineXM ?? 0), k);
  if (across !== null) return { line: k, point: i, value: across, from: "across-lines" };
  const m = values.length;
  const n = row.length;
  for (const v of [row[n - 1 - i], values[m - 1 - k]?.[i], values[m - 1 - k]?.[n - 1 - i]]) {
    if (v !== null && v !== undefined) return { line: k, point: i, value: v, from: "mirror" };
  }
  return null;
}

/**
 * Fills each missing value from its counterpart (see the module comment). Returns the filled grid and
 * what was filled, or null when some gap has no counterpart read.
 */
export function fillGaps(layout: Layout, values: Grid): { grid: number[][]; filled: FilledPoint[] } | null {
  const filled: FilledPoint[] = [];
  const grid: number[][] = [];
  for (let k = 0; k < values.length; k++) {
    const row = values[k] ?? [];
    const out: number[] = new Array<number>(row.length);
    for (let i = 0; i < row.length; i++) {
      const v = row[i];
      if (v !== null && v !== undefined) {
        out[i] = v;
        continue;
      }
      const fill = layout.duct.shape === "round" ? fillRound(layout, values, k, i) : fillRect(layout, values, k, i);
      if (fill === null) return null;
      filled.push(fill);
      out[i] = fill.value;
    }
    grid.push(out);
  }
  return { grid, filled };
}

/**
 * Plane mean by the layout's own equal weights. Missing points are filled from their counterparts
 * (`filled` says how); only when that is impossible does the mean fall back to tributary areas.
 */
export function planeMean(layout: Layout, values: Grid): { mean: number; rule: IntegrationRule; filled: FilledPoint[] } {
  if (values.length !== layout.lines.length || values.some((row, k) => row.length !== layout.lines[k]?.points.length))
    throw new RangeError(`values must be ${layout.lines.length} lines of ${layout.pointsPerLine}`);
  const complete = values.every((row) => row.every((v) => v !== null));
  if (complete) return { mean: standardGridMean(values as readonly (readonly number[])[]), rule: "equal-weight", filled: [] };
  if (values.every((row) => row.every((v) => v === null))) throw new RangeError("planeMean needs at least one value");
  const gaps = fillGaps(layout, values);
  if (gaps) return { mean: standardGridMean(gaps.grid), rule: "equal-weight", filled: gaps.filled };
  return { mean: tributaryAreaMean(layout, values), rule: "tributary-area", filled: [] };
}

/** Power-law exponent of the reference turbulent profile (the 1/7 law). */
const REFERENCE_PROFILE_N = 7;

/**
 * Signed error of the layout (and of any gap filling) on the 1/7 power-law profile, as a fraction of the
 * exact mean, with each point evaluated where the probe actually reads it (readXM, readYM).
 * Round: u/u_max = (1 − r/R)^(1/n), exact mean 2n²/((n+1)(2n+1)). Rectangular: the product of the
 * same law across each side, u/u_max = (2s)^(1/n)·(2t)^(1/n) with s, t distances to the nearer wall
 * as fractions of the side, exact mean (n/(n+1))². Used as the layout term of the uncertainty.
 */
export function powerLawLayoutError(layout: Layout, read?: readonly (readonly boolean[])[]): number {
  return layoutErrorOnDevelopedProfile(layout, developedProfileGrid(layout), read);
}

const profileOf = new WeakMap<Layout, { grid: number[][]; completeError: number }>();

/**
 * developedProfileGrid and the complete layout's powerLawLayoutError, computed once per layout object
 * (layouts from layoutFor are shared and frozen, so each is worked out once however often it is reduced).
 * The grid returned must not be changed.
 */
export function developedProfileOf(layout: Layout): { grid: readonly (readonly number[])[]; completeError: number } {
  let entry = profileOf.get(layout);
  if (!entry) {
    const grid = developedProfileGrid(layout);
    entry = { grid, completeError: layoutErrorOnDevelopedProfile(layout, grid) };
    profileOf.set(layout, entry);
  }
  return entry;
}

/**
 * developedProfile at every point's read position, line by line. The layouts' structure is used to
 * take few powers: on a round duct the read positions repeat from diameter to diameter, and on a
 * rectangular duct the product law factors into one term per line and one per point.
 */
export function developedProfileGrid(layout: Layout): number[][] {
  const { duct } = layout;
  const n = REFERENCE_PROFILE_N;
  if (duct.shape === "round") {
    const cache = new Map<number, number>();
    return layout.lines.map((line) =>
      line.points.map((p) => {
        let v = cache.get(p.readPositionM);
        if (v === undefined) {
          v = developedProfile(duct, p.readXM, p.readYM);
          cache.set(p.readPositionM, v);
        }
        return v;
      }),
    );
  }
  const side = (c: number, span: number) => Math.max(0, (2 * Math.min(c, span - c)) / span) ** (1 / n);
  const down = (layout.lines[0]?.points ?? []).map((p) => side(p.readYM, duct.heightM));
  return layout.lines.map((line) => {
    const across = side(line.points[0]?.readXM ?? 0, duct.widthM);
    return line.points.map((_, i) => across * (down[i] ?? 0));
  });
}

/**
 * powerLawLayoutError from the developed profile already evaluated at every point's read position
 * (`profile[line][point]`, as developedProfile gives it), so a caller that needs those values too
 * computes them once.
 */
export function layoutErrorOnDevelopedProfile(layout: Layout, profile: readonly (readonly number[])[], read?: readonly (readonly boolean[])[]): number {
  const n = REFERENCE_PROFILE_N;
  const values = read ? profile.map((row, k) => row.map((v, i) => (read[k]?.[i] === false ? null : v))) : profile;
  const exact = layout.duct.shape === "round" ? (2 * n * n) / ((n + 1) * (2 * n + 1)) : (n / (n + 1)) ** 2;
  return planeMean(layout, values).mean / exact - 1;
}

/**
 * The fully developed reference profile (1/7 power law, relative to its maximum) at a point given in the
 * layout's frame: round from the centre, rectangular from the left and top walls.
 */
export function developedProfile(duct: Duct, xM: number, yM: number): number {
  const n = REFERENCE_PROFILE_N;
  if (duct.shape === "round") {
    const r = Math.min(1, Math.hypot(xM, yM) / (duct.diameterM / 2));
    return (1 - r) ** (1 / n);
  }
  const s = Math.min(xM, duct.widthM - xM) / duct.widthM;
  const t = Math.min(yM, duct.heightM - yM) / duct.heightM;
  return Math.max(0, 2 * s) ** (1 / n) * Math.max(0, 2 * t) ** (1 / n);
}
