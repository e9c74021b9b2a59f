/**
 * The calculation commands behind `npm run calc -- <command>` and `POST /api/v1/calc/<command>`:
 * snake_case JSON in (mm, Pa, °C), snake_case JSON out, expected failures as a Result.
 */
import type { ZodError } from "zod";
import { fail, issuePath, ok, type Result } from "@/lib/validation/result";
import {
  calcInputSizeProblems,
  describeValue,
  layoutInputSchema,
  networkInputSchema,
  plainlyValidTraverseInput,
  traverseInputSchema,
  type LayoutInputJson,
  type TraverseInputJson,
} from "@/lib/validation/calc";
import { capFieldErrors, EngineInputError, MAX_FIELD_ERRORS, MORE_FIELDS_KEY } from "./errors";
import { buildLayout, type Duct, type Layout, type LayoutRequest } from "./layout";
import { checkContinuity } from "./network";
import { reduceTraverse, type ReadingsKind, type TraverseInput, type TraverseResult } from "./traverse";
import { STANDARD_DENSITY_KG_M3 } from "./constants";
import { formatExpandedUncertainty, type FlowUncertainty, type UncertaintyTerms } from "./uncertainty";

export const CALC_COMMANDS = ["layout", "traverse", "network"] as const;
export type CalcCommand = (typeof CALC_COMMANDS)[number];

const MM_PER_M = 1000;
const toM = (mm: number | undefined) => (mm === undefined ? undefined : mm / MM_PER_M);
/** Layout coordinates to 0.1 mm: finer than any probe can be placed; also turns −0 into 0. */
const mm01 = (m: number) => Math.round(m * MM_PER_M * 10) / 10 + 0;
const finiteOrNull = (x: number) => (Number.isFinite(x) ? x : null);
const pct = (fraction: number) => finiteOrNull(fraction * 100);

/** The value at a dotted path of the input, for messages. */
function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let at: unknown = input;
  for (const key of path) {
    if (typeof at !== "object" || at === null) return undefined;
    at = (at as Record<PropertyKey, unknown>)[key];
  }
  return at;
}

const EXPECTED_WORDS: Record<string, string> = {
  object: "an object",
  array: "a list",
  number: "a number",
  string: "a text",
  boolean: "true or false",
  null: "null",
};

/**
 * The library's own messages ("Invalid input: expected object, received array") are not for users. Every
 * schema sets its own; this is the safety net for any it missed: the same fact in our words.
 */
const LIBRARY_PHRASING = /^Invalid|expected .+, received|^Too (big|small)|^Unrecognized/;

function userMessage(issue: ZodError["issues"][number], input: unknown): string {
  if (!LIBRARY_PHRASING.test(issue.message)) return issue.message;
  const got = describeValue(valueAt(input, issue.path));
  const expected = issue.code === "invalid_type" ? EXPECTED_WORDS[String(issue.expected)] : undefined;
  return expected ? `must be ${expected}; got ${got}` : `is not a value Airtally accepts here; got ${got}`;
}

/** Field errors keyed by dotted path; an unknown key is reported at its own path. At most MAX_FIELD_ERRORS, then a count. */
function fieldErrors(error: ZodError, input: unknown): { fields: Record<string, string>; total: number } {
  const fields: Record<string, string> = {};
  const seen = new Set<string>();
  for (const issue of error.issues) {
    const paths =
      issue.code === "unrecognized_keys"
        ? issue.keys.map((key) => ({
            path: issuePath([...issue.path, key]),
            message:
              issue.path[0] === "duct"
                ? "is not a field of this duct shape: round takes diameter_mm; rectangular takes width_mm and height_mm"
                : "is not a field Airtally expects here; check the spelling",
          }))
        : [{ path: issuePath(issue.path), message: null }];
    for (const { path, message } of paths) {
      if (seen.has(path)) continue;
      seen.add(path);
      if (seen.size <= MAX_FIELD_ERRORS) fields[path] = message ?? userMessage(issue, input);
    }
  }
  return { fields: capFieldErrors(fields, seen.size), total: seen.size };
}

function refuse(command: CalcCommand, fields: Record<string, string>, total?: number): Result<never> {
  const names = Object.keys(fields).filter((k) => k !== MORE_FIELDS_KEY);
  const all = Math.max(total ?? names.length, names.length);
  const shown = names.slice(0, 3).join(", ") + (all > 3 ? ` and ${(all - Math.min(3, names.length)).toLocaleString("en-US")} more` : "");
  return fail(`The ${command} input is not valid: check ${shown}.`, fields);
}

function invalid(command: CalcCommand, error: ZodError, input: unknown): Result<never> {
  const { fields, total } = fieldErrors(error, input);
  return refuse(command, fields, total);
}

