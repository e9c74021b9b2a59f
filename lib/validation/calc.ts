/**
 * Input schemas of the calculation commands (`layout`, `traverse`, `network`), shared by the CLI and
 * `POST /api/v1/calc/<command>`. JSON is snake_case; lengths mm, pressures Pa, temperatures °C.
 * Every message names the value received and what is allowed; paths are dotted (`readings.1.3`).
 */
import "./zod-browser";
import { z } from "zod";
import { airConditionErrors } from "@/lib/airflow/air";
import { layoutCountProblem } from "@/lib/airflow/layout";
import { MIN_FLOW_M3_S, MIN_MASS_FLOW_KG_S } from "@/lib/airflow/network";

/** Size limits of the calculation inputs, far beyond practice; counts are checked before any value. */
export const MAX_LINES = 100;
export const MAX_POINTS_PER_LINE = 100;
export const MAX_NETWORK_NODES = 5_000;
export const MAX_ID_CHARS = 200;

/** A value as a technician would recognise it in an error message. */
export function describeValue(value: unknown): string {
  if (value === undefined) return "nothing (the field is missing)";
  if (value === null) return "null";
  if (typeof value === "number") return String(value);
  if (typeof value === "string") return `the text ${JSON.stringify(value.length > 40 ? value.slice(0, 40) + "…" : value)}`;
  if (Array.isArray(value)) return "a list";
  return typeof value === "object" ? "an object" : String(value);
}

/** The allowed range of a number field (inclusive), shared by the schemas and plainlyValidTraverseInput. */
interface Bounds {
  min: number;
  max: number;
  integer?: boolean;
}

function ranged({ min, max, integer }: Bounds, unit: string) {
  const allowed = `${integer ? "a whole number" : "a number"} from ${min} to ${max}${unit ? ` ${unit}` : ""}`;
  const message = (iss: { input?: unknown }) => `must be ${allowed}; got ${describeValue(iss.input)}`;
  const base = z.number({ error: message }).min(min, { error: message }).max(max, { error: message });
  return integer ? base.int({ error: message }) : base;
}

/** Within bounds: a finite number (NaN and ±Infinity fail the comparisons), whole when the bounds say so. */
function within(value: unknown, { min, max, integer }: Bounds): boolean {
  return typeof value === "number" && value >= min && value <= max && (!integer || Number.isInteger(value));
}

/** Inside duct dimensions, mm. */
const DUCT_MM: Bounds = { min: 50, max: 10_000 };
const LAYOUT_BOUNDS = {
  lines: { min: 1, max: 100, integer: true },
  points_per_line: { min: 2, max: 100, integer: true },
  straight_upstream_mm: { min: 0, max: 1_000_000 },
  straight_downstream_mm: { min: 0, max: 1_000_000 },
  port_offset_mm: { min: 0, max: 1_000 },
} satisfies Record<string, Bounds>;
const AIR_BOUNDS = {
  dry_bulb_c: { min: -40, max: 120 },
  barometric_pa: { min: 50_000, max: 110_000 },
  altitude_m: { min: -500, max: 5_000 },
  relative_humidity_pct: { min: 0, max: 100 },
  wet_bulb_c: { min: -40, max: 120 },
} satisfies Record<string, Bounds>;
/** Duct static pressure, gauge Pa. */
const STATIC_PA: Bounds = { min: -10_000, max: 10_000 };
const PROBE_BOUNDS = { coefficient: { min: 0.5, max: 1.2 }, head_diameter_mm: { min: 1, max: 50 } } satisfies Record<string, Bounds>;
const STANDARD_DENSITY: Bounds = { min: 1.0, max: 1.3 };
const INSTRUMENT_BOUNDS = {
  pressure_accuracy_pct: { min: 0, max: 50 },
  pressure_floor_pa: { min: 0, max: 100 },
  temperature_accuracy_c: { min: 0, max: 10 },
  barometric_accuracy_pa: { min: 0, max: 10_000 },
  dimension_accuracy_mm: { min: 0, max: 100 },
  humidity_accuracy_pct: { min: 0, max: 50 },
  velocity_accuracy_pct: { min: 0, max: 50 },
  velocity_floor_m_s: { min: 0, max: 5 },
  repeatability_pct: { min: 0, max: 50 },
  standard_density_kg_m3: STANDARD_DENSITY,
} satisfies Record<string, Bounds>;

