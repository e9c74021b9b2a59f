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

function ranged(min: number, max: number, unit: string, opts: { integer?: boolean } = {}) {
  const allowed = `${opts.integer ? "a whole number" : "a number"} from ${min} to ${max}${unit ? ` ${unit}` : ""}`;
  const message = (iss: { input?: unknown }) => `must be ${allowed}; got ${describeValue(iss.input)}`;
  const base = z.number({ error: message }).min(min, { error: message }).max(max, { error: message });
  return opts.integer ? base.int({ error: message }) : base;
}

const shapeMessage = (iss: { code?: string; input?: unknown }) =>
  iss.code === "invalid_union"
    ? `must be "round" or "rectangular"; got ${describeValue((iss.input as { shape?: unknown } | undefined)?.shape)}`
    : `must be an object such as {"shape":"round","diameter_mm":600}; got ${describeValue(iss.input)}`;

/** Inside dimensions (inside any liner), 50…10 000 mm. */
export const ductSchema = z.discriminatedUnion(
  "shape",
  [
    z.strictObject({ shape: z.literal("round"), diameter_mm: ranged(50, 10_000, "mm") }),
    z.strictObject({ shape: z.literal("rectangular"), width_mm: ranged(50, 10_000, "mm"), height_mm: ranged(50, 10_000, "mm") }),
  ],
  { error: shapeMessage },
);

export const methodSchema = z.enum(["equal-area", "log-linear"], {
  error: (iss) => `must be "equal-area" or "log-linear" (log-Tchebycheff on rectangular ducts); got ${describeValue(iss.input)}`,
});

const layoutFields = {
  duct: ductSchema,
  method: methodSchema,
  lines: ranged(1, 100, "", { integer: true }).optional(),
  points_per_line: ranged(2, 100, "", { integer: true }).optional(),
  straight_upstream_mm: ranged(0, 1_000_000, "mm").optional(),
  straight_downstream_mm: ranged(0, 1_000_000, "mm").optional(),
  port_offset_mm: ranged(0, 1_000, "mm").optional(),
};

const topLevel = (command: string) => ({
  error: (iss: { input?: unknown }) => `must be a JSON object with the ${command} fields; got ${describeValue(iss.input)}`,
});

/** The error of a nested object given something else: names what it should hold. */
const objectOf = (what: string) => ({
  error: (iss: { input?: unknown }) => `must be an object with ${what}; got ${describeValue(iss.input)}`,
});

/** Probe head outside diameter, mm: judges which points near a wall the probe can reach (default 8 mm, common practice). */
const headDiameterSchema = ranged(1, 50, "mm (outside diameter of the probe head)");

/** The probe: its coefficient C (1.0 for a standard pitot-static tube, common practice) and head size. */
export const probeSchema = z.strictObject(
  { coefficient: ranged(0.5, 1.2, "").optional(), head_diameter_mm: headDiameterSchema.optional() },
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
  (v) => v === null || (typeof v === "number" && Number.isFinite(v) && v >= -10_000 && v <= 10_000),
  { error: (iss) => (iss.input === undefined ? `is needed: give ${STATIC_ALLOWED}; got nothing` : `must be ${STATIC_ALLOWED}; got ${describeValue(iss.input)}`) },
);

/**
 * Air at the plane. A measured barometric_pa and/or the site altitude_m (both is best: the altitude then
 * checks the barometer); exactly one of relative_humidity_pct / wet_bulb_c; static_pa or null.
 */
export const airSchema = z
  .strictObject(
    {
      dry_bulb_c: ranged(-40, 120, "°C"),
      barometric_pa: ranged(50_000, 110_000, "Pa").optional(),
      altitude_m: ranged(-500, 5_000, "m").optional(),
      static_pa: staticSchema,
      relative_humidity_pct: ranged(0, 100, "%").optional(),
      wet_bulb_c: ranged(-40, 120, "°C").optional(),
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
  pressure_accuracy_pct: ranged(0, 50, "% of reading").optional(),
  pressure_floor_pa: ranged(0, 100, "Pa").optional(),
  temperature_accuracy_c: ranged(0, 10, "°C").optional(),
  barometric_accuracy_pa: ranged(0, 10_000, "Pa").optional(),
  dimension_accuracy_mm: ranged(0, 100, "mm").optional(),
  humidity_accuracy_pct: ranged(0, 50, "% RH").optional(),
  velocity_accuracy_pct: ranged(0, 50, "% of reading").optional(),
  velocity_floor_m_s: ranged(0, 5, "m/s").optional(),
  repeatability_pct: ranged(0, 50, "% of velocity (one standard deviation)").optional(),
  standard_density_kg_m3: ranged(1.0, 1.3, "kg/m³ (the density the anemometer refers standard velocity to)").optional(),
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
    standard_density_kg_m3: ranged(1.0, 1.3, "kg/m³").optional(),
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

/** A flow must be 0 or at least `min`: smaller non-zero values are typing or unit errors (checked in the node's refinement). */
const tinyFlowMessage = (value: number, unit: string, min: number) =>
  `must be 0 (no flow) or from ${min} to 10000 ${unit}; got ${value}, too small to be a measured flow`;

const nodeSchema = z
  .strictObject({
    id: z.string({ error: (iss) => `must be the section's id, a text; got ${describeValue(iss.input)}` }).min(1, { error: "must not be empty" }).max(MAX_ID_CHARS, { error: (iss) => `must be at most ${MAX_ID_CHARS} characters; got ${(iss.input as string).length}` }),
    parent: z.string({ error: (iss) => `must be the id of the upstream section, or null for a root; got ${describeValue(iss.input)}` }).nullable(),
    mass_flow_kg_s: ranged(0, 10_000, "kg/s").optional(),
    flow_m3_s: ranged(0, 10_000, "m³/s").optional(),
    density_kg_m3: ranged(0.3, 2.0, "kg/m³").optional(),
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
    tolerance_pct: ranged(0, 100, "%").optional(),
    standard_density_kg_m3: ranged(1.0, 1.3, "kg/m³").optional(),
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
