/**
 * Reducing a traverse: point readings → point velocities → plane mean → actual, standard and mass flow,
 * with plane quality, uncertainty and warnings. Velocities are averaged, never pressures: averaging
 * velocity pressures first over-reads by √(mean u²)/mean u − 1 (about +1 % on a fully developed profile).
 */
import { airStateFor, type AirConditions, type AirState } from "./air";
import { STANDARD_DENSITY_KG_M3 } from "./constants";
import { EngineInputError } from "./errors";
import { developedProfileOf, layoutErrorOnDevelopedProfile, planeMean, type FilledPoint, type GapFillSource, type IntegrationRule } from "./integrate";
import { ductAreaM2, layoutFor, equivalentDiameterM, straightRunClass, type Layout, type LayoutRequest, type StraightRunClass } from "./layout";
import { assessPlaneFromSums, LOW_VELOCITY_PRESSURE_PA, type PlaneQuality } from "./quality";
import {
  COVERAGE_FACTOR,
  DEFAULT_INSTRUMENT_ACCURACY,
  densityRelativeUncertainty,
  formatExpandedUncertainty,
  pressureReadingErrorBound,
  readingRelativeFromSums,
  samplingFromSpreads,
  spreadFromSums,
  traverseFlowUncertainties,
  velocityOverProfile,
  velocityReadingErrorBound,
  type FlowUncertainty,
  type InstrumentAccuracy,
  type SamplingUncertainty,
  type UncertaintyTerms,
} from "./uncertainty";
import { actualVelocityFromStandardMS, exceedsMachLimit, machNumber, pitotStateFactor, velocityFromPressureAtStateMS, velocityPressureFromVelocityPa } from "./velocity";

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

/**
 * Per-point values in layout order, at index line × pointsPerLine + point; NaN where the point was not
 * read (readings are finite numbers or null, see lib/validation/calc.ts). Shared: do not change them.
 */
export interface TraversePointValues {
  reading: readonly number[];
  /** Read, or for anemometer readings the equivalent pitot velocity pressure (the same list as `reading` for pitot readings). */
  velocityPressurePa: readonly number[];
  velocityMS: readonly number[];
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
  /** Per-point records, line by line (built on first use). */
  points: TraversePoint[];
  /** The same per-point values in columns, for callers that would rather not build the records. */
  pointValues: TraversePointValues;
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
  refuseBackwardFlow(read, negative, positive, kind);
}

