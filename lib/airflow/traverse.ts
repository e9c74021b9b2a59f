/**
 * Reducing a traverse: point readings → point velocities → plane mean → actual, standard and mass flow,
 * with plane quality, uncertainty and warnings. Velocities are averaged, never pressures: averaging
 * velocity pressures first over-reads by √(mean u²)/mean u − 1 (about +1 % on a fully developed profile).
 */
import { airState, type AirConditions, type AirState } from "./air";
import { STANDARD_DENSITY_KG_M3 } from "./constants";
import { EngineInputError } from "./errors";
import { developedProfileOf, layoutErrorOnDevelopedProfile, planeMean, type FilledPoint, type GapFillSource, type IntegrationRule } from "./integrate";
import { ductAreaM2, layoutFor, equivalentDiameterM, straightRunClass, type Layout, type LayoutRequest } from "./layout";
import { assessPlane, LOW_VELOCITY_PRESSURE_PA, type PlaneQuality } from "./quality";
import {
  COVERAGE_FACTOR,
  DEFAULT_INSTRUMENT_ACCURACY,
  densityRelativeUncertainty,
  formatExpandedUncertainty,
  pressureReadingRelativeUncertainty,
  samplingUncertainty,
  traverseUncertainty,
  velocityReadingRelativeUncertainty,
  type FlowUncertainty,
  type InstrumentAccuracy,
  type SamplingUncertainty,
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
  /** The project's standard air density, kg/m³, that defines standard flow (default 1.204). */
  standardDensityKgM3?: number;
  /**
   * For "velocity_standard" readings: the density the anemometer refers its standard velocity to, kg/m³
   * (its own reference, from its manual). Default: standardDensityKgM3.
   */
  instrumentStandardDensityKgM3?: number;
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
  /** The method's published position along the line, and where the probe actually read (see LayoutPoint). */
  positionM: number;
  readPositionM: number;
  beyondProbeReach: boolean;
  reading: number | null;
  /** Read, or for anemometer readings the equivalent pitot velocity pressure. */
  velocityPressurePa: number | null;
  velocityMS: number | null;
  /** For a point not read whose gap was filled: how, and the velocity used in the mean. */
  filledFrom: GapFillSource | null;
  filledVelocityMS: number | null;
}

/** Uncertainty of the three flows; `combined`, `expanded` and `terms` at the top are the standard flow's. */
export interface TraverseUncertainty extends FlowUncertainty {
  /** Combined relative standard uncertainty (k = 1) of the standard flow. */
  combined: number;
  /** Expanded relative uncertainty (k = 2, about 95 %) of the standard flow. */
  expanded: number;
  terms: UncertaintyTerms;
  actual: FlowUncertainty;
  standard: FlowUncertainty;
  mass: FlowUncertainty;
  sampling: SamplingUncertainty;
}

export interface TraverseResult {
  air: AirState;
  densityKgM3: number;
  standardDensityKgM3: number;
  /** The reference density of standard-velocity readings (null for other kinds). */
  instrumentStandardDensityKgM3: number | null;
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
  /** Points not read whose gaps were filled from counterparts (empty when none, or when tributary areas were used). */
  filled: FilledPoint[];
  layout: Layout;
  points: TraversePoint[];
  quality: PlaneQuality;
  uncertainty: TraverseUncertainty;
  warnings: string[];
}

/** One point more than this multiple of the mean is implausible in a duct (common practice). */
export const OUTLIER_OVER_MEAN = 3;
/** Below this Reynolds number duct flow may be laminar and the turbulent-profile layouts do not apply (common practice). */
const LAMINAR_REYNOLDS = 2300;
/** Above this expanded uncertainty (k = 2) the result deserves a warning (field traverses typically reach 5–10 %; from memory). */
const HIGH_EXPANDED_UNCERTAINTY = 0.1;
/** More than this share of negative readings means the pitot hoses are most likely swapped (common practice). */
const REVERSED_SHARE = 0.5;

/**
 * Exponent of the density in each flow for each kind of reading (see lib/airflow/uncertainty.ts):
 * pitot V ∝ ρ^(−½); actual velocities are independent of ρ; standard velocities are mass flux.
 */
const DENSITY_EXPONENT: Record<ReadingsKind, { actual: number; standard: number; mass: number }> = {
  velocity_pressure: { actual: 0.5, standard: 0.5, mass: 0.5 },
  velocity_actual: { actual: 0, standard: 1, mass: 1 },
  velocity_standard: { actual: 1, standard: 0, mass: 0 },
};

