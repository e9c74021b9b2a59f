/**
 * One terminal reading from what was typed to what it means: the airflow (actual and standard) by
 * the method used, the steps taken to get there in words, % of design and the verdict against the
 * project's band, the controller check of a terminal unit, and what is implausible about it. The same
 * code runs on the tablet (live, as values land) and on the server (what is stored and answered), so
 * the screen and the API agree. Framework-free; SI inside, words in the caller's units.
 */
import type { TerminalSetpoint } from "@/db/schema";
import { withinTolerance, percentOfDesign, type Tolerance } from "@/lib/airflow/balancing";
import { barometricPressureFromAltitudePa } from "@/lib/airflow/air";
import {
  ASSUMED_OUTLET_RH_PCT,
  correctedFlowFactor,
  flowPlausibility,
  hoodFlow,
  outletAir,
  outOfRange,
  velocityAreaFlow,
  IMPLAUSIBLE_ABOVE_DESIGN_RATIO,
  IMPLAUSIBLE_BELOW_DESIGN_RATIO,
  type FlowFactorCorrection,
  type VelocityBasis,
} from "@/lib/airflow/terminal-flow";
import { toleranceFor, type ToleranceCategory } from "@/lib/airflow/tolerance";
import { isTerminalUnit } from "@/lib/validation/design";
import { designFlowAt, SETPOINT_LABELS, toleranceCategoryOf, type ReadingMethod, type ReadingPhase, type TerminalDesign } from "./setpoints";

/** Formats SI values for messages, in whatever units the reader uses. */
export interface QuantityFormat {
  flow(m3s: number): string;
  velocity(ms: number): string;
  area(m2: number): string;
  density(kgM3: number): string;
  temperature(c: number): string;
  barometric(pa: number): string;
}

const plain = (v: number, d: number) => new Intl.NumberFormat("en-US", { maximumFractionDigits: d, minimumFractionDigits: 0 }).format(v);

/** SI, for the API's words and for tests. */
export const SI_FORMAT: QuantityFormat = {
  flow: (v) => `${plain(v * 1000, 1)} L/s`,
  velocity: (v) => `${plain(v, 2)} m/s`,
  area: (v) => `${plain(v, 4)} m²`,
  density: (v) => `${plain(v, 3)} kg/m³`,
  temperature: (v) => `${plain(v, 1)} °C`,
  barometric: (v) => `${plain(v / 1000, 2)} kPa`,
};

/** What was read, as stored (SI). Fields of other methods are null. */
export interface ReadingValues {
  method: ReadingMethod;
  phase: ReadingPhase;
  setpoint: TerminalSetpoint;
  hoodFlowM3S: number | null;
  hoodCorrectionFactor: number | null;
  hoodDensityCorrected: boolean | null;
  hoodBackPressureCompensated: boolean | null;
  velocitiesMS: readonly number[] | null;
  velocityBasis: VelocityBasis | null;
  effectiveAreaM2: number | null;
  dryBulbC: number | null;
  relativeHumidityPct: number | null;
  barometricPa: number | null;
  controllerFlowM3S: number | null;
  controllerFlowFactor: number | null;
  damperMarked: boolean;
}

/**
 * What the arithmetic takes from a reading's body: every method's fields in SI, with the terminal's
 * effective area and flow factor and the hood's correction factor from the register filled in where the
 * body leaves them out. The tablet and the server build it the same way; only terminal units keep the
 * controller's displayed airflow.
 */
