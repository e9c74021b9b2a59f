/**
 * From a stored traverse to the engine, once for every screen: the API's result, the live numbers in
 * the browser, the engineer's and the agent's views and `npm run calc -- traverse` all start from the
 * calc command's JSON built here (`traverseCalcInput`), so they cannot disagree. Pure TypeScript with
 * no server or browser dependency: the traverse screen runs the same code on the tablet.
 */
import { runCalcCommand, traverseRequestFromJson } from "@/lib/airflow/commands";
import { reduceTraverse, type TraverseResult } from "@/lib/airflow/traverse";
import type { InstrumentAccuracy } from "@/lib/airflow/uncertainty";
import { plainlyValidTraverseInput, traverseInputSchema } from "@/lib/validation/calc";

export type ReadingsKindName = "velocity_pressure" | "velocity_actual" | "velocity_standard";
export type Grid = (number | null)[][];
/** [line, point], 0-based as in `readings`. */
export type PointRef = [number, number];

/** What the engine needs of a stored traverse, its section and its project (SI: mm, Pa, °C, kg/m³). */
export interface TraverseEngineSource {
  duct: { shape: "round" | "rectangular"; diameterMm: number | null; widthMm: number | null; heightMm: number | null };
  straightUpstreamMm: number | null;
  straightDownstreamMm: number | null;
  /** The project's site altitude (checks a measured barometer; gives the pressure when none was measured). */
  altitudeM: number;
  /** The project's standard air density, which design airflows are scheduled at. */
  standardDensityKgM3: number;
  method: "equal-area" | "log-linear";
  lines: number;
  pointsPerLine: number;
  portOffsetMm: number;
  readingsKind: ReadingsKindName;
  probeCoefficient: number;
  probeHeadDiameterMm: number | null;
  instrumentAccuracy: Partial<InstrumentAccuracy>;
  instrumentStandardDensityKgM3: number | null;
  air: TraverseAir;
}

/** Air at the plane as stored: null for a value not recorded; a null static pressure was not measured (0 Pa assumed). */
export interface TraverseAir {
  dryBulbC: number | null;
  relativeHumidityPct: number | null;
  wetBulbC: number | null;
  barometricPa: number | null;
  staticPa: number | null;
}

const ACCURACY_KEYS: Record<keyof InstrumentAccuracy, [string, number]> = {
  pressureAccuracyPct: ["pressure_accuracy_pct", 1],
  pressureFloorPa: ["pressure_floor_pa", 1],
  temperatureAccuracyC: ["temperature_accuracy_c", 1],
  barometricAccuracyPa: ["barometric_accuracy_pa", 1],
  dimensionAccuracyM: ["dimension_accuracy_mm", 1000],
  humidityAccuracyPct: ["humidity_accuracy_pct", 1],
  velocityAccuracyPct: ["velocity_accuracy_pct", 1],
  velocityFloorMS: ["velocity_floor_m_s", 1],
  repeatabilityPct: ["repeatability_pct", 1],
};

/** An empty grid of the traverse's shape: every point not read. */
export function emptyGrid(lines: number, pointsPerLine: number): Grid {
  return Array.from({ length: lines }, () => Array<number | null>(pointsPerLine).fill(null));
}

/**
 * The calc command's input (`npm run -s calc -- traverse`) for a stored traverse and a grid of
 * readings. Points marked unreadable go in as null, like points not read: the engine integrates
 * around both. The air is passed as recorded; `validateTraverseAir` says what is missing first.
 */