function plural(n: number, one: string, many: string): string {
  return `${n} ${n === 1 ? one : many}`;
}

const FILL_WORDS: Record<GapFillSource, string> = {
  mirror: "the point at the same radius or mirrored position",
  "along-line": "interpolation along the line",
  "across-lines": "interpolation across the lines",
  "same-radius": "the points at the same radius on the other diameters",
};

/** Refuses readings that cannot be a traverse of forward flow: most negative (hoses swapped), or none positive. */
function checkForwardFlow(readings: readonly (readonly (number | null)[])[], kind: ReadingsKind): void {
  let read = 0;
  let negative = 0;
  let positive = 0;
  for (const row of readings) {
    for (const v of row) {
      if (v === null) continue;
      read++;
      if (v < 0) negative++;
      else if (v > 0) positive++;
    }
  }
  if (read > 0 && negative / read > REVERSED_SHARE) {
    const what = kind === "velocity_pressure"
      ? "the total and static connections of the pitot tube (or the manometer ports) may be reversed: swap them and read again"
      : "the anemometer may be facing downstream: turn it to face the flow and read again";
    throw new EngineInputError(`Most readings are negative (${negative} of ${read}): ${what}.`, {
      readings: `${negative} of ${read} readings are negative; ${what}. If the flow here really runs backwards, this plane cannot be traversed.`,
    });
  }
  if (read > 0 && positive === 0) {
    throw new EngineInputError(`No reading shows forward flow (${read} read, none above 0).`, {
      readings: `none of the ${read} readings is above 0, so there is no flow to integrate; check that the fan runs, the tubing is connected and the probe faces the flow`,
    });
  }
}

/**
 * Working lists of the points read, reused from one reduction to the next (allocating typed arrays on
 * every call costs more than the arithmetic). Only the functions reduceTraverse calls synchronously see
 * them, and none keeps them.
 */
function newScratch(size: number) {
  return { pvsAll: new Float64Array(size), velocitiesAll: new Float64Array(size), developedAll: new Float64Array(size), readingsAll: new Float64Array(size), indexAll: new Int32Array(size) };
}
let scratch = newScratch(128);
function scratchFor(size: number): typeof scratch {
  if (scratch.pvsAll.length < size) scratch = newScratch(size);
  return scratch;
}

/** A reading → its velocity (m/s, never below 0), and the velocity pressure the plane checks use. */
interface Converter {
  velocity(reading: number): number;
  /** The reading itself for pitot readings; for anemometers the equivalent Pv, keeping a reverse reading's sign. */
  pressure(reading: number, velocity: number): number;
}

function converter(kind: ReadingsKind, rho: number, absolutePa: number, coefficient: number, instrumentDensityKgM3: number): Converter {
  if (kind === "velocity_pressure") return { velocity: (pv) => velocityFromPressureMS(pv, rho, absolutePa, coefficient), pressure: (pv) => pv };
  return {
    velocity: (r) => Math.max(0, kind === "velocity_actual" ? r : actualVelocityFromStandardMS(r, rho, instrumentDensityKgM3)),
    // Equivalent Pv keeps the sign so a reverse reading still counts as zero/negative in the plane check.
    pressure: (r, v) => (r < 0 ? -velocityPressureFromVelocityPa(Math.abs(r), rho, absolutePa) : velocityPressureFromVelocityPa(v, rho, absolutePa)),
  };
}

/** One record per layout point, line by line: where it is, what was read, its velocity, and how a gap was filled. */
function traversePoints(layout: Layout, readings: readonly (readonly (number | null)[])[], convert: Converter, filled: readonly FilledPoint[]): TraversePoint[] {
  const points: TraversePoint[] = [];
  for (const line of layout.lines) {
    for (const p of line.points) {
      const reading = readings[p.line]?.[p.point] ?? null;
      const v = reading === null ? null : convert.velocity(reading);
      points.push({
        line: p.line,
        point: p.point,
        xM: p.xM,
        yM: p.yM,
        depthM: p.depthM,
        positionM: p.positionM,
        readPositionM: p.readPositionM,
        beyondProbeReach: p.beyondProbeReach,
        reading,
        velocityPressurePa: reading === null || v === null ? null : convert.pressure(reading, v),
        velocityMS: v,
        filledFrom: null,
        filledVelocityMS: null,
      });
    }
  }
  for (const f of filled) {
    const point = points[f.line * layout.pointsPerLine + f.point];
    if (point) {
      point.filledFrom = f.from;
      point.filledVelocityMS = f.value;
    }
  }
  return points;
}

