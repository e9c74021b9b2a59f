/**
 * Traverse point layouts for round and rectangular ducts.
 *
 * Lengths are metres inside the engine. Positions are measured along each traverse line from the
 * wall the probe enters through ("port wall"); insertion depth adds the port/insulation offset.
 */

export type Duct = { shape: "round"; diameterM: number } | { shape: "rectangular"; widthM: number; heightM: number };

/** Methods offered. For rectangular ducts "log-linear" means the log-Tchebycheff rule. */
export type LayoutMethod = "equal-area" | "log-linear";

export interface LayoutRequest {
  duct: Duct;
  method: LayoutMethod;
  /** Round: diameters traversed. Rectangular: lines (ports) across the width. Omitted → recommended. */
  lines?: number;
  /** Points on each line. Omitted → recommended. */
  pointsPerLine?: number;
  /** Straight duct upstream / downstream of the plane, used to judge the plane and add points. */
  straightUpstreamM?: number;
  straightDownstreamM?: number;
  /** Added to every insertion depth: port nipple, insulation and liner thickness. */
  portOffsetM?: number;
  /**
   * Outside diameter of the probe head (the sensing tip), m. Its centre cannot come nearer a wall than
   * half of it; points nearer are flagged and read at that distance. Default DEFAULT_PROBE_HEAD_DIAMETER_M.
   */
  probeHeadDiameterM?: number;
}

export interface LayoutPoint {
  line: number;
  point: number;
  /** Round: from the duct centre (line 0 enters from the top, +y up). Rectangular: from the left wall. */
  xM: number;
  /** Round: from the duct centre. Rectangular: from the top wall (the port face). */
  yM: number;
  /**
   * Distance from the port wall along the line: the method's published position (for equal-area layouts
   * after the US EPA Method 1 move off the wall, see `moved`).
   */
  positionM: number;
  /** Probe insertion depth for the reading: readPositionM plus the port offset. */
  depthM: number;
  /** True when an equal-area position was too close to a wall and was moved out (US EPA Method 1). */
  moved: boolean;
  /**
   * Where the probe actually reads along the line: positionM, or the nearest position the probe head can
   * reach (half its diameter from the wall) when positionM is closer to a wall than that.
   */
  readPositionM: number;
  /** Coordinates of the read position, in the same frame as xM and yM. */
  readXM: number;
  readYM: number;
  /** True when the published position lies closer to a wall than the probe head can reach. */
  beyondProbeReach: boolean;
}

export interface LayoutLine {
  /** Round: angle of the port from +x, counter-clockwise, degrees. Rectangular: null. */
  angleDeg: number | null;
  /** Rectangular: distance of the line from the left wall. Round: null. */
  lineXM: number | null;
  points: LayoutPoint[];
}

export interface Layout {
  method: LayoutMethod;
  /** The named rule behind the positions. */
  rule: "equal-area" | "log-linear" | "log-Tchebycheff";
  duct: Duct;
  lines: LayoutLine[];
  lineCount: number;
  pointsPerLine: number;
  recommended: { lines: number; pointsPerLine: number };
  /**
   * Equal-area layouts: points nearer a wall than this were moved out to it (US EPA Method 1, its own rule
   * for its equal-area method). 0 for log-linear and log-Tchebycheff layouts, which keep their published
   * positions (their wall points are placed by the log law on purpose).
   */
  wallMinimumM: number;
  /** Probe head diameter used to judge reach, m, and the nearest a reading can be to a wall (half of it). */
  probeHeadDiameterM: number;
  probeReachM: number;
  /** Points whose published position the probe head cannot reach (read at probeReachM instead). */
  beyondReachCount: number;
  /** When some points are beyond reach: the nearest counts of the same method whose points are all reachable, or null if none. */
  reachableCounts: { lines: number; pointsPerLine: number } | null;
  reason: string;
  warnings: string[];
}