export function traverseCalcInput(source: TraverseEngineSource, readings: Grid): Record<string, unknown> {
  const { duct, air } = source;
  const accuracy: Record<string, number> = {};
  for (const [key, value] of Object.entries(source.instrumentAccuracy)) {
    const map = ACCURACY_KEYS[key as keyof InstrumentAccuracy];
    if (map && typeof value === "number" && Number.isFinite(value)) accuracy[map[0]] = value * map[1];
  }
  if (source.readingsKind === "velocity_standard" && source.instrumentStandardDensityKgM3 !== null) accuracy.standard_density_kg_m3 = source.instrumentStandardDensityKgM3;
  const probe: Record<string, number> = { coefficient: source.probeCoefficient };
  if (source.probeHeadDiameterMm !== null) probe.head_diameter_mm = source.probeHeadDiameterMm;
  return {
    duct: duct.shape === "round" ? { shape: "round", diameter_mm: duct.diameterMm ?? 0 } : { shape: "rectangular", width_mm: duct.widthMm ?? 0, height_mm: duct.heightMm ?? 0 },
    method: source.method,
    lines: source.lines,
    points_per_line: source.pointsPerLine,
    ...(source.straightUpstreamMm !== null ? { straight_upstream_mm: source.straightUpstreamMm } : {}),
    ...(source.straightDownstreamMm !== null ? { straight_downstream_mm: source.straightDownstreamMm } : {}),
    port_offset_mm: source.portOffsetMm,
    air: {
      dry_bulb_c: air.dryBulbC,
      // The site altitude always goes with a measured barometer, so a sea-level-corrected reading is caught.
      altitude_m: source.altitudeM,
      ...(air.barometricPa !== null ? { barometric_pa: air.barometricPa } : {}),
      static_pa: air.staticPa,
      ...(air.relativeHumidityPct !== null ? { relative_humidity_pct: air.relativeHumidityPct } : { wet_bulb_c: air.wetBulbC }),
    },
    probe,
    standard_density_kg_m3: source.standardDensityKgM3,
    readings_kind: source.readingsKind,
    ...(Object.keys(accuracy).length > 0 ? { instrument: accuracy } : {}),
    readings,
  };
}

/** What is still missing before the air can be reduced, or null. */
export function missingAir(air: TraverseAir): string | null {
  if (air.dryBulbC === null) return "Dry-bulb temperature not recorded yet.";
  if (air.relativeHumidityPct === null && air.wetBulbC === null) return "Relative humidity or wet-bulb not recorded yet.";
  return null;
}

/** A snake_case key as the API's camelCase: mean_velocity_m_s → meanVelocityMS, density_kg_m3 → densityKgM3. */
export function camelKey(key: string): string {
  let camel = camelCase.get(key);
  if (camel === undefined) {
    camel = key.replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase());
    // The engine's keys are a small fixed set; the bound only guards against being handed others.
    if (camelCase.size < 2_000) camelCase.set(key, camel);
  }
  return camel;
}
const camelCase = new Map<string, string>();

/** Every key of a JSON value in camelCase, values untouched. */
export function camelKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(camelKeys);
  if (value !== null && typeof value === "object") return Object.fromEntries(Object.entries(value).map(([k, v]) => [camelKey(k), camelKeys(v)]));
  return value;
}

export interface GridCounts {
  points: number;
  read: number;
  unreadable: number;
  notRead: number;
}

export function countGrid(readings: Grid, unreadable: readonly PointRef[]): GridCounts {
  let read = 0;
  let points = 0;
  for (const row of readings) for (const v of row) {
    points++;
    if (v !== null) read++;
  }
  return { points, read, unreadable: unreadable.length, notRead: points - read - unreadable.length };
}

export type TraverseReduction =
  | { ok: true; input: Record<string, unknown>; output: Record<string, unknown>; counts: GridCounts }
  | { ok: false; input: Record<string, unknown> | null; message: string; fields?: Record<string, string>; counts: GridCounts };

/**
 * Runs the calc command on a stored traverse: exactly what `npm run -s calc -- traverse` prints for
 * `input`. A traverse that cannot be reduced yet (no readings, air not recorded, readings the engine
 * refuses) says why instead.
 */
export function reduceTraverseSource(source: TraverseEngineSource, readings: Grid, unreadable: readonly PointRef[] = []): TraverseReduction {
  const counts = countGrid(readings, unreadable);
  const missing = missingAir(source.air);
  if (missing) return { ok: false, input: null, message: missing, counts };
  if (counts.read === 0) return { ok: false, input: null, message: "No readings yet.", counts };
  const input = traverseCalcInput(source, readings);
  const run = runCalcCommand("traverse", input);
  if (!run.ok) return { ok: false, input, message: run.error.message, fields: run.error.fields, counts };
  return { ok: true, input, output: run.value as Record<string, unknown>, counts };
}

/**
 * The engine's own result object for screens that work with it (the engineer's and agent's views),
 * through the same calc input and the same mapping as the calc command.
 */