/** checkForwardFlow from the counts of readings read, negative and positive. */
function refuseBackwardFlow(read: number, negative: number, positive: number, kind: ReadingsKind): void {
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
 * A list of n NaN, to be filled with the values of the points read. Copied from a template kept per
 * size, so every list starts as an array of doubles: storing a velocity then never changes its kind.
 */
const nanTemplates: number[][] = [];
function nanList(n: number): number[] {
  let template = nanTemplates[n];
  if (!template) {
    template = [];
    for (let i = 0; i < n; i++) template.push(Number.NaN);
    nanTemplates[n] = template;
  }
  return template.slice();
}

/**
 * The ratios of the points read to the developed profile, kept between the second and third pass. One
 * list reused from one reduction to the next (nothing keeps it); grown when a grid is larger.
 */
let ratioList: number[] = nanList(128);
function ratioListFor(n: number): number[] {
  if (ratioList.length < n) ratioList = nanList(n);
  return ratioList;
}

/** An anemometer reading's velocity, m/s, never below 0 (actual, or standard referred to the instrument's density). */
function anemometerVelocityMS(kind: ReadingsKind, reading: number, rho: number, instrumentDensityKgM3: number): number {
  return Math.max(0, kind === "velocity_actual" ? reading : actualVelocityFromStandardMS(reading, rho, instrumentDensityKgM3));
}

/** The pitot velocity pressure equivalent to an anemometer reading; a reverse reading keeps its sign, so it still counts as zero/negative in the plane check. */
function equivalentPressurePa(reading: number, velocityMS: number, rho: number, absolutePa: number): number {
  return reading < 0 ? -velocityPressureFromVelocityPa(Math.abs(reading), rho, absolutePa) : velocityPressureFromVelocityPa(velocityMS, rho, absolutePa);
}

/** What a reduction needs of a layout that does not depend on the readings, worked out once per layout object. */
interface PlaneConstants {
  areaM2: number;
  hydraulicDiameterM: number;
  straightRun: StraightRunClass;
  /** The developed reference profile at every read position, and the complete layout's error on it. */
  profile: readonly (readonly number[])[];
  /** The same, flat: index line × pointsPerLine + point. */
  profileFlat: number[];
  completeError: number;
}
const planeConstants = new WeakMap<Layout, PlaneConstants>();

/** Layouts from layoutFor are keyed by the whole request (duct and straight run included), so one layout object has one answer. */
function planeConstantsOf(layout: Layout, input: TraverseInput): PlaneConstants {
  let c = planeConstants.get(layout);
  if (!c) {
    const { grid, completeError } = developedProfileOf(layout);
    const profileFlat: number[] = [];
    for (let k = 0; k < layout.lineCount; k++) for (let i = 0; i < layout.pointsPerLine; i++) profileFlat.push(grid[k]?.[i] ?? 1);
    c = { areaM2: ductAreaM2(input.duct), hydraulicDiameterM: equivalentDiameterM(input.duct), straightRun: straightRunClass(input), profile: grid, profileFlat, completeError };
    planeConstants.set(layout, c);
  }
  return c;
}

/**
 * The layout error of a grid with gaps depends only on the layout and which points were read: while a
 * technician types, the same gaps come back on every recalculation, so the last answer is kept.
 */
let lastGapError: { layout: Layout; read: Uint8Array; error: number } | null = null;

function layoutErrorWithGaps(layout: Layout, profile: readonly (readonly number[])[], pointReadings: readonly number[]): number {
  const count = pointReadings.length;
  const last = lastGapError;
  if (last && last.layout === layout && last.read.length === count) {
    let same = true;
    for (let j = 0; j < count && same; j++) same = last.read[j] === (Number.isNaN(pointReadings[j]!) ? 0 : 1);
    if (same) return last.error;
  }
  const read = new Uint8Array(count);
  for (let j = 0; j < count; j++) read[j] = Number.isNaN(pointReadings[j]!) ? 0 : 1;
  const perLine = layout.pointsPerLine;
  const mask = layout.lines.map((line, k) => line.points.map((_, i) => read[k * perLine + i] === 1));
  const error = layoutErrorOnDevelopedProfile(layout, profile, mask);
  lastGapError = { layout, read, error };
  return error;
}

const ACCURACY_KEYS = Object.keys(DEFAULT_INSTRUMENT_ACCURACY) as (keyof InstrumentAccuracy)[];

/** Only the accuracies actually given replace the defaults (an explicit undefined must not). */
function accuracyOf(given: Partial<InstrumentAccuracy> | undefined): InstrumentAccuracy {
  if (given === undefined) return DEFAULT_INSTRUMENT_ACCURACY;
  const accuracy = { ...DEFAULT_INSTRUMENT_ACCURACY };
  for (const key of ACCURACY_KEYS) {
    const value = given[key];
    if (value !== undefined) accuracy[key] = value;
  }
  return accuracy;
}

/** One record per layout point, line by line: where it is, what was read, its velocity, and how a gap was filled. */
function traversePoints(layout: Layout, values: TraversePointValues, filled: readonly FilledPoint[]): TraversePoint[] {
  const points: TraversePoint[] = [];
  const perLine = layout.pointsPerLine;
  for (const line of layout.lines) {
    for (const p of line.points) {
      const at = p.line * perLine + p.point;
      const read = !Number.isNaN(values.reading[at]!);
      points.push({
        line: p.line,
        point: p.point,
        xM: p.xM,
        yM: p.yM,
        depthM: p.depthM,
        positionM: p.positionM,
        readPositionM: p.readPositionM,
        beyondProbeReach: p.beyondProbeReach,
        reading: read ? values.reading[at]! : null,
        velocityPressurePa: read ? values.velocityPressurePa[at]! : null,
        velocityMS: read ? values.velocityMS[at]! : null,
        filledFrom: null,
        filledVelocityMS: null,
      });
    }
  }
  for (const f of filled) {
    const point = points[f.line * perLine + f.point];
    if (point) {
      point.filledFrom = f.from;
      point.filledVelocityMS = f.value;
    }
  }
  return points;
}

/**
 * The result of a reduction. The per-point records (`points`) are built on first use from `pointValues`:
 * callers that need flows only (continuity, summaries, the report's tables) do not pay for them. A class
 * rather than an object literal with a getter, which costs more to create than the whole reduction.
 */
class Reduction implements TraverseResult {
  declare air: AirState;
  declare densityKgM3: number;
  declare standardDensityKgM3: number;
  declare instrumentStandardDensityKgM3: number | null;
  declare readingsKind: ReadingsKind;
  declare meanVelocityMS: number;
  declare areaM2: number;
  declare hydraulicDiameterM: number;
  declare flowM3S: number;
  declare standardFlowM3S: number;
  declare massFlowKgS: number;
  declare reynolds: number;
  declare maxMach: number;
  declare integrationRule: IntegrationRule;
  declare filled: FilledPoint[];
  declare layout: Layout;
  declare pointValues: TraversePointValues;
  declare quality: PlaneQuality;
  declare uncertainty: TraverseUncertainty;
  declare warnings: string[];
  #points: TraversePoint[] | undefined;

  constructor(r: Omit<TraverseResult, "points">) {
    this.air = r.air;
    this.densityKgM3 = r.densityKgM3;
    this.standardDensityKgM3 = r.standardDensityKgM3;
    this.instrumentStandardDensityKgM3 = r.instrumentStandardDensityKgM3;
    this.readingsKind = r.readingsKind;
    this.meanVelocityMS = r.meanVelocityMS;
    this.areaM2 = r.areaM2;
    this.hydraulicDiameterM = r.hydraulicDiameterM;
    this.flowM3S = r.flowM3S;
    this.standardFlowM3S = r.standardFlowM3S;
    this.massFlowKgS = r.massFlowKgS;
    this.reynolds = r.reynolds;
    this.maxMach = r.maxMach;
    this.integrationRule = r.integrationRule;
    this.filled = r.filled;
    this.layout = r.layout;
    this.pointValues = r.pointValues;
    this.quality = r.quality;
    this.uncertainty = r.uncertainty;
    this.warnings = r.warnings;
    this.#points = undefined;
  }

  get points(): TraversePoint[] {
    return (this.#points ??= traversePoints(this.layout, this.pointValues, this.filled));
  }

  set points(points: TraversePoint[]) {
    this.#points = points;
  }
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
  const accuracy = accuracyOf(input.instrument);
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
  const perLine = layout.pointsPerLine;
  let shapeMatches = input.readings.length === layout.lineCount;
  for (let k = 0; shapeMatches && k < input.readings.length; k++) shapeMatches = input.readings[k]!.length === perLine;
  if (!shapeMatches) throw new RangeError(`readings must be ${layout.lineCount} lines of ${perLine} values`);

  let air: AirState;
  try {
    air = airStateFor(input.air);
  } catch (error) {
    // Backward readings are reported before impossible air, as they always were.
    checkForwardFlow(input.readings, kind);
    throw error;
  }
  const rho = air.densityKgM3;
  const plane = planeConstantsOf(layout, input);
  const profile = plane.profile;
  const profileFlat = plane.profileFlat;

  // Three passes over the points, all on plain locals (no objects: this is most of the engine's time).
  // The first converts each reading once into the per-point values the result keeps (NaN where not
  // read); it holds few values, so the calls of the pitot relation (logarithm and exponential) cost no
  // more than in a bare loop. The second gathers, from those lists, the counts of the forward-flow check
  // and the sums of the plane checks (assessPlane's PlaneSums), of the reading uncertainty (as
  // pressureReadingRelativeUncertainty adds them) and of the ratios to the developed profile; the third,
  // the deviations from the means. Backward readings are refused after the second pass: the conversion
  // before it changes nothing a caller can see.
  const pointCount = layout.lineCount * perLine;
  const isPitot = kind === "velocity_pressure";
  const absolutePa = air.absolutePressurePa;
  const stateFactor = pitotStateFactor(rho, absolutePa);
  const pointReadings = nanList(pointCount);
  const pointVelocities = nanList(pointCount);
  // A pitot reading is its own velocity pressure: one list serves both.
  const pointPressures = isPitot ? pointReadings : nanList(pointCount);
  let readCount = 0;
  let negative = 0;
  let positive = 0;
  for (let k = 0; k < layout.lineCount; k++) {
    const row = input.readings[k]!;
    for (let i = 0; i < perLine; i++) {
      const reading = row[i];
      if (reading === null || reading === undefined) continue;
      const at = k * perLine + i;
      pointReadings[at] = reading;
      if (isPitot) pointVelocities[at] = velocityFromPressureAtStateMS(reading, absolutePa, stateFactor, coefficient);
      else {
        const v = anemometerVelocityMS(kind, reading, rho, instrumentDensityKgM3);
        pointVelocities[at] = v;
        pointPressures[at] = equivalentPressurePa(reading, v, rho, absolutePa);
      }
    }
  }
  // The reading uncertainty's bound per reading: a manometer's ± % of reading + floor on Pv, relative to
  // √Pv; an anemometer's on the velocity read, relative to the velocities.
  const readingFraction = (isPitot ? accuracy.pressureAccuracyPct : accuracy.velocityAccuracyPct) / 100;
  const readingFloor = isPitot ? accuracy.pressureFloorPa : accuracy.velocityFloorMS;
  const ratios = ratioListFor(pointCount);
  let maxPv = -Infinity;
  let maxV = -Infinity;
  let sumV = 0;
  let zeroOrNegativeCount = 0;
  let lowPressureCount = 0;
  let errorSum = 0;
  let scaleSum = 0;
  let ratioSum = 0;
  let n = 0;
  for (let at = 0; at < pointCount; at++) {
    const reading = pointReadings[at]!;
    if (Number.isNaN(reading)) continue;
    readCount++;
    if (reading < 0) negative++;
    else if (reading > 0) positive++;
    const pv = pointPressures[at]!;
    const v = pointVelocities[at]!;
    if (pv > maxPv) maxPv = pv;
    if (v > maxV) maxV = v;
    sumV += v;
    if (pv <= 0) zeroOrNegativeCount++;
    else if (pv < LOW_VELOCITY_PRESSURE_PA) lowPressureCount++;
    if (isPitot) {
      errorSum += pressureReadingErrorBound(pv, readingFraction, readingFloor);
      scaleSum += Math.sqrt(Math.max(pv, 0));
    } else {
      scaleSum += Math.max(reading, 0);
      errorSum += velocityReadingErrorBound(reading, readingFraction, readingFloor);
    }
    const ratio = velocityOverProfile(v, profileFlat[at]!);
    ratios[n++] = ratio;
    ratioSum += ratio;
  }
  refuseBackwardFlow(readCount, negative, positive, kind);
  if (readCount === 0) throw new RangeError("readings: at least one point must be read");
  // The third pass needs the largest Pv and the means: points above a tenth of that Pv, and the squared
  // deviations of the velocities (plane check, flat spread) and of the ratios (developed spread).
  const meanV = sumV / readCount;
  const tenthOfMax = 0.1 * maxPv;
  const ratioMean = ratioSum / readCount;
  let aboveTenthCount = 0;
  let squares = 0;
  let ratioSquares = 0;
  n = 0;
  for (let at = 0; at < pointCount; at++) {
    if (Number.isNaN(pointReadings[at]!)) continue;
    if (pointPressures[at]! > tenthOfMax) aboveTenthCount++;
    const d = pointVelocities[at]! - meanV;
    squares += d * d;
    const e = ratios[n++]! - ratioMean;
    ratioSquares += e * e;
  }
  const missing = pointCount - readCount;
  // Copied by index: concat and for…of are slow on the frozen lists of shared layouts and air states.
  const warnings: string[] = [];
  for (let j = 0; j < layout.warnings.length; j++) warnings.push(layout.warnings[j]!);
  for (let j = 0; j < air.warnings.length; j++) warnings.push(air.warnings[j]!);

  // A complete grid is planeMean's equal-weight case, its mean already summed above.
  let meanVelocityMS = sumV / readCount;
  let rule: IntegrationRule = "equal-weight";
  let filled: FilledPoint[] = [];
  if (missing > 0) {
    const grid = layout.lines.map((line, k) => line.points.map((_, i) => (Number.isNaN(pointReadings[k * perLine + i]!) ? null : pointVelocities[k * perLine + i]!)));
    ({ mean: meanVelocityMS, rule, filled } = planeMean(layout, grid));
    if (rule === "tributary-area")
      warnings.push(`${plural(missing, "point was", "points were")} not read, too many to fill from their counterparts; the mean uses tributary areas around the points read instead of the method's own weights.`);
    else {
      const how = [...new Set(filled.map((f) => FILL_WORDS[f.from]))].join(", ");
      warnings.push(`${plural(missing, "point was", "points were")} not read; the method's own weights were kept and each gap filled from ${how}.`);
    }
  }

  const { areaM2, hydraulicDiameterM } = plane;
  const flowM3S = areaM2 * meanVelocityMS;
  const massFlowKgS = rho * flowM3S;
  const reynolds = (rho * meanVelocityMS * hydraulicDiameterM) / air.viscosityPaS;
  const maxVelocity = Math.max(0, maxV);
  const maxMach = machNumber(maxVelocity, air.dryBulbC);

  const quality = assessPlaneFromSums({ count: readCount, maxPv, maxV, sumV, zeroOrNegativeCount, lowPressureCount, aboveTenthCount, squares }, isPitot);
  if (quality.zeroOrNegativeCount > 0)
    warnings.push(`${plural(quality.zeroOrNegativeCount, "point reads", "points read")} zero or negative; counted as zero velocity (reverse flow or swirl at the plane?).`);
  if (quality.lowPressureCount > 0)
    warnings.push(`${plural(quality.lowPressureCount, "point reads", "points read")} under ${LOW_VELOCITY_PRESSURE_PA} Pa, where the gauge's own error is large.`);
  if (meanVelocityMS > 0 && maxVelocity > OUTLIER_OVER_MEAN * meanVelocityMS) {
    for (let at = 0; at < pointCount; at++) {
      const v = pointVelocities[at]!;
      if (v > OUTLIER_OVER_MEAN * meanVelocityMS) {
        warnings.push(`Line ${Math.floor(at / perLine) + 1} point ${(at % perLine) + 1} reads ${v.toFixed(1)} m/s, over ${OUTLIER_OVER_MEAN} × the mean ${meanVelocityMS.toFixed(1)} m/s: check the reading and the probe.`);
      }
    }
  }
  if (exceedsMachLimit(maxMach)) warnings.push(`Mach ${maxMach.toFixed(2)} at the fastest point is beyond the 0.25 limit of the pitot-static method (ISO 3966).`);
  if (meanVelocityMS > 0 && reynolds < LAMINAR_REYNOLDS) warnings.push(`Reynolds number ${Math.round(reynolds)} is under ${LAMINAR_REYNOLDS}: the flow may be laminar, and the layouts assume turbulent flow.`);
  if (quality.verdict !== "good") warnings.push(`Plane quality is ${quality.verdict}: ${quality.reasons.join(" ")}`);

  // The developed reference profile at every read position serves both the layout term and the sampling
  // term. The spread about a flat profile is the plane check's coefficient of variation.
  const sampling = samplingFromSpreads(readCount < 2 ? 0 : quality.cv, spreadFromSums(readCount, ratioSum, ratioSquares), readCount, plane.straightRun);
  const flows = traverseFlowUncertainties(
    {
      duct: input.duct,
      accuracy,
      readingRelative: readingRelativeFromSums(errorSum, scaleSum),
      densityRelative: densityRelativeUncertainty(input.air, accuracy),
      layoutError: missing > 0 ? layoutErrorWithGaps(layout, profile, pointReadings) : plane.completeError,
      pointCount: readCount,
      samplingRelative: sampling.relative,
    },
    DENSITY_EXPONENT[kind],
  );
  const { actual, standard, mass } = flows;
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

  return new Reduction({
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
    pointValues: { reading: pointReadings, velocityPressurePa: pointPressures, velocityMS: pointVelocities },
    quality,
    uncertainty,
    warnings,
  });
}