/** Log-linear y/D from the wall, round ducts. ISO 5802:2001 Tables 2–3 (6, 8); ISO 3966 / ASHRAE Handbook (10). */
const LOG_LINEAR_ROUND: Readonly<Record<number, readonly number[]>> = {
  6: [0.032, 0.135, 0.321, 0.679, 0.865, 0.968],
  8: [0.021, 0.117, 0.184, 0.345, 0.655, 0.816, 0.883, 0.979],
  10: [0.019, 0.076, 0.153, 0.217, 0.361, 0.639, 0.783, 0.847, 0.924, 0.981],
};

/** Log-Tchebycheff fractions of a side, rectangular ducts. ASHRAE Handbook Fundamentals, measurement chapter. */
const LOG_TCHEBYCHEFF_RECT: Readonly<Record<number, readonly number[]>> = {
  5: [0.074, 0.288, 0.5, 0.712, 0.926],
  6: [0.061, 0.235, 0.437, 0.563, 0.765, 0.939],
  7: [0.053, 0.203, 0.366, 0.5, 0.634, 0.797, 0.947],
};

export const LOG_LINEAR_ROUND_COUNTS = [6, 8, 10] as const;
export const LOG_TCHEBYCHEFF_COUNTS = [5, 6, 7] as const;
/** Upper bounds Airtally lays out; beyond them a traverse is better split into sections. */
export const MAX_ROUND_LINES = 6;
export const MAX_EQUAL_AREA_POINTS = 100;

/**
 * Outside diameter of a standard pitot-static tube head, 8 mm (5/16 in; common practice). Its centre can
 * come no nearer a wall than half of that.
 */
export const DEFAULT_PROBE_HEAD_DIAMETER_M = 0.008;

/** US EPA Method 1 (40 CFR 60 App. A-1, §11.3.2): equal-area points nearer the wall than this are moved out. */
const EPA_WALL_MIN_SMALL_M = 0.013;
const EPA_WALL_MIN_LARGE_M = 0.025;
const EPA_LARGE_DUCT_M = 0.61;
/** Straight-run judgement in equivalent diameters: 7.5 D / 2 D wanted (common practice), 2 D / 0.5 D minimum (US EPA Method 1). */
const GOOD_UPSTREAM_D = 7.5;
const GOOD_DOWNSTREAM_D = 2;
const MIN_UPSTREAM_D = 2;
const MIN_DOWNSTREAM_D = 0.5;
/** Equal-area rectangular: element spacing at most 150 mm and at least 25 points (TAB practice); 25 mm is our practical floor. */
const EQUAL_AREA_MAX_SPACING_M = 0.15;
const EQUAL_AREA_MIN_SPACING_M = 0.025;
const MIN_RECT_POINTS = 25;

/** Equivalent (hydraulic) diameter 4A/P in metres; the diameter for round ducts. */
export function equivalentDiameterM(duct: Duct): number {
  return duct.shape === "round" ? duct.diameterM : (2 * duct.widthM * duct.heightM) / (duct.widthM + duct.heightM);
}

/** Inside cross-sectional area in m². */
export function ductAreaM2(duct: Duct): number {
  return duct.shape === "round" ? (Math.PI * duct.diameterM ** 2) / 4 : duct.widthM * duct.heightM;
}

/** Equal-area round positions as y/D from the wall: centroids (by area) of m = n/2 equal annuli. */
export function equalAreaRoundFractions(pointsPerDiameter: number): number[] {
  const m = pointsPerDiameter / 2;
  const near: number[] = [];
  for (let j = m; j >= 1; j--) near.push((1 - Math.sqrt((2 * j - 1) / (2 * m))) / 2);
  return [...near, ...[...near].reverse().map((f) => 1 - f)];
}

/** Equal-area rectangular positions as fractions of the side: centres of n equal strips. */
export function equalAreaRectFractions(count: number): number[] {
  return Array.from({ length: count }, (_, i) => (2 * i + 1) / (2 * count));
}