const shapeMessage = (iss: { code?: string; input?: unknown }) =>
  iss.code === "invalid_union"
    ? `must be "round" or "rectangular"; got ${describeValue((iss.input as { shape?: unknown } | undefined)?.shape)}`
    : `must be an object such as {"shape":"round","diameter_mm":600}; got ${describeValue(iss.input)}`;

/** Inside dimensions (inside any liner), 50…10 000 mm. */
export const ductSchema = z.discriminatedUnion(
  "shape",
  [
    z.strictObject({ shape: z.literal("round"), diameter_mm: ranged(DUCT_MM, "mm") }),
    z.strictObject({ shape: z.literal("rectangular"), width_mm: ranged(DUCT_MM, "mm"), height_mm: ranged(DUCT_MM, "mm") }),
  ],
  { error: shapeMessage },
);

export const methodSchema = z.enum(["equal-area", "log-linear"], {
  error: (iss) => `must be "equal-area" or "log-linear" (log-Tchebycheff on rectangular ducts); got ${describeValue(iss.input)}`,
});

const layoutFields = {
  duct: ductSchema,
  method: methodSchema,
  lines: ranged(LAYOUT_BOUNDS.lines, "").optional(),
  points_per_line: ranged(LAYOUT_BOUNDS.points_per_line, "").optional(),
  straight_upstream_mm: ranged(LAYOUT_BOUNDS.straight_upstream_mm, "mm").optional(),
  straight_downstream_mm: ranged(LAYOUT_BOUNDS.straight_downstream_mm, "mm").optional(),
  port_offset_mm: ranged(LAYOUT_BOUNDS.port_offset_mm, "mm").optional(),
};

const topLevel = (command: string) => ({
  error: (iss: { input?: unknown }) => `must be a JSON object with the ${command} fields; got ${describeValue(iss.input)}`,
});

/** The error of a nested object given something else: names what it should hold. */
const objectOf = (what: string) => ({
  error: (iss: { input?: unknown }) => `must be an object with ${what}; got ${describeValue(iss.input)}`,
});

/** Probe head outside diameter, mm: judges which points near a wall the probe can reach (default 8 mm, common practice). */
const headDiameterSchema = ranged(PROBE_BOUNDS.head_diameter_mm, "mm (outside diameter of the probe head)");

/** The probe: its coefficient C (1.0 for a standard pitot-static tube, common practice) and head size. */
export const probeSchema = z.strictObject(
  { coefficient: ranged(PROBE_BOUNDS.coefficient, "").optional(), head_diameter_mm: headDiameterSchema.optional() },
  objectOf("coefficient and/or head_diameter_mm"),
);

// A layout uses only the head size; the same probe object as a traverse's is accepted.
export const layoutInputSchema = z.strictObject({ ...layoutFields, probe: probeSchema.optional() }, topLevel("layout")).superRefine((input, ctx) => {
  const problem = layoutCountProblem(input.duct.shape, input.method, { lines: input.lines, pointsPerLine: input.points_per_line });
  if (problem) ctx.addIssue({ code: "custom", path: [problem.field], message: problem.message });
});
export type LayoutInputJson = z.infer<typeof layoutInputSchema>;

const STATIC_ALLOWED = "the duct static pressure at the plane, a number from -10000 to 10000 Pa (gauge), or null if it was not measured (0 Pa is then assumed and the result says so)";

/** Duct static pressure: required, so that leaving it out is a decision; null means not measured. */
const staticSchema = z.custom<number | null>(
  (v) => v === null || within(v, STATIC_PA),
  { error: (iss) => (iss.input === undefined ? `is needed: give ${STATIC_ALLOWED}; got nothing` : `must be ${STATIC_ALLOWED}; got ${describeValue(iss.input)}`) },
);

/**
 * Air at the plane. A measured barometric_pa and/or the site altitude_m (both is best: the altitude then
 * checks the barometer); exactly one of relative_humidity_pct / wet_bulb_c; static_pa or null.
 */