export function readingValuesFromBody(
  body: Pick<ReadingValues, "method" | "phase"> & Partial<Omit<ReadingValues, "method" | "phase" | "setpoint">>,
  setpoint: TerminalSetpoint,
  terminal: { isUnit: boolean; effectiveAreaM2: number | null; controllerFlowFactor: number | null },
  instrument: { hoodCorrectionFactor: number | null } | null,
): ReadingValues {
  const controllerFlowM3S = terminal.isUnit ? (body.controllerFlowM3S ?? null) : null;
  return {
    method: body.method,
    phase: body.phase,
    setpoint,
    hoodFlowM3S: body.hoodFlowM3S ?? null,
    hoodCorrectionFactor: body.method === "hood" ? (body.hoodCorrectionFactor ?? instrument?.hoodCorrectionFactor ?? 1) : null,
    hoodDensityCorrected: body.hoodDensityCorrected ?? null,
    hoodBackPressureCompensated: body.hoodBackPressureCompensated ?? null,
    velocitiesMS: body.velocitiesMS ?? null,
    velocityBasis: body.velocityBasis ?? null,
    effectiveAreaM2: body.method === "velocity_area" ? (body.effectiveAreaM2 ?? terminal.effectiveAreaM2) : null,
    dryBulbC: body.dryBulbC ?? null,
    relativeHumidityPct: body.relativeHumidityPct ?? null,
    barometricPa: body.barometricPa ?? null,
    controllerFlowM3S,
    controllerFlowFactor: controllerFlowM3S !== null ? (body.controllerFlowFactor ?? terminal.controllerFlowFactor) : null,
    damperMarked: body.damperMarked ?? false,
  };
}

export interface ProjectBasis {
  altitudeM: number;
  standardDensityKgM3: number;
  outletToleranceMinusPct: number;
  outletTolerancePlusPct: number;
  terminalUnitToleranceMinusPct: number;
  terminalUnitTolerancePlusPct: number;
  fanToleranceMinusPct: number;
  fanTolerancePlusPct: number;
  sectionToleranceMinusPct: number;
  sectionTolerancePlusPct: number;
  outsideAirToleranceMinusPct: number;
  outsideAirTolerancePlusPct: number;
}

export interface ComputedFlow {
  flowM3S: number;
  standardFlowM3S: number;
  /** Density of the air at the outlet used to refer the reading, kg/m³; null when none was needed (a traverse brings its own). */
  densityKgM3: number | null;
  /** The barometric pressure the density was worked out at: the barometer's, or the standard atmosphere at the altitude. */
  barometricPa: number | null;
  meanVelocityMS: number | null;
  /** How the figure was reached, in order, in words. */
  steps: string[];
  /** Cautions about the inputs (assumed humidity, a barometer far from the altitude's pressure, an uncompensated hood). */
  warnings: string[];
}

/** A reading's stored columns: what was read and the airflow worked out from it (the server and the demo store it alike). */
export function readingColumns(values: ReadingValues, flow: Pick<ComputedFlow, "densityKgM3" | "flowM3S" | "standardFlowM3S">) {
  return {
    phase: values.phase,
    method: values.method,
    setpoint: values.setpoint,
    hoodFlowM3S: values.hoodFlowM3S,
    hoodCorrectionFactor: values.hoodCorrectionFactor,
    hoodDensityCorrected: values.hoodDensityCorrected,
    hoodBackPressureCompensated: values.hoodBackPressureCompensated,
    velocitiesMS: values.velocitiesMS ? [...values.velocitiesMS] : null,
    velocityBasis: values.velocityBasis,
    effectiveAreaM2: values.effectiveAreaM2,
    dryBulbC: values.dryBulbC,
    relativeHumidityPct: values.relativeHumidityPct,
    barometricPa: values.barometricPa,
    densityKgM3: flow.densityKgM3,
    flowM3S: flow.flowM3S,
    standardFlowM3S: flow.standardFlowM3S,
    controllerFlowM3S: values.controllerFlowM3S,
    controllerFlowFactor: values.controllerFlowFactor,
    damperMarked: values.damperMarked,
  };
}

/** Reading a hood or velocity × area needs the dry-bulb at the outlet, to know the air's density. */
export class ReadingInputError extends Error {
  constructor(
    message: string,
    readonly fields: Record<string, string>,
  ) {
    super(message);
  }
}

/**
 * The airflow of a hood or velocity × area reading (a traverse's flow comes from the traverse). The air
 * density at the outlet comes from the dry-bulb there and the project's altitude (or a barometer), or
 * from `densityKgM3` when it was already worked out (a stored reading).
 */
