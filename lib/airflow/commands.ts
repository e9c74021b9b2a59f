/**
 * The calculation commands behind `npm run calc -- <command>` and `POST /api/v1/calc/<command>`:
 * snake_case JSON in (mm, Pa, °C), snake_case JSON out, expected failures as a Result.
 */
import type { ZodError } from "zod";
import { fail, issuePath, ok, type Result } from "@/lib/validation/result";
import { layoutInputSchema, networkInputSchema, traverseInputSchema, type LayoutInputJson, type TraverseInputJson } from "@/lib/validation/calc";
import { EngineInputError } from "./errors";
import { buildLayout, type Duct, type Layout, type LayoutRequest } from "./layout";
import { checkContinuity } from "./network";
import { reduceTraverse, type ReadingsKind } from "./traverse";

export const CALC_COMMANDS = ["layout", "traverse", "network"] as const;
export type CalcCommand = (typeof CALC_COMMANDS)[number];

const MM_PER_M = 1000;
const toM = (mm: number | undefined) => (mm === undefined ? undefined : mm / MM_PER_M);
/** Layout coordinates to 0.1 mm: finer than any probe can be placed; also turns −0 into 0. */
const mm01 = (m: number) => Math.round(m * MM_PER_M * 10) / 10 + 0;
const finiteOrNull = (x: number) => (Number.isFinite(x) ? x : null);
const pct = (fraction: number) => finiteOrNull(fraction * 100);

/** Field errors keyed by dotted path; an unknown key is reported at its own path. */
function fieldErrors(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
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
        : [{ path: issuePath(issue.path), message: issue.message }];
    for (const { path, message } of paths) if (!(path in fields)) fields[path] = message;
  }
  return fields;
}

function invalid(command: CalcCommand, error: ZodError): Result<never> {
  const fields = fieldErrors(error);
  const names = Object.keys(fields);
  const shown = names.slice(0, 3).join(", ") + (names.length > 3 ? ` and ${names.length - 3} more` : "");
  return fail(`The ${command} input is not valid: check ${shown}.`, fields);
}

function toDuct(duct: LayoutInputJson["duct"]): Duct {
  return duct.shape === "round"
    ? { shape: "round", diameterM: duct.diameter_mm / MM_PER_M }
    : { shape: "rectangular", widthM: duct.width_mm / MM_PER_M, heightM: duct.height_mm / MM_PER_M };
}

function layoutRequest(input: LayoutInputJson | TraverseInputJson): LayoutRequest {
  return {
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
    lines: layout.lines.map((line) => ({
      ...(line.angleDeg !== null ? { angle_deg: line.angleDeg } : {}),
      ...(line.lineXM !== null ? { x_mm: mm01(line.lineXM) } : {}),
      points: line.points.map((p) => ({ x_mm: mm01(p.xM), y_mm: mm01(p.yM), depth_mm: mm01(p.depthM), ...(p.moved ? { moved_from_wall: true } : {}) })),
    })),
    reason: layout.reason,
    warnings: layout.warnings,
  };
}

function runLayout(input: unknown): Result<unknown> {
  const parsed = layoutInputSchema.safeParse(input);
  if (!parsed.success) return invalid("layout", parsed.error);
  return ok(layoutJson(buildLayout(layoutRequest(parsed.data))));
}

function runTraverse(input: unknown): Result<unknown> {
  const parsed = traverseInputSchema.safeParse(input);
  if (!parsed.success) return invalid("traverse", parsed.error);
  const d = parsed.data;
  const ins = d.instrument;
  const r = reduceTraverse({
    ...layoutRequest(d),
    lines: d.lines ?? d.readings.length,
    pointsPerLine: d.points_per_line ?? d.readings[0]?.length,
    air: {
      dryBulbC: d.air.dry_bulb_c,
      barometricPa: d.air.barometric_pa,
      altitudeM: d.air.altitude_m,
      staticPa: d.air.static_pa,
      relativeHumidityPct: d.air.relative_humidity_pct,
      wetBulbC: d.air.wet_bulb_c,
    },
    probeCoefficient: d.probe?.coefficient,
    standardDensityKgM3: d.standard_density_kg_m3,
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
  });
  const t = r.uncertainty.terms;
  return ok({
    method: r.layout.method,
    rule: r.layout.rule,
    readings_kind: r.readingsKind,
    integration_rule: r.integrationRule,
    density_kg_m3: r.densityKgM3,
    standard_density_kg_m3: r.standardDensityKgM3,
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
      absolute_pressure_pa: r.air.absolutePressurePa,
      humidity_ratio: r.air.humidityRatio,
      vapour_pressure_pa: r.air.vapourPressurePa,
      relative_humidity_pct: r.air.relativeHumidityPct,
      viscosity_pa_s: r.air.viscosityPaS,
    },
    points: r.points.map((p) => ({
      line: p.line,
      point: p.point,
      x_mm: mm01(p.xM),
      y_mm: mm01(p.yM),
      depth_mm: mm01(p.depthM),
      reading: p.reading,
      velocity_pressure_pa: p.velocityPressurePa,
      velocity_m_s: p.velocityMS,
    })),
    quality: {
      share_above_tenth_of_max: r.quality.shareAboveTenthOfMax,
      max_over_mean: finiteOrNull(r.quality.maxOverMean),
      cv: finiteOrNull(r.quality.cv),
      zero_or_negative_count: r.quality.zeroOrNegativeCount,
      low_pressure_count: r.quality.lowPressureCount,
      verdict: r.quality.verdict,
      reasons: r.quality.reasons,
    },
    uncertainty_pct: pct(r.uncertainty.combined),
    uncertainty_terms_pct: { dimension: pct(t.dimension), reading: pct(t.reading), density: pct(t.density), layout: pct(t.layout), random: pct(t.random) },
    layout_reason: r.layout.reason,
    warnings: r.warnings,
  });
}

function runNetwork(input: unknown): Result<unknown> {
  const parsed = networkInputSchema.safeParse(input);
  if (!parsed.success) return invalid("network", parsed.error);
  const nodes = parsed.data.nodes.map((n) => ({
    id: n.id,
    parent: n.parent,
    massFlowKgS: n.mass_flow_kg_s ?? (n.flow_m3_s ?? 0) * (n.density_kg_m3 ?? 0),
    flowM3S: n.flow_m3_s,
    densityKgM3: n.density_kg_m3,
  }));
  const { junctions } = checkContinuity(nodes, { tolerancePct: parsed.data.tolerance_pct });
  return ok({
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
    if (error instanceof EngineInputError) return fail(error.message, error.fields);
    throw error;
  }
}
