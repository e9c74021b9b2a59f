/**
 * Reducing a traverse: point readings → point velocities → plane mean → actual, standard and mass flow,
 * with plane quality, uncertainty and warnings. Velocities are averaged, never pressures: averaging
 * velocity pressures first over-reads by √(mean u²)/mean u − 1 (about +1 % on a fully developed profile).
 */
import { airState, type AirConditions, type AirState } from "./air";
import { STANDARD_DENSITY_KG_M3 } from "./constants";
import { planeMean, powerLawLayoutError, type IntegrationRule } from "./integrate";
import { buildLayout, ductAreaM2, equivalentDiameterM, type Layout, type LayoutRequest } from "./layout";
import { assessPlane, LOW_VELOCITY_PRESSURE_PA, type PlaneQuality } from "./quality";
import {
  DEFAULT_INSTRUMENT_ACCURACY,
  densityRelativeUncertainty,
  pressureReadingRelativeUncertainty,
  traverseUncertainty,
  velocityReadingRelativeUncertainty,
  type InstrumentAccuracy,
  type UncertaintyTerms,
} from "./uncertainty";
import { actualVelocityFromStandardMS, exceedsMachLimit, machNumber, velocityFromPressureMS, velocityPressureFromVelocityPa } from "./velocity";

/** What the readings are: pitot velocity pressures (Pa), or anemometer velocities (m/s), actual or standard. */
export type ReadingsKind = "velocity_pressure" | "velocity_actual" | "velocity_standard";

/** The layout request plus what was read; `lines` and `pointsPerLine` default to the shape of `readings`. */
export interface TraverseInput extends LayoutRequest {
  air: AirConditions;
  /** Probe coefficient C (1.0 for a standard pitot-static tube, common practice). */
  probeCoefficient?: number;
  standardDensityKgM3?: number;
  /** Line by line, point by point in layout order; null marks a point that could not be read. */
  readings: readonly (readonly (number | null)[])[];
  readingsKind?: ReadingsKind;
  instrument?: Partial<InstrumentAccuracy>;
}

export interface TraversePoint {
  line: number;
  point: number;
  xM: number;
  yM: number;
  depthM: number;
  reading: number | null;
  /** Read, or for anemometer readings the equivalent pitot velocity pressure. */
  velocityPressurePa: number | null;
  velocityMS: number | null;
}

export interface TraverseResult {
  air: AirState;
  densityKgM3: number;
  standardDensityKgM3: number;
  readingsKind: ReadingsKind;
  meanVelocityMS: number;
  areaM2: number;
  hydraulicDiameterM: number;
  flowM3S: number;
  standardFlowM3S: number;
  massFlowKgS: number;
  reynolds: number;
  maxMach: number;
  integrationRule: IntegrationRule;
  layout: Layout;
  points: TraversePoint[];
  quality: PlaneQuality;
  uncertainty: { combined: number; terms: UncertaintyTerms };
  warnings: string[];
}

/** One point more than this multiple of the mean is implausible in a duct (common practice). */
export const OUTLIER_OVER_MEAN = 3;
/** Below this Reynolds number duct flow may be laminar and the turbulent-profile layouts do not apply (common practice). */
const LAMINAR_REYNOLDS = 2300;
/** Above this combined uncertainty the result deserves a warning (field traverses typically reach 5–10 %; from memory). */
const HIGH_UNCERTAINTY = 0.1;

function plural(n: number, one: string, many: string): string {
  return `${n} ${n === 1 ? one : many}`;
}

/**
 * Reduces a traverse. Input is assumed validated (see lib/validation/calc.ts): readings must match the
 * layout's shape. Throws AirStateError for impossible air, RangeError for a readings/layout mismatch.
 */