export const airSchema = z
  .strictObject(
    {
      dry_bulb_c: ranged(AIR_BOUNDS.dry_bulb_c, "°C"),
      barometric_pa: ranged(AIR_BOUNDS.barometric_pa, "Pa").optional(),
      altitude_m: ranged(AIR_BOUNDS.altitude_m, "m").optional(),
      static_pa: staticSchema,
      relative_humidity_pct: ranged(AIR_BOUNDS.relative_humidity_pct, "%").optional(),
      wet_bulb_c: ranged(AIR_BOUNDS.wet_bulb_c, "°C").optional(),
    },
    { error: (iss) => `must be an object with dry_bulb_c, barometric_pa and/or altitude_m, static_pa, and relative_humidity_pct or wet_bulb_c; got ${describeValue(iss.input)}` },
  )
  .superRefine((air, ctx) => {
    const hasBaro = air.barometric_pa !== undefined || air.altitude_m !== undefined;
    if (!hasBaro)
      ctx.addIssue({ code: "custom", path: ["barometric_pa"], message: "give the measured barometric_pa (Pa) or the site altitude_m (m), or both; got neither" });
    const hasRh = air.relative_humidity_pct !== undefined;
    if (hasRh === (air.wet_bulb_c !== undefined))
      ctx.addIssue({ code: "custom", path: ["relative_humidity_pct"], message: hasRh ? "give relative_humidity_pct or wet_bulb_c, not both" : "give relative_humidity_pct (%) or wet_bulb_c (°C); got neither" });
    if (air.wet_bulb_c !== undefined && air.wet_bulb_c > air.dry_bulb_c)
      ctx.addIssue({ code: "custom", path: ["wet_bulb_c"], message: `must be at or below the dry-bulb ${air.dry_bulb_c} °C; got ${air.wet_bulb_c}` });
    if (hasBaro && hasRh !== (air.wet_bulb_c !== undefined)) {
      // Individually valid values that no real air can have together (vapour pressure above total pressure).
      const impossible = airConditionErrors(
        { dryBulbC: air.dry_bulb_c, barometricPa: air.barometric_pa, altitudeM: air.altitude_m, staticPa: air.static_pa ?? undefined, relativeHumidityPct: air.relative_humidity_pct, wetBulbC: air.wet_bulb_c },
        "",
      );
      for (const [path, message] of Object.entries(impossible)) ctx.addIssue({ code: "custom", path: path.split("."), message });
    }
  });

export const readingsKindSchema = z.enum(["velocity_pressure", "velocity_actual", "velocity_standard"], {
  error: (iss) => `must be "velocity_pressure" (Pa, pitot tube), "velocity_actual" or "velocity_standard" (m/s, anemometer); got ${describeValue(iss.input)}`,
});

/** Instrument accuracies; each optional, typical values used otherwise (see DEFAULT_INSTRUMENT_ACCURACY). */
export const instrumentSchema = z.strictObject({
  pressure_accuracy_pct: ranged(INSTRUMENT_BOUNDS.pressure_accuracy_pct, "% of reading").optional(),
  pressure_floor_pa: ranged(INSTRUMENT_BOUNDS.pressure_floor_pa, "Pa").optional(),
  temperature_accuracy_c: ranged(INSTRUMENT_BOUNDS.temperature_accuracy_c, "°C").optional(),
  barometric_accuracy_pa: ranged(INSTRUMENT_BOUNDS.barometric_accuracy_pa, "Pa").optional(),
  dimension_accuracy_mm: ranged(INSTRUMENT_BOUNDS.dimension_accuracy_mm, "mm").optional(),
  humidity_accuracy_pct: ranged(INSTRUMENT_BOUNDS.humidity_accuracy_pct, "% RH").optional(),
  velocity_accuracy_pct: ranged(INSTRUMENT_BOUNDS.velocity_accuracy_pct, "% of reading").optional(),
  velocity_floor_m_s: ranged(INSTRUMENT_BOUNDS.velocity_floor_m_s, "m/s").optional(),
  repeatability_pct: ranged(INSTRUMENT_BOUNDS.repeatability_pct, "% of velocity (one standard deviation)").optional(),
  standard_density_kg_m3: ranged(INSTRUMENT_BOUNDS.standard_density_kg_m3, "kg/m³ (the density the anemometer refers standard velocity to)").optional(),
}, objectOf("instrument accuracies such as pressure_accuracy_pct and dimension_accuracy_mm"));

const READING_RANGE = {
  velocity_pressure: { min: -500, max: 5_000, what: "a velocity pressure", unit: "Pa" },
  velocity_actual: { min: -100, max: 100, what: "an actual velocity", unit: "m/s" },
  velocity_standard: { min: -100, max: 100, what: "a standard velocity", unit: "m/s" },
} as const;