/** Whether `pointsPerLine` × `lines` is a layout Airtally can build for this shape and method; returns a reason when not. */
export function layoutCountProblem(
  shape: Duct["shape"],
  method: LayoutMethod,
  counts: { lines?: number; pointsPerLine?: number },
): { field: "lines" | "points_per_line"; message: string } | null {
  const { lines, pointsPerLine: n } = counts;
  if (shape === "round") {
    if (lines !== undefined && (!Number.isInteger(lines) || lines < 1 || lines > MAX_ROUND_LINES))
      return { field: "lines", message: `must be a whole number of diameters from 1 to ${MAX_ROUND_LINES}; got ${lines}` };
    if (n === undefined) return null;
    if (method === "log-linear" && !(LOG_LINEAR_ROUND_COUNTS as readonly number[]).includes(n))
      return { field: "points_per_line", message: `log-linear round layouts have 6, 8 or 10 points per diameter; got ${n}` };
    if (method === "equal-area" && (!Number.isInteger(n) || n < 2 || n % 2 !== 0 || n > MAX_EQUAL_AREA_POINTS))
      return { field: "points_per_line", message: `equal-area round layouts need an even number of points per diameter from 2 to ${MAX_EQUAL_AREA_POINTS}; got ${n}` };
    return null;
  }
  for (const [field, value] of [["lines", lines], ["points_per_line", n]] as const) {
    if (value === undefined) continue;
    if (method === "log-linear" && !(LOG_TCHEBYCHEFF_COUNTS as readonly number[]).includes(value))
      return { field, message: `log-Tchebycheff rectangular layouts have 5, 6 or 7 ${field === "lines" ? "lines" : "points per line"}; got ${value}` };
    if (method === "equal-area" && (!Number.isInteger(value) || value < 2 || value > MAX_EQUAL_AREA_POINTS))
      return { field, message: `equal-area rectangular layouts need a whole number from 2 to ${MAX_EQUAL_AREA_POINTS}; got ${value}` };
  }
  return null;
}

/** Side-length rule for log-Tchebycheff (ASHRAE): < 762 mm → 5, 762–914 mm → 6, > 914 mm → 7. */
function logTchebycheffCount(sideM: number): number {
  if (sideM < 0.762) return 5;
  return sideM <= 0.914 ? 6 : 7;
}

interface Recommendation { lines: number; pointsPerLine: number; reasons: string[]; warnings: string[] }


/** Straight duct at the plane: not given, enough, short (under 7.5 D / 2 D) or unsuitable (under 2 D / 0.5 D). */
export type StraightRunClass = "unknown" | "good" | "short" | "unsuitable";

function judgeStraightRun(req: Pick<LayoutRequest, "duct" | "straightUpstreamM" | "straightDownstreamM">): { short: boolean; unsuitable: boolean; reasons: string[]; warnings: string[] } {
  const d = equivalentDiameterM(req.duct);
  const reasons: string[] = [];
  const warnings: string[] = [];
  let short = false;
  let unsuitable = false;
  const runs = [
    ["upstream", req.straightUpstreamM, GOOD_UPSTREAM_D, MIN_UPSTREAM_D],
    ["downstream", req.straightDownstreamM, GOOD_DOWNSTREAM_D, MIN_DOWNSTREAM_D],
  ] as const;
  for (const [side, runM, good, min] of runs) {
    if (runM === undefined) continue;
    const diameters = runM / d;
    const shown = diameters.toFixed(1);
    if (diameters < min) {
      short = true;
      unsuitable = true;
      warnings.push(`Only ${shown} diameters of straight duct ${side} (under ${min} D): the plane is unsuitable for a traverse; move it if at all possible.`);
    } else if (diameters < good) {
      short = true;
      warnings.push(`Only ${shown} diameters of straight duct ${side} (under ${good} D wanted): points were added; expect a distorted profile.`);
    }
    if (diameters < good) reasons.push(`${shown} D straight ${side} is short, so more points`);
  }
  return { short, unsuitable, reasons, warnings };
}