export function reduceTraverse(input: TraverseInput): TraverseResult {
  const kind = input.readingsKind ?? "velocity_pressure";
  const coefficient = input.probeCoefficient ?? 1;
  const standardDensityKgM3 = input.standardDensityKgM3 ?? STANDARD_DENSITY_KG_M3;
  // Only the accuracies actually given replace the defaults (an explicit undefined must not).
  const given = Object.entries(input.instrument ?? {}).filter(([, v]) => v !== undefined);
  const accuracy: InstrumentAccuracy = { ...DEFAULT_INSTRUMENT_ACCURACY, ...Object.fromEntries(given) };
  const layout = buildLayout({
    duct: input.duct,
    method: input.method,
    lines: input.lines ?? input.readings.length,
    pointsPerLine: input.pointsPerLine ?? input.readings[0]?.length ?? 0,
    straightUpstreamM: input.straightUpstreamM,
    straightDownstreamM: input.straightDownstreamM,
    portOffsetM: input.portOffsetM,
  });
  if (input.readings.length !== layout.lineCount || input.readings.some((row) => row.length !== layout.pointsPerLine))
    throw new RangeError(`readings must be ${layout.lineCount} lines of ${layout.pointsPerLine} values`);

  const air = airState(input.air);
  const rho = air.densityKgM3;
  const warnings = [...layout.warnings, ...air.warnings];

  const toVelocity = (reading: number): { pv: number; v: number } => {
    if (kind === "velocity_pressure") return { pv: reading, v: velocityFromPressureMS(reading, rho, air.absolutePressurePa, coefficient) };
    const v = Math.max(0, kind === "velocity_actual" ? reading : actualVelocityFromStandardMS(reading, rho, standardDensityKgM3));
    // Equivalent Pv keeps the sign so a reverse reading still counts as zero/negative in the plane check.
    const pv = reading < 0 ? -velocityPressureFromVelocityPa(Math.abs(reading), rho, air.absolutePressurePa) : velocityPressureFromVelocityPa(v, rho, air.absolutePressurePa);
    return { pv, v };
  };

  const points: TraversePoint[] = [];
  const velocities = layout.lines.map((line, k) =>
    line.points.map((p, i) => {
      const reading = input.readings[k]?.[i] ?? null;
      const converted = reading === null ? null : toVelocity(reading);
      points.push({ line: k, point: i, xM: p.xM, yM: p.yM, depthM: p.depthM, reading, velocityPressurePa: converted?.pv ?? null, velocityMS: converted?.v ?? null });
      return converted?.v ?? null;
    }),
  );
  const read = points.filter((p) => p.velocityMS !== null);
  if (read.length === 0) throw new RangeError("readings: at least one point must be read");
  const missing = points.length - read.length;
  if (missing > 0) warnings.push(`${plural(missing, "point was", "points were")} not read; the mean uses tributary areas around the points read.`);

  const { mean: meanVelocityMS, rule } = planeMean(layout, velocities);
  const areaM2 = ductAreaM2(input.duct);
  const hydraulicDiameterM = equivalentDiameterM(input.duct);
  const flowM3S = areaM2 * meanVelocityMS;
  const massFlowKgS = rho * flowM3S;
  const reynolds = (rho * meanVelocityMS * hydraulicDiameterM) / air.viscosityPaS;
  const maxVelocity = Math.max(...read.map((p) => p.velocityMS ?? 0));
  const maxMach = machNumber(maxVelocity, air.dryBulbC);

  const pvs = read.map((p) => p.velocityPressurePa ?? 0);
  const quality = assessPlane(pvs, read.map((p) => p.velocityMS ?? 0));
  if (quality.zeroOrNegativeCount > 0)
    warnings.push(`${plural(quality.zeroOrNegativeCount, "point reads", "points read")} zero or negative; counted as zero velocity (reverse flow or swirl at the plane?).`);
  if (kind === "velocity_pressure" && quality.lowPressureCount > 0)
    warnings.push(`${plural(quality.lowPressureCount, "point reads", "points read")} under ${LOW_VELOCITY_PRESSURE_PA} Pa, where the gauge's own error is large.`);
  for (const p of read) {
    if (meanVelocityMS > 0 && (p.velocityMS ?? 0) > OUTLIER_OVER_MEAN * meanVelocityMS)
      warnings.push(`Line ${p.line + 1} point ${p.point + 1} reads ${(p.velocityMS ?? 0).toFixed(1)} m/s, over ${OUTLIER_OVER_MEAN} × the mean ${meanVelocityMS.toFixed(1)} m/s: check the reading and the probe.`);
  }
  if (exceedsMachLimit(maxMach)) warnings.push(`Mach ${maxMach.toFixed(2)} at the fastest point is beyond the 0.25 limit of the pitot-static method (ISO 3966).`);
  if (meanVelocityMS > 0 && reynolds < LAMINAR_REYNOLDS) warnings.push(`Reynolds number ${Math.round(reynolds)} is under ${LAMINAR_REYNOLDS}: the flow may be laminar, and the layouts assume turbulent flow.`);
  if (quality.verdict !== "good") warnings.push(`Plane quality is ${quality.verdict}: ${quality.reasons.join(" ")}`);

  const mask = layout.lines.map((line, k) => line.points.map((_, i) => input.readings[k]?.[i] !== null));
  const uncertainty = traverseUncertainty({
    duct: input.duct,
    accuracy,
    readingRelative: kind === "velocity_pressure" ? pressureReadingRelativeUncertainty(pvs, accuracy) : velocityReadingRelativeUncertainty(read.map((p) => p.reading ?? 0), accuracy),
    densityRelative: densityRelativeUncertainty(input.air, accuracy),
    // Q ∝ ρ^(−½) from pitot readings, independent of ρ from actual velocities, ∝ ρ^(−1) from standard velocities.
    densitySensitivity: kind === "velocity_pressure" ? 0.5 : kind === "velocity_actual" ? 0 : 1,
    layoutError: powerLawLayoutError(layout, mask),
    pointCount: read.length,
  });
  if (uncertainty.combined > HIGH_UNCERTAINTY)
    warnings.push(`Estimated uncertainty ±${Number.isFinite(uncertainty.combined) ? (uncertainty.combined * 100).toFixed(1) : "∞"} % is high; see the quality reasons and instrument accuracy.`);

  return {
    air,
    densityKgM3: rho,
    standardDensityKgM3,
    readingsKind: kind,
    meanVelocityMS,
    areaM2,
    hydraulicDiameterM,
    flowM3S,
    standardFlowM3S: massFlowKgS / standardDensityKgM3,
    massFlowKgS,
    reynolds,
    maxMach,
    integrationRule: rule,
    layout,
    points,
    quality,
    uncertainty,
    warnings,
  };
}