/**
 * Reduces a traverse. Input is assumed validated (see lib/validation/calc.ts): readings must match the
 * layout's shape. Throws AirStateError for impossible air, EngineInputError (field `readings`) when most
 * readings are negative (swapped connections) or none is positive, RangeError for a readings/layout mismatch.
 */
export function reduceTraverse(input: TraverseInput): TraverseResult {
  const kind = input.readingsKind ?? "velocity_pressure";
  const coefficient = input.probeCoefficient ?? 1;
  const standardDensityKgM3 = input.standardDensityKgM3 ?? STANDARD_DENSITY_KG_M3;
  const instrumentDensityKgM3 = input.instrumentStandardDensityKgM3 ?? standardDensityKgM3;
  // Only the accuracies actually given replace the defaults (an explicit undefined must not).
  const given = Object.entries(input.instrument ?? {}).filter(([, v]) => v !== undefined);
  const accuracy: InstrumentAccuracy = { ...DEFAULT_INSTRUMENT_ACCURACY, ...Object.fromEntries(given) };
  const layout = layoutFor({
    duct: input.duct,
    method: input.method,
    lines: input.lines ?? input.readings.length,
    pointsPerLine: input.pointsPerLine ?? input.readings[0]?.length ?? 0,
    straightUpstreamM: input.straightUpstreamM,
    straightDownstreamM: input.straightDownstreamM,
    portOffsetM: input.portOffsetM,
    probeHeadDiameterM: input.probeHeadDiameterM,
  });
  if (input.readings.length !== layout.lineCount || input.readings.some((row) => row.length !== layout.pointsPerLine))
    throw new RangeError(`readings must be ${layout.lineCount} lines of ${layout.pointsPerLine} values`);
  checkForwardFlow(input.readings, kind);

  const air = airState(input.air);
  const rho = air.densityKgM3;
  const warnings = [...layout.warnings, ...air.warnings];

  // One pass over the points: velocities and the lists of points read that the checks use. The
  // per-point records (`points`) are built from the same conversion when a caller first asks for them.
  const { grid: profile, completeError } = developedProfileOf(layout);
  const perLine = layout.pointsPerLine;
  const { pvsAll, velocitiesAll, developedAll, readingsAll, indexAll } = scratchFor(layout.lineCount * perLine);
  const convert = converter(kind, rho, air.absolutePressurePa, coefficient, instrumentDensityKgM3);
  let readCount = 0;
  let velocitySum = 0;
  let maxVelocity = 0;
  for (let k = 0; k < layout.lineCount; k++) {
    const row = input.readings[k]!;
    for (let i = 0; i < perLine; i++) {
      const reading = row[i] ?? null;
      if (reading === null) continue;
      const n = readCount++;
      const v = convert.velocity(reading);
      pvsAll[n] = convert.pressure(reading, v);
      velocitiesAll[n] = v;
      developedAll[n] = profile[k]?.[i] ?? 1;
      readingsAll[n] = reading;
      indexAll[n] = k * perLine + i;
      velocitySum += v;
      if (v > maxVelocity) maxVelocity = v;
    }
  }
  if (readCount === 0) throw new RangeError("readings: at least one point must be read");
  const pvs = pvsAll.subarray(0, readCount);
  const readVelocities = velocitiesAll.subarray(0, readCount);
  const developed = developedAll.subarray(0, readCount);
  const readings = readingsAll.subarray(0, readCount);
  const pointCount = layout.lineCount * perLine;
  const missing = pointCount - readCount;

  // A complete grid is planeMean's equal-weight case, its mean already summed above.
  const { mean: meanVelocityMS, rule, filled } =
    missing === 0
      ? { mean: velocitySum / readCount, rule: "equal-weight" as const, filled: [] as FilledPoint[] }
      : planeMean(layout, input.readings.map((row) => row.map((r) => (r === null ? null : convert.velocity(r)))));
  if (missing > 0 && rule === "tributary-area")
    warnings.push(`${plural(missing, "point was", "points were")} not read, too many to fill from their counterparts; the mean uses tributary areas around the points read instead of the method's own weights.`);
  else if (missing > 0) {
    const how = [...new Set(filled.map((f) => FILL_WORDS[f.from]))].join(", ");
    warnings.push(`${plural(missing, "point was", "points were")} not read; the method's own weights were kept and each gap filled from ${how}.`);
  }

  const areaM2 = ductAreaM2(input.duct);
  const hydraulicDiameterM = equivalentDiameterM(input.duct);
  const flowM3S = areaM2 * meanVelocityMS;
  const massFlowKgS = rho * flowM3S;
  const reynolds = (rho * meanVelocityMS * hydraulicDiameterM) / air.viscosityPaS;
  const maxMach = machNumber(maxVelocity, air.dryBulbC);

  const quality = assessPlane(pvs, readVelocities, { readAsPressures: kind === "velocity_pressure" });
  if (quality.zeroOrNegativeCount > 0)
    warnings.push(`${plural(quality.zeroOrNegativeCount, "point reads", "points read")} zero or negative; counted as zero velocity (reverse flow or swirl at the plane?).`);
  if (quality.lowPressureCount > 0)
    warnings.push(`${plural(quality.lowPressureCount, "point reads", "points read")} under ${LOW_VELOCITY_PRESSURE_PA} Pa, where the gauge's own error is large.`);
  for (let n = 0; n < readCount; n++) {
    const v = readVelocities[n]!;
    if (meanVelocityMS > 0 && v > OUTLIER_OVER_MEAN * meanVelocityMS) {
      const at = indexAll[n]!;
      warnings.push(`Line ${Math.floor(at / perLine) + 1} point ${(at % perLine) + 1} reads ${v.toFixed(1)} m/s, over ${OUTLIER_OVER_MEAN} × the mean ${meanVelocityMS.toFixed(1)} m/s: check the reading and the probe.`);
    }
  }
  if (exceedsMachLimit(maxMach)) warnings.push(`Mach ${maxMach.toFixed(2)} at the fastest point is beyond the 0.25 limit of the pitot-static method (ISO 3966).`);
  if (meanVelocityMS > 0 && reynolds < LAMINAR_REYNOLDS) warnings.push(`Reynolds number ${Math.round(reynolds)} is under ${LAMINAR_REYNOLDS}: the flow may be laminar, and the layouts assume turbulent flow.`);
  if (quality.verdict !== "good") warnings.push(`Plane quality is ${quality.verdict}: ${quality.reasons.join(" ")}`);

  // The developed reference profile at every read position serves both the layout term and the sampling term.
  const mask = missing > 0 ? layout.lines.map((line, k) => line.points.map((_, i) => input.readings[k]?.[i] !== null)) : undefined;
  const sampling = samplingUncertainty(readVelocities, developed, straightRunClass(input));
  const common = {
    duct: input.duct,
    accuracy,
    readingRelative: kind === "velocity_pressure" ? pressureReadingRelativeUncertainty(pvs, accuracy) : velocityReadingRelativeUncertainty(readings, accuracy),
    densityRelative: densityRelativeUncertainty(input.air, accuracy),
    layoutError: mask ? layoutErrorOnDevelopedProfile(layout, profile, mask) : completeError,
    pointCount: readCount,
    samplingRelative: sampling.relative,
  };
  const exponents = DENSITY_EXPONENT[kind];
  const actual = traverseUncertainty(common, exponents.actual);
  const standard = traverseUncertainty(common, exponents.standard);
  const mass = traverseUncertainty(common, exponents.mass);
  const uncertainty: TraverseUncertainty = {
    terms: standard.terms,
    combined: standard.combined,
    expanded: standard.expanded,
    coverageFactor: COVERAGE_FACTOR,
    actual,
    standard,
    mass,
    sampling,
  };
  const worst = Math.max(actual.expanded, standard.expanded, mass.expanded);
  if (!(worst <= HIGH_EXPANDED_UNCERTAINTY))
    warnings.push(`Expanded uncertainty of the flow is high, up to ${formatExpandedUncertainty(worst)}; see the quality reasons, the number of points and the instrument accuracy.`);

  // The records are built on first use from a copy of the readings (the caller may reuse its grid).
  const readingsCopy = input.readings.map((row) => row.slice());
  let points: TraversePoint[] | undefined;
  return {
    air,
    densityKgM3: rho,
    standardDensityKgM3,
    instrumentStandardDensityKgM3: kind === "velocity_standard" ? instrumentDensityKgM3 : null,
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
    filled,
    layout,
    get points() {
      points ??= traversePoints(layout, readingsCopy, convert, filled);
      return points;
    },
    quality,
    uncertainty,
    warnings,
  };
}