/** How the straight run given in the request judges the plane (see StraightRunClass). */
export function straightRunClass(req: Pick<LayoutRequest, "duct" | "straightUpstreamM" | "straightDownstreamM">): StraightRunClass {
  if (req.straightUpstreamM === undefined && req.straightDownstreamM === undefined) return "unknown";
  const run = judgeStraightRun(req);
  return run.unsuitable ? "unsuitable" : run.short ? "short" : "good";
}

function recommend(req: LayoutRequest): Recommendation {
  const run = judgeStraightRun(req);
  const { duct, method } = req;
  const reasons: string[] = [];
  if (duct.shape === "round") {
    const dMm = Math.round(duct.diameterM * 1000);
    // ASHRAE Handbook rule: 6 points per diameter up to 250 mm, 8 or 10 above; we take 10 above 600 mm.
    const tiers = method === "log-linear" ? [6, 8, 10] : [6, 8, 10, 12];
    let tier = duct.diameterM <= 0.25 ? 0 : duct.diameterM <= 0.6 ? 1 : 2;
    reasons.push(`${dMm} mm round: ${tiers[tier]} points per diameter (6 up to 250 mm, 8 up to 600 mm, 10 above)`);
    let lines = 2;
    if (duct.diameterM > 1.2) {
      lines = 3;
      reasons.push("3 diameters at 60° on a duct over 1200 mm");
    } else reasons.push("2 diameters at 90°");
    if (run.short) {
      tier = Math.min(tier + 1, tiers.length - 1);
      lines = 3;
    }
    return { lines, pointsPerLine: tiers[tier] ?? 10, reasons: [...reasons, ...run.reasons], warnings: run.warnings };
  }
  const wMm = Math.round(duct.widthM * 1000);
  const hMm = Math.round(duct.heightM * 1000);
  if (method === "log-linear") {
    let lines = logTchebycheffCount(duct.widthM);
    let points = logTchebycheffCount(duct.heightM);
    reasons.push(`${wMm} × ${hMm} mm: ${lines} lines across the width and ${points} points per line (side < 762 mm → 5, 762–914 mm → 6, over 914 mm → 7)`);
    if (run.short) {
      lines = Math.min(lines + 1, 7);
      points = Math.min(points + 1, 7);
    }
    return { lines, pointsPerLine: points, reasons: [...reasons, ...run.reasons], warnings: run.warnings };
  }
  const cap = (sideM: number) => Math.max(2, Math.min(MAX_EQUAL_AREA_POINTS, Math.floor(sideM / EQUAL_AREA_MIN_SPACING_M)));
  let lines = Math.max(2, Math.ceil(duct.widthM / EQUAL_AREA_MAX_SPACING_M));
  let points = Math.max(2, Math.ceil(duct.heightM / EQUAL_AREA_MAX_SPACING_M));
  // Grow the coarser direction until 25 points, keeping elements near square and no closer than 25 mm.
  while (lines * points < MIN_RECT_POINTS) {
    const growLines = duct.widthM / lines >= duct.heightM / points;
    if (growLines && lines < cap(duct.widthM)) lines++;
    else if (!growLines && points < cap(duct.heightM)) points++;
    else if (lines < cap(duct.widthM)) lines++;
    else if (points < cap(duct.heightM)) points++;
    else break;
  }
  reasons.push(`${wMm} × ${hMm} mm: ${lines} × ${points} equal areas (spacing at most 150 mm, at least 25 points where practical)`);
  if (run.short) {
    lines = Math.min(Math.ceil(lines * 1.5), cap(duct.widthM));
    points = Math.min(Math.ceil(points * 1.5), cap(duct.heightM));
  }
  return { lines, pointsPerLine: points, reasons: [...reasons, ...run.reasons], warnings: run.warnings };
}

/** Keeps a position at least `minM` from both walls of a span of `spanM`. */
function clampToWalls(posM: number, spanM: number, minM: number): { value: number; moved: boolean } {
  const lo = Math.min(minM, spanM / 2);
  const value = Math.min(Math.max(posM, lo), spanM - lo);
  return { value, moved: Math.abs(value - posM) > 1e-12 };
}