/** A reading: a finite number, or null for a point that could not be read. Ranges depend on readings_kind. */
const readingSchema = z.custom<number | null>((v) => v === null || (typeof v === "number" && Number.isFinite(v)), {
  error: (iss) => `must be a number (or null for a point not read); got ${typeof iss.input === "number" ? `${iss.input}, which is not a finite number` : describeValue(iss.input)}`,
});

/**
 * Traverse input. `readings` are line by line, point by point in layout order. Pitot velocity pressures
 * (Pa, -500…5 000; negatives count as zero velocity and are flagged) by default; with `readings_kind`
 * "velocity_actual" or "velocity_standard", anemometer velocities in m/s (-100…100) — standard velocity
 * is referred to `standard_density_kg_m3`. Counts come from the shape of `readings` unless given.
 */
export const traverseInputSchema = z
  .strictObject({
    ...layoutFields,
    air: airSchema,
    probe: probeSchema.optional(),
    standard_density_kg_m3: ranged(STANDARD_DENSITY, "kg/m³").optional(),
    readings_kind: readingsKindSchema.optional(),
    instrument: instrumentSchema.optional(),
    readings: z
      .array(
        z
          .array(readingSchema, { error: (iss) => `must be a list of readings along one line; got ${describeValue(iss.input)}` })
          .max(MAX_POINTS_PER_LINE, { error: (iss) => `has ${(iss.input as unknown[]).length} readings; a line holds at most ${MAX_POINTS_PER_LINE}` }),
        { error: (iss) => `must be a list of lines, each a list of readings; got ${describeValue(iss.input)}` },
      )
      .min(1, { error: "must hold at least one line of readings; got none" })
      .max(MAX_LINES, { error: (iss) => `has ${(iss.input as unknown[]).length} lines; a traverse has at most ${MAX_LINES}` }),
  }, topLevel("traverse"))
  .superRefine((input, ctx) => {
    const range = READING_RANGE[input.readings_kind ?? "velocity_pressure"];
    const rows = input.readings;
    const lines = input.lines ?? rows.length;
    const points = input.points_per_line ?? rows[0]?.length ?? 0;
    const problem = layoutCountProblem(input.duct.shape, input.method, { lines, pointsPerLine: points });
    if (problem) {
      const given = problem.field === "lines" ? input.lines !== undefined : input.points_per_line !== undefined;
      const path = given ? [problem.field] : problem.field === "lines" ? ["readings"] : ["readings", 0];
      const from = given ? "" : problem.field === "lines" ? `readings has ${rows.length} lines: ` : `line 0 of readings has ${points} readings: `;
      ctx.addIssue({ code: "custom", path, message: from + problem.message });
      return;
    }
    if (rows.length !== lines) ctx.addIssue({ code: "custom", path: ["readings"], message: `has ${rows.length} lines of readings; lines is ${lines}, so ${lines} are needed` });
    let anyRead = false;
    rows.forEach((row, k) => {
      if (row.length !== points)
        ctx.addIssue({ code: "custom", path: ["readings", k], message: `has ${row.length} readings; every line needs ${points} (points_per_line${input.points_per_line === undefined ? ", from line 0" : ""})` });
      row.forEach((value, i) => {
        if (value === null) return;
        anyRead = true;
        if (value < range.min || value > range.max)
          ctx.addIssue({ code: "custom", path: ["readings", k, i], message: `must be ${range.what} from ${range.min} to ${range.max} ${range.unit} (or null for a point not read); got ${value}` });
      });
    });
    if (!anyRead) ctx.addIssue({ code: "custom", path: ["readings"], message: "every reading is null; at least one point must be read" });
  });
export type TraverseInputJson = z.infer<typeof traverseInputSchema>;

const TRAVERSE_KEYS = new Set(["duct", "method", "lines", "points_per_line", "straight_upstream_mm", "straight_downstream_mm", "port_offset_mm", "air", "probe", "standard_density_kg_m3", "readings_kind", "instrument", "readings"]);
const AIR_KEYS = new Set(["dry_bulb_c", "barometric_pa", "altitude_m", "static_pa", "relative_humidity_pct", "wet_bulb_c"]);
const PROBE_KEYS = new Set(Object.keys(PROBE_BOUNDS));
const INSTRUMENT_KEYS = new Set(Object.keys(INSTRUMENT_BOUNDS));