export function engineResultFor(source: TraverseEngineSource, readings: Grid): { ok: true; result: TraverseResult } | { ok: false; message: string } {
  const missing = missingAir(source.air);
  if (missing) return { ok: false, message: missing };
  if (readings.every((row) => row.every((v) => v === null))) return { ok: false, message: "No readings yet." };
  const input = traverseCalcInput(source, readings);
  let d = plainlyValidTraverseInput(input);
  if (!d) {
    const parsed = traverseInputSchema.safeParse(input);
    if (!parsed.success) return { ok: false, message: `The stored traverse cannot be reduced: ${parsed.error.issues[0]?.message ?? "invalid input"}.` };
    d = parsed.data;
  }
  try {
    return { ok: true, result: reduceTraverse(traverseRequestFromJson(d)) };
  } catch (err) {
    return { ok: false, message: err instanceof Error ? err.message : "The readings could not be reduced." };
  }
}

/** The stored columns the engine reads (db/schema.ts `traverses`, `duct_sections`, `projects`). */
export interface StoredTraverseColumns {
  method: "equal-area" | "log-linear";
  lines: number;
  pointsPerLine: number;
  portOffsetMm: number;
  readingsKind: ReadingsKindName;
  probeCoefficient: number;
  probeHeadDiameterMm: number | null;
  instrumentAccuracy: Partial<InstrumentAccuracy>;
  instrumentStandardDensityKgM3: number | null;
  dryBulbC: number | null;
  relativeHumidityPct: number | null;
  wetBulbC: number | null;
  barometricPa: number | null;
  staticPa: number | null;
}
export interface StoredSectionColumns {
  shape: "round" | "rectangular";
  diameterMm: number | null;
  widthMm: number | null;
  heightMm: number | null;
  straightUpstreamMm: number | null;
  straightDownstreamMm: number | null;
}

/** The engine source of a stored traverse in its section and project. */
export function engineSourceOf(t: StoredTraverseColumns, section: StoredSectionColumns, project: { altitudeM: number; standardDensityKgM3: number }): TraverseEngineSource {
  return {
    duct: { shape: section.shape, diameterMm: section.diameterMm, widthMm: section.widthMm, heightMm: section.heightMm },
    straightUpstreamMm: section.straightUpstreamMm,
    straightDownstreamMm: section.straightDownstreamMm,
    altitudeM: project.altitudeM,
    standardDensityKgM3: project.standardDensityKgM3,
    method: t.method,
    lines: t.lines,
    pointsPerLine: t.pointsPerLine,
    portOffsetMm: t.portOffsetMm,
    readingsKind: t.readingsKind,
    probeCoefficient: t.probeCoefficient,
    probeHeadDiameterMm: t.probeHeadDiameterMm,
    instrumentAccuracy: t.instrumentAccuracy ?? {},
    instrumentStandardDensityKgM3: t.instrumentStandardDensityKgM3,
    air: { dryBulbC: t.dryBulbC, relativeHumidityPct: t.relativeHumidityPct, wetBulbC: t.wetBulbC, barometricPa: t.barometricPa, staticPa: t.staticPa },
  };
}

/** Stored reading rows (1-based line and point) as the grid the API speaks (0-based) and the unreadable points. */
export function gridOfRows(lines: number, pointsPerLine: number, rows: readonly { line: number; point: number; value: number | null; unreadable: boolean }[]): { readings: Grid; unreadable: PointRef[] } {
  const readings = emptyGrid(lines, pointsPerLine);
  const unreadable: PointRef[] = [];
  for (const r of rows) {
    const row = readings[r.line - 1];
    if (!row || r.point < 1 || r.point > pointsPerLine) continue;
    if (r.unreadable) unreadable.push([r.line - 1, r.point - 1]);
    else row[r.point - 1] = r.value;
  }
  unreadable.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  return { readings, unreadable };
}

/** The calc `layout` command's input for the traverse (the points, their depths and the probe's reach). */
export function layoutCalcInput(source: TraverseEngineSource): Record<string, unknown> {
  const full = traverseCalcInput(source, []);
  const { duct, method, lines, points_per_line, straight_upstream_mm, straight_downstream_mm, port_offset_mm, probe } = full as Record<string, unknown> & { probe: { head_diameter_mm?: number } };
  return {
    duct,
    method,
    lines,
    points_per_line,
    ...(straight_upstream_mm !== undefined ? { straight_upstream_mm } : {}),
    ...(straight_downstream_mm !== undefined ? { straight_downstream_mm } : {}),
    port_offset_mm,
    ...(probe.head_diameter_mm !== undefined ? { probe: { head_diameter_mm: probe.head_diameter_mm } } : {}),
  };
}