export function computeReadingFlow(
  values: ReadingValues,
  terminal: Pick<TerminalDesign, "effectiveAreaM2">,
  project: Pick<ProjectBasis, "altitudeM" | "standardDensityKgM3">,
  options: { format?: QuantityFormat; densityKgM3?: number | null } = {},
): ComputedFlow {
  const f = options.format ?? SI_FORMAT;
  if (values.method === "traverse") throw new ReadingInputError("A traverse's airflow comes from the traverse.", { traverseId: "give the traverse" });
  const steps: string[] = [];
  const warnings: string[] = [];
  let densityKgM3: number;
  let barometricPa: number = values.barometricPa ?? barometricPressureFromAltitudePa(project.altitudeM);
  if (options.densityKgM3 !== undefined && options.densityKgM3 !== null) {
    densityKgM3 = options.densityKgM3;
  } else {
    if (values.dryBulbC === null) throw new ReadingInputError("The dry-bulb at the outlet is needed.", { dryBulbC: "give the dry-bulb of the air at the outlet, to work out its density" });
    const air = outletAir({
      dryBulbC: values.dryBulbC,
      altitudeM: project.altitudeM,
      ...(values.relativeHumidityPct !== null ? { relativeHumidityPct: values.relativeHumidityPct } : {}),
      ...(values.barometricPa !== null ? { barometricPa: values.barometricPa } : {}),
    });
    densityKgM3 = air.densityKgM3;
    barometricPa = air.barometricPa;
    warnings.push(...air.warnings);
  }
  if (values.relativeHumidityPct === null)
    warnings.push(`Humidity was not measured at the outlet: ${ASSUMED_OUTLET_RH_PCT} % RH was assumed (at 20 °C, dry or saturated air would change the density by under 0.5 %).`);
  const airWords =
    values.dryBulbC !== null
      ? `air at the outlet (${f.temperature(values.dryBulbC)}, ${f.barometric(barometricPa)}${values.barometricPa === null ? " from the project's altitude" : " by barometer"}: ${f.density(densityKgM3)})`
      : `air at the outlet (${f.density(densityKgM3)})`;

  if (values.method === "hood") {
    if (values.hoodFlowM3S === null || values.hoodDensityCorrected === null)
      throw new ReadingInputError("The hood reading is incomplete.", {
        ...(values.hoodFlowM3S === null ? { hoodFlowM3S: "give the hood's reading" } : {}),
        ...(values.hoodDensityCorrected === null ? { hoodDensityCorrected: "say whether the hood corrected the reading for density" } : {}),
      });
    const k = values.hoodCorrectionFactor ?? 1;
    const r = hoodFlow({ readingM3S: values.hoodFlowM3S, correctionFactor: k, densityCorrected: values.hoodDensityCorrected, densityKgM3, standardDensityKgM3: project.standardDensityKgM3 });
    steps.push(`Hood reading ${f.flow(values.hoodFlowM3S)}${k !== 1 ? ` × correction factor ${plain(k, 3)} = ${f.flow(r.correctedReadingM3S)}` : " (correction factor 1)"}.`);
    if (values.hoodDensityCorrected) {
      steps.push(`The hood corrected for density itself: ${f.flow(r.standardFlowM3S)} at standard air (${f.density(project.standardDensityKgM3)}); actual ${f.flow(r.flowM3S)} with the ${airWords}.`);
    } else {
      steps.push(
        `Not density-corrected by the hood: referred to standard air with the ${airWords}, × ${plain(r.densityRatio!, 4)} (ρ ÷ ${f.density(project.standardDensityKgM3)}) = ${f.flow(r.standardFlowM3S)} at standard air.`,
      );
    }
    if (values.hoodBackPressureCompensated === false)
      warnings.push("The hood's back pressure was not compensated: the hood's resistance lowers the airflow of an outlet fed at low pressure, so the reading may be low. The hood's instructions say when to compensate.");
    return { flowM3S: r.flowM3S, standardFlowM3S: r.standardFlowM3S, densityKgM3, barometricPa, meanVelocityMS: null, steps, warnings };
  }

  const area = values.effectiveAreaM2 ?? terminal.effectiveAreaM2;
  const missing: Record<string, string> = {};
  if (!values.velocitiesMS || values.velocitiesMS.length === 0) missing.velocitiesMS = "give at least one velocity reading";
  if (values.velocityBasis === null) missing.velocityBasis = 'say whether the velocities are "actual" or "standard"';
  if (area === null) missing.effectiveAreaM2 = "give the maker's effective-area factor (Ak): the terminal has none on record";
  if (Object.keys(missing).length > 0) throw new ReadingInputError("The velocity readings are incomplete.", missing);
  const r = velocityAreaFlow({ velocitiesMS: values.velocitiesMS!, basis: values.velocityBasis!, effectiveAreaM2: area!, densityKgM3, standardDensityKgM3: project.standardDensityKgM3 });
  const basisWord = values.velocityBasis === "standard" ? "standard" : "actual";
  steps.push(
    `${r.readingCount} ${basisWord} velocit${r.readingCount === 1 ? "y" : "ies"} averaged: ${f.velocity(r.meanVelocityMS)} × effective area ${f.area(area!)}${values.effectiveAreaM2 !== null && values.effectiveAreaM2 !== terminal.effectiveAreaM2 ? " (typed for this reading)" : " (the maker's Ak on record)"} = ${f.flow(values.velocityBasis === "standard" ? r.standardFlowM3S : r.flowM3S)}.`,
  );
  steps.push(
    values.velocityBasis === "standard"
      ? `Standard velocities give standard airflow; actual ${f.flow(r.flowM3S)} with the ${airWords}.`
      : `Referred to standard air with the ${airWords}: ${f.flow(r.standardFlowM3S)} at standard air.`,
  );
  if (r.readingCount < 3) warnings.push(`Only ${r.readingCount} velocity reading${r.readingCount === 1 ? "" : "s"}: Ak factors assume readings spread over the outlet face as the maker describes.`);
  return { flowM3S: r.flowM3S, standardFlowM3S: r.standardFlowM3S, densityKgM3, barometricPa, meanVelocityMS: r.meanVelocityMS, steps, warnings };
}