/** An object the schemas read as an object, with no key outside `keys`. */
function objectWithKeys(value: unknown, keys: ReadonlySet<string>): value is Record<string, unknown> {
  if (typeof value !== "object" || value === null || Array.isArray(value)) return false;
  for (const key in value) if (!keys.has(key)) return false;
  return true;
}

/** Absent (undefined, as the schemas' optional fields allow) or within bounds. */
const optionalWithin = (value: unknown, bounds: Bounds) => value === undefined || within(value, bounds);

/** Every field of an object with known keys absent or within its bounds. */
function allWithin(value: Record<string, unknown>, bounds: Record<string, Bounds>): boolean {
  for (const key in value) if (!optionalWithin(value[key], bounds[key]!)) return false;
  return true;
}

function plainlyValidDuct(duct: unknown): duct is TraverseInputJson["duct"] {
  if (typeof duct !== "object" || duct === null || Array.isArray(duct)) return false;
  const d = duct as Record<string, unknown>;
  if (d.shape === "round") return objectWithKeys(d, ROUND_KEYS) && within(d.diameter_mm, DUCT_MM);
  return d.shape === "rectangular" && objectWithKeys(d, RECTANGULAR_KEYS) && within(d.width_mm, DUCT_MM) && within(d.height_mm, DUCT_MM);
}
const ROUND_KEYS = new Set(["shape", "diameter_mm"]);
const RECTANGULAR_KEYS = new Set(["shape", "width_mm", "height_mm"]);

function plainlyValidAir(air: unknown): boolean {
  if (!objectWithKeys(air, AIR_KEYS)) return false;
  const { dry_bulb_c: dryBulbC, barometric_pa: barometricPa, altitude_m: altitudeM, static_pa: staticPa, relative_humidity_pct: rh, wet_bulb_c: wetBulbC } = air;
  if (!within(dryBulbC, AIR_BOUNDS.dry_bulb_c) || !(staticPa === null || within(staticPa, STATIC_PA))) return false;
  if (!optionalWithin(barometricPa, AIR_BOUNDS.barometric_pa) || !optionalWithin(altitudeM, AIR_BOUNDS.altitude_m)) return false;
  if (!optionalWithin(rh, AIR_BOUNDS.relative_humidity_pct) || !optionalWithin(wetBulbC, AIR_BOUNDS.wet_bulb_c)) return false;
  // The schema's refinement: a pressure, exactly one humidity, wet-bulb at most dry-bulb, and air that can exist.
  if (barometricPa === undefined && altitudeM === undefined) return false;
  if ((rh === undefined) === (wetBulbC === undefined)) return false;
  if (wetBulbC !== undefined && (wetBulbC as number) > (dryBulbC as number)) return false;
  const conditions = {
    dryBulbC: dryBulbC as number,
    barometricPa: barometricPa as number | undefined,
    altitudeM: altitudeM as number | undefined,
    staticPa: (staticPa as number | null) ?? undefined,
    relativeHumidityPct: rh as number | undefined,
    wetBulbC: wetBulbC as number | undefined,
  };
  return Object.keys(airConditionErrors(conditions, "")).length === 0;
}

/**
 * The traverse input itself when it is plainly valid, else null. Plainly valid: a plain JSON shape whose
 * every field is present as the schema wants it and within its bounds, and whose readings fit the layout,
 * as the traverse screen and most API clients send it. It accepts nothing traverseInputSchema refuses,
 * and for what it accepts the schema's parse equals the input (no field has a default or a transform),
 * so the input is used as it is. Anything else (null), and traverseInputSchema decides, with its messages.
 * It exists because the schema checking each of up to 10,000 readings one by one costs several times the
 * whole reduction.
 */