/** Fractions of the span along each line (and, rectangular, across the width) for a method and counts. */
function fractionsFor(duct: Duct, method: LayoutMethod, lineCount: number, n: number): { across: readonly number[]; down: readonly number[] } {
  if (duct.shape === "round") return { across: [], down: method === "log-linear" ? (LOG_LINEAR_ROUND[n] ?? []) : equalAreaRoundFractions(n) };
  return {
    across: method === "log-linear" ? (LOG_TCHEBYCHEFF_RECT[lineCount] ?? []) : equalAreaRectFractions(lineCount),
    down: method === "log-linear" ? (LOG_TCHEBYCHEFF_RECT[n] ?? []) : equalAreaRectFractions(n),
  };
}

/** Whether every point of a fraction set is at least `reachM` from both walls of `spanM`, after any EPA move. */
function allReachable(fractions: readonly number[], spanM: number, wallMinimumM: number, reachM: number): boolean {
  return fractions.every((f) => {
    const pos = clampToWalls(f * spanM, spanM, wallMinimumM).value;
    return Math.min(pos, spanM - pos) >= reachM - 1e-12;
  });
}

/** The counts of the same method nearest to the given ones whose points the probe can all reach, or null. */
function reachableCounts(duct: Duct, method: LayoutMethod, lineCount: number, n: number, wallMinimumM: number, reachM: number): { lines: number; pointsPerLine: number } | null {
  const candidates = (given: number, options: readonly number[]) => [...options].sort((a, b) => Math.abs(a - given) - Math.abs(b - given) || a - b);
  if (duct.shape === "round") {
    const options = method === "log-linear" ? LOG_LINEAR_ROUND_COUNTS : Array.from({ length: MAX_EQUAL_AREA_POINTS / 2 }, (_, i) => 2 * (i + 1));
    for (const c of candidates(n, options)) if (allReachable(fractionsFor(duct, method, lineCount, c).down, duct.diameterM, wallMinimumM, reachM)) return { lines: lineCount, pointsPerLine: c };
    return null;
  }
  const options = method === "log-linear" ? LOG_TCHEBYCHEFF_COUNTS : Array.from({ length: MAX_EQUAL_AREA_POINTS - 1 }, (_, i) => i + 2);
  const pick = (given: number, spanM: number, of: "across" | "down") =>
    candidates(given, options).find((c) => allReachable(of === "across" ? fractionsFor(duct, method, c, 2).across : fractionsFor(duct, method, 2, c).down, spanM, wallMinimumM, reachM));
  const lines = pick(lineCount, duct.widthM, "across");
  const points = pick(n, duct.heightM, "down");
  return lines !== undefined && points !== undefined ? { lines, pointsPerLine: points } : null;
}

/** Recommended line and point counts for a duct and method, with the reasons and straight-run warnings. */
export function recommendLayout(req: LayoutRequest): { lines: number; pointsPerLine: number; reason: string; warnings: string[] } {
  const r = recommend(req);
  return { lines: r.lines, pointsPerLine: r.pointsPerLine, reason: r.reasons.join("; ") + ".", warnings: r.warnings };
}

/**
 * Builds a traverse layout. Counts left out are recommended from the duct size and straight run.
 * Throws RangeError for counts the method does not define (validate first with layoutCountProblem).
 */