export interface InstrumentRange {
  /** "capture hood", "vane anemometer": how the instrument is named in the message. */
  label: string;
  serial: string;
  rangeMin: number | null;
  rangeMax: number | null;
}

export interface Judgement {
  designFlowM3S: number | null;
  pctOfDesign: number | null;
  withinTolerance: boolean | null;
  tolerance: Tolerance;
  toleranceCategory: ToleranceCategory;
  /** Terminal units with a controller reading: measured ÷ displayed and the flow factor that would make them agree. */
  controller: (FlowFactorCorrection & { displayedM3S: number; flowFactor: number | null }) | null;
  /** Implausible or missing things, in words; the reading is kept whatever they say. */
  flags: string[];
}

const pctText = (v: number) => `${plain(v, 0)} %`;

/**
 * The reading against its terminal's design at the setpoint read, with the project's band, and what
 * is implausible about it (a negative airflow, far above or below design, a value beyond the
 * instrument's range, a final reading without the damper marked).
 */
export function judgeReading(
  reading: Pick<ReadingValues, "method" | "phase" | "setpoint" | "hoodFlowM3S" | "velocitiesMS" | "controllerFlowM3S" | "controllerFlowFactor" | "damperMarked"> & { standardFlowM3S: number },
  terminal: TerminalDesign,
  project: ProjectBasis,
  options: { instrument?: InstrumentRange | null; format?: QuantityFormat } = {},
): Judgement {
  const f = options.format ?? SI_FORMAT;
  const category = toleranceCategoryOf(terminal.kind);
  const tolerance = toleranceFor(project, category);
  const design = designFlowAt(terminal, reading.setpoint);
  const flags: string[] = [];
  let pct: number | null = null;
  let within: boolean | null = null;
  if (design !== null && design > 0) {
    pct = percentOfDesign(reading.standardFlowM3S, design);
    within = withinTolerance(reading.standardFlowM3S, design, tolerance);
  } else if (design === 0) {
    flags.push(`The design ${SETPOINT_LABELS[reading.setpoint].toLowerCase()} airflow is zero (the unit closes): there is no % of design; the unit should read close to nothing.`);
  }

  for (const issue of flowPlausibility(reading.standardFlowM3S, design)) {
    if (issue.kind === "negative")
      flags.push(`Negative airflow (${f.flow(issue.valueM3S)}): air moving the wrong way, or the hood or anemometer reading reversed. Check the direction and the outlet's service.`);
    else if (issue.kind === "above-design")
      flags.push(
        `${plain(issue.ratio, 1)} × design: more than ${IMPLAUSIBLE_ABOVE_DESIGN_RATIO} times the design airflow. Check the outlet tag, the hood top or Ak, and the units.`,
      );
    else
      flags.push(
        `${pctText(issue.ratio * 100)} of design: under ${pctText(IMPLAUSIBLE_BELOW_DESIGN_RATIO * 100)} of the design airflow. Check for a closed damper, a blocked outlet, the outlet tag and the units.`,
      );
  }

  const instrument = options.instrument;
  if (instrument && (instrument.rangeMin !== null || instrument.rangeMax !== null)) {
    const range = { min: instrument.rangeMin, max: instrument.rangeMax };
    const fmt = reading.method === "hood" ? f.flow : f.velocity;
    const values = reading.method === "hood" ? (reading.hoodFlowM3S === null ? [] : [reading.hoodFlowM3S]) : reading.method === "velocity_area" ? [...(reading.velocitiesMS ?? [])] : [];
    const beyond = outOfRange(values, range);
    if (beyond.length > 0) {
      const rangeText = `${instrument.rangeMin !== null ? fmt(instrument.rangeMin) : "…"} to ${instrument.rangeMax !== null ? fmt(instrument.rangeMax) : "…"}`;
      const list = beyond
        .slice(0, 5)
        .map((b) => (reading.method === "velocity_area" ? `reading ${b.index + 1}: ${fmt(b.value)}` : fmt(b.value)))
        .join(", ");
      flags.push(`Beyond the range of ${instrument.label} ${instrument.serial} (${rangeText}): ${list}${beyond.length > 5 ? ` and ${beyond.length - 5} more` : ""}. Readings outside the stated range carry no stated accuracy.`);
    }
  }

  let controller: Judgement["controller"] = null;
  if (isTerminalUnit(terminal.kind) && reading.controllerFlowM3S !== null) {
    const flowFactor = reading.controllerFlowFactor ?? terminal.controllerFlowFactor;
    const correction = correctedFlowFactor({ measuredM3S: reading.standardFlowM3S, displayedM3S: reading.controllerFlowM3S, flowFactor });
    controller = { ...correction, displayedM3S: reading.controllerFlowM3S, flowFactor };
    if (correction.ratio === null) flags.push("The controller displayed zero airflow while air was measured: check the controller's sensor tubing and its zero.");
    else if (correction.ratio < 0.5 || correction.ratio > 2)
      flags.push(`Measured airflow is ${plain(correction.ratio, 2)} × the controller's display: a difference this large is more likely swapped sensor tubes, a wrong inlet size or a blocked sensor than a flow factor to adjust.`);
  }

  if (reading.phase === "final" && !isTerminalUnit(terminal.kind) && !reading.damperMarked)
    flags.push("Final reading without the damper position marked: mark it so the setting can be found again.");

  return { designFlowM3S: design, pctOfDesign: pct, withinTolerance: within, tolerance, toleranceCategory: category, controller, flags };
}

/** "104 % of design, within −5 / +10 %": for lists and audit entries. */
export function verdictWords(j: Pick<Judgement, "pctOfDesign" | "withinTolerance">): string {
  if (j.pctOfDesign === null) return "no design airflow to compare";
  return `${pctText(j.pctOfDesign)} of design, ${j.withinTolerance ? "within tolerance" : "outside tolerance"}`;
}