function toDuct(duct: LayoutInputJson["duct"]): Duct {
  return duct.shape === "round"
    ? { shape: "round", diameterM: duct.diameter_mm / MM_PER_M }
    : { shape: "rectangular", widthM: duct.width_mm / MM_PER_M, heightM: duct.height_mm / MM_PER_M };
}

function layoutRequest(input: LayoutInputJson | TraverseInputJson): LayoutRequest {
  return {
    probeHeadDiameterM: toM(input.probe?.head_diameter_mm),
    duct: toDuct(input.duct),
    method: input.method,
    lines: input.lines,
    pointsPerLine: input.points_per_line,
    straightUpstreamM: toM(input.straight_upstream_mm),
    straightDownstreamM: toM(input.straight_downstream_mm),
    portOffsetM: toM(input.port_offset_mm),
  };
}

function layoutJson(layout: Layout) {
  return {
    method: layout.method,
    rule: layout.rule,
    line_count: layout.lineCount,
    points_per_line: layout.pointsPerLine,
    recommended: { lines: layout.recommended.lines, points_per_line: layout.recommended.pointsPerLine },
    wall_minimum_mm: mm01(layout.wallMinimumM),
    probe_head_diameter_mm: mm01(layout.probeHeadDiameterM),
    probe_reach_mm: mm01(layout.probeReachM),
    beyond_probe_reach_count: layout.beyondReachCount,
    reachable_counts: layout.reachableCounts && { lines: layout.reachableCounts.lines, points_per_line: layout.reachableCounts.pointsPerLine },
    lines: layout.lines.map((line) => ({
      ...(line.angleDeg !== null ? { angle_deg: line.angleDeg } : {}),
      ...(line.lineXM !== null ? { x_mm: mm01(line.lineXM) } : {}),
      points: line.points.map((p) => ({
        x_mm: mm01(p.xM),
        y_mm: mm01(p.yM),
        depth_mm: mm01(p.depthM),
        position_mm: mm01(p.positionM),
        read_position_mm: mm01(p.readPositionM),
        ...(p.moved ? { moved_from_wall: true } : {}),
        ...(p.beyondProbeReach ? { beyond_probe_reach: true } : {}),
      })),
    })),
    reason: layout.reason,
    warnings: layout.warnings,
  };
}

function runLayout(input: unknown): Result<unknown> {
  const parsed = layoutInputSchema.safeParse(input);
  if (!parsed.success) return invalid("layout", parsed.error, input);
  return ok(layoutJson(buildLayout(layoutRequest(parsed.data))));
}

/** Where each point of a layout is, as the points' JSON gives it (rounded once per layout object). */
interface PointPlace {
  line: number;
  point: number;
  x_mm: number;
  y_mm: number;
  depth_mm: number;
  position_mm: number;
  read_position_mm: number;
  beyondProbeReach: boolean;
}
const pointPlaces = new WeakMap<Layout, PointPlace[]>();

function pointPlacesOf(layout: Layout): PointPlace[] {
  let places = pointPlaces.get(layout);
  if (!places) {
    places = layout.lines.flatMap((line) =>
      line.points.map((p) => ({
        line: p.line,
        point: p.point,
        x_mm: mm01(p.xM),
        y_mm: mm01(p.yM),
        depth_mm: mm01(p.depthM),
        position_mm: mm01(p.positionM),
        read_position_mm: mm01(p.readPositionM),
        beyondProbeReach: p.beyondProbeReach,
      })),
    );
    pointPlaces.set(layout, places);
  }
  return places;
}

/**
 * Every traverse point as JSON, in layout order, straight from the result's per-point values (the same
 * numbers as `result.points`, without building those records first). Flags appear only when set; the
 * keys keep the contract's order.
 */
function pointsJson(r: TraverseResult): Record<string, unknown>[] {
  const places = pointPlacesOf(r.layout);
  const perLine = r.layout.pointsPerLine;
  const { reading: readings, velocityPressurePa, velocityMS } = r.pointValues;
  let filledAt: (TraverseResult["filled"][number] | undefined)[] | undefined;
  if (r.filled.length > 0) {
    filledAt = [];
    for (const f of r.filled) filledAt[f.line * perLine + f.point] = f;
  }
  const out = new Array<Record<string, unknown>>(places.length);
  for (let j = 0; j < places.length; j++) {
    const p = places[j]!;
    const at = p.line * perLine + p.point;
    const read = !Number.isNaN(readings[at]!);
    const reading = read ? readings[at]! : null;
    const pv = read ? velocityPressurePa[at]! : null;
    const v = read ? velocityMS[at]! : null;
    const json: Record<string, unknown> = p.beyondProbeReach
      ? { line: p.line, point: p.point, x_mm: p.x_mm, y_mm: p.y_mm, depth_mm: p.depth_mm, position_mm: p.position_mm, read_position_mm: p.read_position_mm, beyond_probe_reach: true, reading, velocity_pressure_pa: pv, velocity_m_s: v }
      : { line: p.line, point: p.point, x_mm: p.x_mm, y_mm: p.y_mm, depth_mm: p.depth_mm, position_mm: p.position_mm, read_position_mm: p.read_position_mm, reading, velocity_pressure_pa: pv, velocity_m_s: v };
    const f = filledAt?.[at];
    if (f) {
      json.filled_from = f.from;
      json.filled_velocity_m_s = f.value;
    }
    out[j] = json;
  }
  return out;
}