export function plainlyValidTraverseInput(input: unknown): TraverseInputJson | null {
  if (!objectWithKeys(input, TRAVERSE_KEYS)) return null;
  const { duct, method, lines, points_per_line: pointsPerLine, probe, instrument, readings_kind: kind, readings } = input;
  if (!plainlyValidDuct(duct) || (method !== "equal-area" && method !== "log-linear")) return null;
  if (!optionalWithin(lines, LAYOUT_BOUNDS.lines) || !optionalWithin(pointsPerLine, LAYOUT_BOUNDS.points_per_line)) return null;
  if (!optionalWithin(input.straight_upstream_mm, LAYOUT_BOUNDS.straight_upstream_mm) || !optionalWithin(input.straight_downstream_mm, LAYOUT_BOUNDS.straight_downstream_mm)) return null;
  if (!optionalWithin(input.port_offset_mm, LAYOUT_BOUNDS.port_offset_mm) || !optionalWithin(input.standard_density_kg_m3, STANDARD_DENSITY)) return null;
  if (!plainlyValidAir(input.air)) return null;
  if (probe !== undefined && !(objectWithKeys(probe, PROBE_KEYS) && allWithin(probe, PROBE_BOUNDS))) return null;
  if (instrument !== undefined && !(objectWithKeys(instrument, INSTRUMENT_KEYS) && allWithin(instrument, INSTRUMENT_BOUNDS))) return null;
  if (kind !== undefined && kind !== "velocity_pressure" && kind !== "velocity_actual" && kind !== "velocity_standard") return null;
  // The readings, as the schema's refinement judges them: counts the method defines, every line as long, one read at least.
  if (!Array.isArray(readings) || readings.length < 1 || readings.length > MAX_LINES) return null;
  const first: unknown = readings[0];
  if (!Array.isArray(first)) return null;
  const lineCount = (lines as number | undefined) ?? readings.length;
  const points = (pointsPerLine as number | undefined) ?? first.length;
  if (readings.length !== lineCount || points > MAX_POINTS_PER_LINE || layoutCountProblem(duct.shape, method, { lines: lineCount, pointsPerLine: points })) return null;
  const { min, max } = READING_RANGE[(kind as keyof typeof READING_RANGE | undefined) ?? "velocity_pressure"];
  let anyRead = false;
  for (let k = 0; k < lineCount; k++) {
    const row: unknown = readings[k];
    if (!Array.isArray(row) || row.length !== points) return null;
    for (let i = 0; i < points; i++) {
      const value: unknown = row[i];
      if (value === null) continue;
      // Inside the range means a finite number (NaN fails both comparisons).
      if (typeof value !== "number" || !(value >= min && value <= max)) return null;
      anyRead = true;
    }
  }
  return anyRead ? (input as TraverseInputJson) : null;
}

/** A flow must be 0 or at least `min`: smaller non-zero values are typing or unit errors (checked in the node's refinement). */
const tinyFlowMessage = (value: number, unit: string, min: number) =>
  `must be 0 (no flow) or from ${min} to 10000 ${unit}; got ${value}, too small to be a measured flow`;

const nodeSchema = z
  .strictObject({
    id: z.string({ error: (iss) => `must be the section's id, a text; got ${describeValue(iss.input)}` }).min(1, { error: "must not be empty" }).max(MAX_ID_CHARS, { error: (iss) => `must be at most ${MAX_ID_CHARS} characters; got ${(iss.input as string).length}` }),
    parent: z.string({ error: (iss) => `must be the id of the upstream section, or null for a root; got ${describeValue(iss.input)}` }).nullable(),
    mass_flow_kg_s: ranged({ min: 0, max: 10_000 }, "kg/s").optional(),
    flow_m3_s: ranged({ min: 0, max: 10_000 }, "m³/s").optional(),
    density_kg_m3: ranged({ min: 0.3, max: 2.0 }, "kg/m³").optional(),
  }, objectOf("id, parent and mass_flow_kg_s (or flow_m3_s with density_kg_m3)"))
  .superRefine((node, ctx) => {
    // One refinement per node for these checks keeps a 5 000-section network quick to validate.
    if (node.parent !== null && node.parent.length > MAX_ID_CHARS)
      ctx.addIssue({ code: "custom", path: ["parent"], message: `must be at most ${MAX_ID_CHARS} characters (an id); got ${node.parent.length}` });
    if (node.mass_flow_kg_s !== undefined && node.mass_flow_kg_s > 0 && node.mass_flow_kg_s < MIN_MASS_FLOW_KG_S)
      ctx.addIssue({ code: "custom", path: ["mass_flow_kg_s"], message: tinyFlowMessage(node.mass_flow_kg_s, "kg/s", MIN_MASS_FLOW_KG_S) });
    if (node.flow_m3_s !== undefined && node.flow_m3_s > 0 && node.flow_m3_s < MIN_FLOW_M3_S)
      ctx.addIssue({ code: "custom", path: ["flow_m3_s"], message: tinyFlowMessage(node.flow_m3_s, "m³/s", MIN_FLOW_M3_S) });
    const hasMass = node.mass_flow_kg_s !== undefined;
    const hasVolume = node.flow_m3_s !== undefined || node.density_kg_m3 !== undefined;
    if (hasMass && hasVolume) ctx.addIssue({ code: "custom", path: ["mass_flow_kg_s"], message: "give mass_flow_kg_s, or flow_m3_s with density_kg_m3, not both" });
    else if (!hasMass && !hasVolume) ctx.addIssue({ code: "custom", path: ["mass_flow_kg_s"], message: "give mass_flow_kg_s, or flow_m3_s with density_kg_m3; got neither" });
    else if (!hasMass && node.flow_m3_s === undefined) ctx.addIssue({ code: "custom", path: ["flow_m3_s"], message: "is needed with density_kg_m3; got nothing" });
    else if (!hasMass && node.density_kg_m3 === undefined) ctx.addIssue({ code: "custom", path: ["density_kg_m3"], message: "is needed with flow_m3_s (the density at that section); got nothing" });
  });