export function buildLayout(req: LayoutRequest): Layout {
  const { duct, method } = req;
  const problem = layoutCountProblem(duct.shape, method, req);
  if (problem) throw new RangeError(`${problem.field} ${problem.message}`);
  const rec = recommend(req);
  const lineCount = req.lines ?? rec.lines;
  const n = req.pointsPerLine ?? rec.pointsPerLine;
  const warnings = [...rec.warnings];
  const offsetM = req.portOffsetM ?? 0;
  const wallMinimumM = equivalentDiameterM(duct) > EPA_LARGE_DUCT_M ? EPA_WALL_MIN_LARGE_M : EPA_WALL_MIN_SMALL_M;
  const noun = duct.shape === "round" ? "diameters" : "lines";
  const lineWord = lineCount === 1 ? noun.slice(0, -1) : noun;
  if (lineCount < rec.lines) warnings.push(`${lineCount} ${lineWord} is fewer than the ${rec.lines} recommended for this duct.`);
  if (n < rec.pointsPerLine) warnings.push(`${n} points per line is fewer than the ${rec.pointsPerLine} recommended for this duct.`);

  const headM = req.probeHeadDiameterM ?? DEFAULT_PROBE_HEAD_DIAMETER_M;
  const reachM = headM / 2;
  const { across, down } = fractionsFor(duct, method, lineCount, n);
  // The US EPA wall minimum belongs to its equal-area method only; the log rules keep their published positions.
  const relocateM = method === "equal-area" ? wallMinimumM : 0;
  /** A position along a span, where it is read, and whether the head can reach it (one object per call: this runs per point). */
  const place = (f: number, spanM: number) => {
    const raw = f * spanM;
    const lo = Math.min(relocateM, spanM / 2);
    const value = Math.min(Math.max(raw, lo), spanM - lo);
    const reach = Math.min(reachM, spanM / 2);
    const read = Math.min(Math.max(value, reach), spanM - reach);
    return { value, moved: Math.abs(value - raw) > 1e-12, read, beyond: Math.abs(read - value) > 1e-12 };
  };

  const lines: LayoutLine[] = [];
  if (duct.shape === "round") {
    const radiusM = duct.diameterM / 2;
    for (let k = 0; k < lineCount; k++) {
      const angleDeg = 90 + (k * 180) / lineCount;
      const cos = Math.cos((angleDeg * Math.PI) / 180);
      const sin = Math.sin((angleDeg * Math.PI) / 180);
      const points = down.map((f, p): LayoutPoint => {
        const at = place(f, duct.diameterM);
        const signedRadius = radiusM - at.value;
        const readRadius = radiusM - at.read;
        return {
          line: k,
          point: p,
          xM: signedRadius * cos,
          yM: signedRadius * sin,
          positionM: at.value,
          depthM: at.read + offsetM,
          moved: at.moved,
          readPositionM: at.read,
          readXM: readRadius * cos,
          readYM: readRadius * sin,
          beyondProbeReach: at.beyond,
        };
      });
      lines.push({ angleDeg, lineXM: null, points });
    }
  } else {
    for (const [k, fx] of across.entries()) {
      const x = place(fx, duct.widthM);
      const points = down.map((fy, p): LayoutPoint => {
        const y = place(fy, duct.heightM);
        return {
          line: k,
          point: p,
          xM: x.value,
          yM: y.value,
          positionM: y.value,
          depthM: y.read + offsetM,
          moved: x.moved || y.moved,
          readPositionM: y.read,
          readXM: x.read,
          readYM: y.read,
          beyondProbeReach: x.beyond || y.beyond,
        };
      });
      lines.push({ angleDeg: null, lineXM: x.value, points });
    }
  }

  let moved = 0;
  let beyondReachCount = 0;
  for (const line of lines) {
    for (const p of line.points) {
      if (p.moved) moved++;
      if (p.beyondProbeReach) beyondReachCount++;
    }
  }
  if (moved > 0) {
    warnings.push(`${moved} point${moved === 1 ? " was" : "s were"} closer than ${Math.round(wallMinimumM * 1000)} mm to a wall and moved out to it (US EPA Method 1, for equal-area layouts).`);
    const collapsed = lines.some((l) => l.points.some((p, i) => i > 0 && Math.abs(p.positionM - (l.points[i - 1]?.positionM ?? NaN)) < 1e-9));
    if (collapsed) warnings.push("Moving points off the wall made some coincide: use fewer points per line for this duct.");
  }
  const suggestion = beyondReachCount > 0 ? reachableCounts(duct, method, lineCount, n, relocateM, reachM) : null;
  if (beyondReachCount > 0) {
    const headMm = Math.round(headM * 10_000) / 10;
    const reachMm = Math.round(reachM * 10_000) / 10;
    const advice = suggestion
      ? `use ${suggestion.lines} ${suggestion.lines === 1 ? noun.slice(0, -1) : noun} × ${suggestion.pointsPerLine} points per line, which it can reach, or a probe with a smaller head`
      : "use a probe with a smaller head or the equal-area method";
    warnings.push(
      `${beyondReachCount} point${beyondReachCount === 1 ? " lies" : "s lie"} closer to a wall than the ${headMm} mm probe head can reach (${reachMm} mm): ${beyondReachCount === 1 ? "it is" : "they are"} read at ${reachMm} mm instead, which biases the mean; ${advice}.`,
    );
  }
  return {
    method,
    rule: method === "equal-area" ? "equal-area" : duct.shape === "round" ? "log-linear" : "log-Tchebycheff",
    duct,
    lines,
    lineCount,
    pointsPerLine: n,
    recommended: { lines: rec.lines, pointsPerLine: rec.pointsPerLine },
    wallMinimumM: relocateM,
    probeHeadDiameterM: headM,
    probeReachM: reachM,
    beyondReachCount,
    reachableCounts: suggestion,
    reason: `${lineCount} ${lineWord} × ${n} points${req.lines !== undefined || req.pointsPerLine !== undefined ? " (counts as given)" : ""}. Recommended: ${rec.reasons.join("; ")}.`,
    warnings,
  };
}