/**
 * The engine's request for a validated traverse input (snake_case JSON, mm, Pa, °C): the one mapping
 * from the calc contract to reduceTraverse, used by `npm run calc -- traverse`, the calc API, and
 * every screen that reduces a stored traverse (through lib/traverse/engine-input.ts).
 */
export function traverseRequestFromJson(d: TraverseInputJson): TraverseInput {
  const ins = d.instrument;
  return {
    probeHeadDiameterM: toM(d.probe?.head_diameter_mm),
    duct: toDuct(d.duct),
    method: d.method,
    lines: d.lines ?? d.readings.length,
    pointsPerLine: d.points_per_line ?? d.readings[0]?.length,
    straightUpstreamM: toM(d.straight_upstream_mm),
    straightDownstreamM: toM(d.straight_downstream_mm),
    portOffsetM: toM(d.port_offset_mm),
    air: {
      dryBulbC: d.air.dry_bulb_c,
      barometricPa: d.air.barometric_pa,
      altitudeM: d.air.altitude_m,
      staticPa: d.air.static_pa ?? undefined,
      relativeHumidityPct: d.air.relative_humidity_pct,
      wetBulbC: d.air.wet_bulb_c,
    },
    probeCoefficient: d.probe?.coefficient,
    standardDensityKgM3: d.standard_density_kg_m3,
    instrumentStandardDensityKgM3: ins?.standard_density_kg_m3,
    readings: d.readings,
    readingsKind: d.readings_kind as ReadingsKind | undefined,
    instrument: ins && {
      pressureAccuracyPct: ins.pressure_accuracy_pct,
      pressureFloorPa: ins.pressure_floor_pa,
      temperatureAccuracyC: ins.temperature_accuracy_c,
      barometricAccuracyPa: ins.barometric_accuracy_pa,
      dimensionAccuracyM: toM(ins.dimension_accuracy_mm),
      humidityAccuracyPct: ins.humidity_accuracy_pct,
      velocityAccuracyPct: ins.velocity_accuracy_pct,
      velocityFloorMS: ins.velocity_floor_m_s,
      repeatabilityPct: ins.repeatability_pct,
    },
  };
}

function runTraverse(input: unknown): Result<unknown> {
  // The common, plainly valid input skips the schema; anything else gets the schema and its messages.
  let d = plainlyValidTraverseInput(input);
  if (!d) {
    const sizes = calcInputSizeProblems("traverse", input);
    if (sizes) return refuse("traverse", sizes);
    const parsed = traverseInputSchema.safeParse(input);
    if (!parsed.success) return invalid("traverse", parsed.error, input);
    d = parsed.data;
  }
  return ok(traverseJson(d, reduceTraverse(traverseRequestFromJson(d))));
}

function termsJson(t: UncertaintyTerms) {
  return { dimension: pct(t.dimension), reading: pct(t.reading), density: pct(t.density), layout: pct(t.layout), random: pct(t.random), sampling: pct(t.sampling) };
}

function flowUncertaintyJson(f: FlowUncertainty) {
  return { expanded_pct: pct(f.expanded), combined_standard_pct: pct(f.combined), terms_pct: termsJson(f.terms) };
}