export const networkInputSchema = z
  .strictObject({
    nodes: z
      .array(nodeSchema, { error: (iss) => `must be a list of duct sections; got ${describeValue(iss.input)}` })
      .min(1, { error: "must hold at least one section; got none" })
      .max(MAX_NETWORK_NODES, { error: (iss) => `has ${(iss.input as unknown[]).length} sections; at most ${MAX_NETWORK_NODES} are allowed` }),
    tolerance_pct: ranged({ min: 0, max: 100 }, "%").optional(),
    standard_density_kg_m3: ranged(STANDARD_DENSITY, "kg/m³").optional(),
  }, topLevel("network"))
  .superRefine((input, ctx) => {
    const ids = new Map<string, number>();
    input.nodes.forEach((node, i) => {
      const first = ids.get(node.id);
      if (first !== undefined) ctx.addIssue({ code: "custom", path: ["nodes", i, "id"], message: `repeats the id ${JSON.stringify(node.id)} of nodes.${first}; ids must be unique` });
      else ids.set(node.id, i);
    });
    input.nodes.forEach((node, i) => {
      if (node.parent !== null && !ids.has(node.parent))
        ctx.addIssue({ code: "custom", path: ["nodes", i, "parent"], message: `names ${JSON.stringify(node.parent)}, which is not the id of any section; use an id from nodes, or null for a root` });
    });
  });
export type NetworkInputJson = z.infer<typeof networkInputSchema>;

const plural = (n: number, one: string, many: string) => `${n.toLocaleString("en-US")} ${n === 1 ? one : many}`;

/**
 * Counts checked before any value is looked at, so an absurdly large input is refused at once:
 * readings at most MAX_LINES lines of MAX_POINTS_PER_LINE, networks at most MAX_NETWORK_NODES sections.
 * Returns field errors, or null when the sizes are acceptable (or the shape is for the schema to judge).
 */
export function calcInputSizeProblems(command: string, input: unknown): Record<string, string> | null {
  if (typeof input !== "object" || input === null || Array.isArray(input)) return null;
  const fields: Record<string, string> = {};
  if (command === "traverse") {
    const readings = (input as { readings?: unknown }).readings;
    if (Array.isArray(readings)) {
      if (readings.length > MAX_LINES) {
        fields.readings = `has ${plural(readings.length, "line", "lines")} of readings; a traverse has at most ${MAX_LINES} lines (split a larger plane into sections)`;
      } else {
        readings.forEach((row: unknown, k) => {
          if (Array.isArray(row) && row.length > MAX_POINTS_PER_LINE)
            fields[`readings.${k}`] = `has ${plural(row.length, "reading", "readings")}; a line holds at most ${MAX_POINTS_PER_LINE} points`;
        });
      }
    }
  } else if (command === "network") {
    const nodes = (input as { nodes?: unknown }).nodes;
    if (Array.isArray(nodes) && nodes.length > MAX_NETWORK_NODES)
      fields.nodes = `has ${plural(nodes.length, "section", "sections")}; at most ${MAX_NETWORK_NODES.toLocaleString("en-US")} are allowed in one check (split the system)`;
  }
  return Object.keys(fields).length > 0 ? fields : null;
}