/** How many distinct layouts layoutFor keeps: a project's sections, with room to spare. */
const LAYOUT_CACHE_SIZE = 256;
const layoutCache = new Map<string, Layout>();

function deepFreeze<T>(value: T): T {
  if (value && typeof value === "object" && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

let lastRequest: { req: LayoutRequest; layout: Layout } | null = null;

function sameRequest(a: LayoutRequest, b: LayoutRequest): boolean {
  const da = a.duct;
  const db = b.duct;
  const sameDuct = da.shape === "round" ? db.shape === "round" && da.diameterM === db.diameterM : db.shape === "rectangular" && da.widthM === db.widthM && da.heightM === db.heightM;
  return (
    sameDuct &&
    a.method === b.method &&
    a.lines === b.lines &&
    a.pointsPerLine === b.pointsPerLine &&
    a.straightUpstreamM === b.straightUpstreamM &&
    a.straightDownstreamM === b.straightDownstreamM &&
    a.portOffsetM === b.portOffsetM &&
    a.probeHeadDiameterM === b.probeHeadDiameterM
  );
}

/**
 * buildLayout, remembered: a layout depends only on its request, and reductions of the same section
 * (every keystroke of a traverse, every screen and report that shows it) ask for the same one. The
 * layout is frozen, so no caller can change the shared copy; least recently used layouts are dropped
 * beyond LAYOUT_CACHE_SIZE. Errors are not remembered.
 */
export function layoutFor(req: LayoutRequest): Layout {
  // The same section again (a traverse recalculated as each reading lands) is answered without a key.
  if (lastRequest && sameRequest(lastRequest.req, req)) return lastRequest.layout;
  const layout = rememberedLayout(req);
  lastRequest = { req: { ...req, duct: { ...req.duct } }, layout };
  return layout;
}

function rememberedLayout(req: LayoutRequest): Layout {
  const d = req.duct;
  const key = [
    d.shape === "round" ? `r${d.diameterM}` : `q${d.widthM}x${d.heightM}`,
    req.method,
    req.lines,
    req.pointsPerLine,
    req.straightUpstreamM,
    req.straightDownstreamM,
    req.portOffsetM,
    req.probeHeadDiameterM,
  ].join("|");
  const hit = layoutCache.get(key);
  if (hit) {
    layoutCache.delete(key);
    layoutCache.set(key, hit);
    return hit;
  }
  // Built from a copy of the duct: freezing the layout must not freeze the caller's object.
  const layout = deepFreeze(buildLayout({ ...req, duct: { ...req.duct } }));
  layoutCache.set(key, layout);
  if (layoutCache.size > LAYOUT_CACHE_SIZE) layoutCache.delete(layoutCache.keys().next().value as string);
  return layout;
}