/** The traverse command's answer: the contract's keys, in its order. */
function traverseJson(d: TraverseInputJson, r: TraverseResult) {
  const u = r.uncertainty;
  return {
    method: r.layout.method,
    rule: r.layout.rule,
    readings_kind: r.readingsKind,
    integration_rule: r.integrationRule,
    filled_points: r.filled.length,
    density_kg_m3: r.densityKgM3,
    standard_density_kg_m3: r.standardDensityKgM3,
    ...(r.instrumentStandardDensityKgM3 !== null ? { instrument_standard_density_kg_m3: r.instrumentStandardDensityKgM3 } : {}),
    mean_velocity_m_s: r.meanVelocityMS,
    area_m2: r.areaM2,
    hydraulic_diameter_mm: r.hydraulicDiameterM * MM_PER_M,
    flow_m3_s: r.flowM3S,
    standard_flow_m3_s: r.standardFlowM3S,
    mass_flow_kg_s: r.massFlowKgS,
    reynolds: r.reynolds,
    max_mach: r.maxMach,
    air: {
      dry_bulb_c: r.air.dryBulbC,
      barometric_pa: r.air.barometricPa,
      barometric_source: r.air.barometricSource,
      ...(d.air.altitude_m !== undefined ? { altitude_m: d.air.altitude_m } : {}),
      static_pa: r.air.staticPa,
      static_assumed: r.air.staticAssumed,
      absolute_pressure_pa: r.air.absolutePressurePa,
      humidity_ratio: r.air.humidityRatio,
      vapour_pressure_pa: r.air.vapourPressurePa,
      relative_humidity_pct: r.air.relativeHumidityPct,
      viscosity_pa_s: r.air.viscosityPaS,
    },
    probe: { coefficient: d.probe?.coefficient ?? 1, head_diameter_mm: mm01(r.layout.probeHeadDiameterM), reach_mm: mm01(r.layout.probeReachM) },
    points: pointsJson(r),
    quality: {
      share_above_tenth_of_max: r.quality.shareAboveTenthOfMax,
      max_over_mean: finiteOrNull(r.quality.maxOverMean),
      cv: finiteOrNull(r.quality.cv),
      zero_or_negative_count: r.quality.zeroOrNegativeCount,
      low_pressure_count: r.quality.lowPressureCount,
      verdict: r.quality.verdict,
      reasons: r.quality.reasons,
    },
    // Kept from the first contract: the expanded uncertainty (k = 2) of the standard flow, and its terms as standard uncertainties.
    uncertainty_pct: pct(u.expanded),
    uncertainty_terms_pct: termsJson(u.terms),
    uncertainty: {
      expanded_pct: pct(u.expanded),
      coverage_factor: u.coverageFactor,
      coverage: "k = 2, about 95 %",
      shown: formatExpandedUncertainty(u.expanded),
      combined_standard_pct: pct(u.combined),
      terms_pct: termsJson(u.terms),
      actual: flowUncertaintyJson(u.actual),
      standard: flowUncertaintyJson(u.standard),
      mass: flowUncertaintyJson(u.mass),
      sampling: { unevenness: finiteOrNull(u.sampling.unevenness), straight_run_factor: u.sampling.factor, points: u.sampling.pointCount },
    },
    layout_reason: r.layout.reason,
    beyond_probe_reach_count: r.layout.beyondReachCount,
    warnings: r.warnings,
  };
}

function runNetwork(input: unknown): Result<unknown> {
  const sizes = calcInputSizeProblems("network", input);
  if (sizes) return refuse("network", sizes);
  const parsed = networkInputSchema.safeParse(input);
  if (!parsed.success) return invalid("network", parsed.error, input);
  const nodes = parsed.data.nodes.map((n) => ({
    id: n.id,
    parent: n.parent,
    massFlowKgS: n.mass_flow_kg_s ?? (n.flow_m3_s ?? 0) * (n.density_kg_m3 ?? 0),
    flowM3S: n.flow_m3_s,
    densityKgM3: n.density_kg_m3,
  }));
  const { junctions } = checkContinuity(nodes, { tolerancePct: parsed.data.tolerance_pct, standardDensityKgM3: parsed.data.standard_density_kg_m3 });
  return ok({
    standard_density_kg_m3: parsed.data.standard_density_kg_m3 ?? STANDARD_DENSITY_KG_M3,
    junctions: junctions.map((j) => ({
      id: j.id,
      parent_mass_flow_kg_s: j.parentMassFlowKgS,
      children_mass_flow_kg_s: j.childrenMassFlowKgS,
      imbalance_kg_s: j.imbalanceKgS,
      imbalance_pct: j.imbalancePct,
      pass: j.pass,
      children: j.children,
      imbalance_standard_m3_s: j.imbalanceStandardM3S,
      volumes_summable: j.volumesSummable,
      volume_imbalance_pct: j.volumeImbalancePct,
      naive_volume_imbalance_pct: j.naiveVolumeImbalancePct,
      note: j.note,
    })),
  });
}

const RUNNERS: Record<CalcCommand, (input: unknown) => Result<unknown>> = { layout: runLayout, traverse: runTraverse, network: runNetwork };

/**
 * Runs one calculation command on parsed JSON input. Bad input gives a failed Result whose fields map
 * dotted paths (`readings.1.3`) to messages naming the value and what is allowed.
 */
export function runCalcCommand(command: string, input: unknown): Result<unknown> {
  if (!(CALC_COMMANDS as readonly string[]).includes(command))
    return fail(`Unknown command ${JSON.stringify(command)}: use layout, traverse or network.`, { command: `must be one of layout, traverse, network; got ${JSON.stringify(command)}` });
  try {
    return RUNNERS[command as CalcCommand](input);
  } catch (error) {
    // Impossible combinations only the engine can see (e.g. cycles, vapour pressure above total pressure).
    if (error instanceof EngineInputError) return fail(error.message, capFieldErrors(error.fields));
    throw error;
  }
}
