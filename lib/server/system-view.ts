import "server-only";
import { getProjectDesign, listTraversesForProject, type ProjectDesign } from "@/db/queries/airflow";
import { listDeviations } from "@/db/queries/deviations";
import { listConditionsByIds, listTerminalReadings, listTerminalSets, type TerminalReadingRow } from "@/db/queries/terminal-readings";
import { listInstruments } from "@/db/queries/instruments";
import type { AcceptedDeviation, DuctSection, Instrument, OperatingConditions, Project, Terminal, TerminalSet, TerminalSetpoint } from "@/db/schema";
import { motorHeadroom, proportionalBalance, withinTolerance, type BranchPlan, type MotorHeadroom, type Tolerance } from "@/lib/airflow/balancing";
import { compareConditionsAcross, type ConditionDifference, type ConditionsLike } from "@/lib/airflow/conditions";
import { fanVersusOutlets, outletAccuracy, velocityFloorAsFlowM3S, type FanOutletsCheck, type OutletAccuracy } from "@/lib/airflow/fan-outlets";
import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import { designFlowAt, setpointsFor, toleranceCategoryOf } from "@/lib/terminals/setpoints";
import { isTerminalUnit } from "@/lib/validation/design";
import type { DeviationMeasure } from "@/lib/validation/deviations";
import { buildAirflowView, type SectionView, type SystemView } from "./airflow-view";

/**
 * The engineer of record's view of a project: for every system, design against measured at every
 * section, outlet and terminal unit, continuity by mass at junctions, the fan against the sum of its
 * outlets (unaccounted airflow), minimum outside air, balancing aids, and every result judged against
 * its band with any accepted deviation beside it. One read of each table; the arithmetic is the
 * engine's (lib/airflow). The closeout report builder should call `loadSystemDetails(project)` and read
 * `results` (each judged result with its accepted deviation) and `unaccounted` per system.
 */

export type ResultSubject = AcceptedDeviation["subject"];
export type ResultStatus = "within" | "outside" | "not_measured";

/** One judged result: what deviations are accepted against. */
export interface JudgedResult {
  /** `${subject}:${entityId}:${measure}`. */
  key: string;
  subject: ResultSubject;
  entityId: string;
  measure: DeviationMeasure;
  systemId: string;
  systemTag: string;
  /** "S1.2 airflow", "VAV-1 airflow at minimum", "Junction S1 continuity by mass". */
  label: string;
  value: number | null;
  unit: string;
  tolerance: string;
  status: ResultStatus;
  /** When not measured: exactly what is missing. */
  missing: string | null;
  /** The standing acceptance of this result, if any. */
  deviation: AcceptedDeviation | null;
}

export const resultKey = (subject: string, entityId: string, measure: string) => `${subject}:${entityId}:${measure}`;

/** One setpoint of one terminal: design against its latest final (else initial) reading. */
export interface TerminalSetpointRow {
  setpoint: TerminalSetpoint;
  designM3S: number | null;
  reading: TerminalReadingRow | null;
  pctOfDesign: number | null;
  within: boolean | null;
  /** The band this setpoint is judged in (outlets' or terminal units'). */
  band: Tolerance;
  /** The set the reading belongs to, with its review status. */
  setStatus: TerminalSet["status"] | null;
}

export interface TerminalRow {
  terminal: Terminal;
  section: DuctSection;
  unit: boolean;
  setpoints: TerminalSetpointRow[];
}

export interface FanResult {
  designM3S: number;
  measuredM3S: number | null;
  pctOfDesign: number | null;
  within: boolean | null;
  tolerance: Tolerance;
  missing: string[];
}

export interface OutsideAirResult {
  designM3S: number;
  measuredM3S: number | null;
  pctOfDesign: number | null;
  within: boolean | null;
  tolerance: Tolerance;
  /** How it was measured, or why it cannot be. */
  basis: string;
}

export interface JunctionConditions {
  parentId: string;
  differences: ConditionDifference[];
}

export interface FanMotor {
  headroom: MotorHeadroom | null;
  fullLoadAmps: number | null;
  serviceFactor: number | null;
  nameplateMissing: boolean;
}

export interface SystemDetail extends SystemView {
  terminals: TerminalRow[];
  /** Proportional balancing of each branch's outlets from their latest readings (branches whose outlets are all read). */
  outletPlans: BranchPlan[];
  /** Branches whose outlet plan waits for readings: tag → unread outlets. */
  outletPlansWaiting: { branch: string; unread: string[] }[];
  fanResult: FanResult;
  unaccounted: FanOutletsCheck;
  outsideAir: OutsideAirResult | null;
  junctionConditions: JunctionConditions[];
  motor: FanMotor | null;
  results: JudgedResult[];
}

/** The conditions row as the comparison takes it. */
function conditionsOf(row: OperatingConditions | undefined): ConditionsLike | null {
  if (!row) return null;
  return {
    id: row.id,
    fanSpeedRpm: row.fanSpeedRpm,
    vfdHz: row.vfdHz,
    boxes: row.boxes,
    outsideAirDamperPct: row.outsideAirDamperPct,
    ductStaticSetpointPa: row.ductStaticSetpointPa,
    filterState: row.filterState,
  };
}

/** Latest final reading at a setpoint, else the latest initial one (readings newest first). */
export function latestFinalElseInitial(readings: readonly TerminalReadingRow[], setpoint: TerminalSetpoint): TerminalReadingRow | null {
  const at = readings.filter((r) => r.setpoint === setpoint);
  return at.find((r) => r.phase === "final") ?? at.find((r) => r.phase === "initial") ?? null;
}

/** The accuracy of an outlet reading from the register: hoods state ±% + a floor in m³/s; anemometers a floor in m/s. */
function accuracyOfReading(reading: TerminalReadingRow, instruments: Map<string, Instrument>): OutletAccuracy {
  const instrument = reading.instrumentId ? instruments.get(reading.instrumentId) : undefined;
  if (!instrument || instrument.accuracyPct === null) return outletAccuracy(null);
  if (instrument.kind === "capture_hood") return outletAccuracy({ pct: instrument.accuracyPct, floorM3S: instrument.accuracyFloor });
  if ((instrument.kind === "thermal_anemometer" || instrument.kind === "vane_anemometer") && reading.velocitiesMS && reading.velocitiesMS.length > 0) {
    const mean = reading.velocitiesMS.reduce((a, v) => a + v, 0) / reading.velocitiesMS.length;
    const floor = instrument.accuracyFloor === null ? 0 : velocityFloorAsFlowM3S(instrument.accuracyFloor, mean, reading.standardFlowM3S);
    return outletAccuracy({ pct: instrument.accuracyPct, floorM3S: floor });
  }
  return outletAccuracy(null);
}

const pctOf = (measured: number, design: number) => (design > 0 ? (100 * measured) / design : null);

interface Inputs {
  project: Project;
  design: ProjectDesign;
  views: SystemView[];
  readings: TerminalReadingRow[];
  sets: TerminalSet[];
  conditions: Map<string, OperatingConditions>;
  instruments: Map<string, Instrument>;
  deviations: AcceptedDeviation[];
}

/** Pure assembly of the details from what was loaded (tested on the demo through loadSystemDetails). */
export function buildSystemDetails(inputs: Inputs): SystemDetail[] {
  const { project, design, views, readings, sets, conditions, instruments, deviations } = inputs;
  const setStatus = new Map(sets.map((s) => [s.id, s.status]));
  const readingsByTerminal = new Map<string, TerminalReadingRow[]>();
  for (const r of readings) readingsByTerminal.set(r.terminalId, [...(readingsByTerminal.get(r.terminalId) ?? []), r]);
  const standing = new Map(deviations.filter((d) => d.withdrawnAt === null).map((d) => [resultKey(d.subject, d.entityId, d.measure), d]));
  const traverseConditions = (view: SectionView | undefined) => (view?.latest?.conditionsId ? conditionsOf(conditions.get(view.latest.conditionsId)) : null);

  return views.map((view) => {
    const system = view.system;
    const results: JudgedResult[] = [];
    const push = (r: Omit<JudgedResult, "key" | "deviation" | "systemId" | "systemTag">) => {
      const key = resultKey(r.subject, r.entityId, r.measure);
      results.push({ ...r, key, systemId: system.id, systemTag: system.tag, deviation: standing.get(key) ?? null });
    };
    const sectionsById = new Map(view.sections.map((s) => [s.section.id, s]));
    const sectionTol = toleranceFor(project, "section");

    // Sections.
    for (const row of view.sections) {
      const reduced = row.reduction?.ok ?? false;
      push({
        subject: "section",
        entityId: row.section.id,
        measure: "design",
        label: `${row.section.tag} airflow`,
        value: row.pctOfDesign,
        unit: "% of design",
        tolerance: formatTolerance(sectionTol),
        status: row.withinTolerance === null ? "not_measured" : row.withinTolerance ? "within" : "outside",
        missing: reduced ? null : row.latest ? `the traverse of ${row.section.tag} cannot be reduced yet${row.reduction && !row.reduction.ok ? ` (${row.reduction.message})` : ""}` : `no traverse of ${row.section.tag}`,
      });
    }

    // Junctions, with the operating conditions of the traverses summed.
    const junctionConditions: JunctionConditions[] = [];
    for (const j of view.junctions) {
      const members = [j.parent, ...j.children];
      junctionConditions.push({
        parentId: j.parent.id,
        differences: j.status === "checked" ? compareConditionsAcross(members.map((m) => ({ label: `the traverse of ${m.tag}`, conditions: traverseConditions(sectionsById.get(m.id)) }))) : [],
      });
      push({
        subject: "junction",
        entityId: j.parent.id,
        measure: "continuity",
        label: `Junction ${j.parent.tag} continuity by mass`,
        value: j.status === "checked" ? j.junction.imbalancePct : null,
        unit: "% of the trunk's mass flow",
        tolerance: `±${project.continuityTolerancePct} %`,
        status: j.status === "checked" ? (j.junction.pass ? "within" : "outside") : "not_measured",
        missing: j.status === "waiting" ? `reduced traverses of ${j.missing.join(", ")}` : null,
      });
    }

    // Terminals: every setpoint, the latest final reading, else the initial one.
    const systemSections = design.sections.filter((s) => s.systemId === system.id);
    const order = new Map(view.sections.map((s, i) => [s.section.id, i]));
    const systemTerminals = design.terminals
      .filter((t) => systemSections.some((s) => s.id === t.sectionId))
      .sort((a, b) => (order.get(a.sectionId) ?? 0) - (order.get(b.sectionId) ?? 0) || a.tag.localeCompare(b.tag));
    const terminalRows: TerminalRow[] = systemTerminals.map((terminal) => {
      const section = systemSections.find((s) => s.id === terminal.sectionId)!;
      const mine = readingsByTerminal.get(terminal.id) ?? [];
      const band = toleranceFor(project, toleranceCategoryOf(terminal.type));
      const setpoints = setpointsFor({ kind: terminal.type, designMinFlowM3S: terminal.designMinFlowM3S, designHeatingFlowM3S: terminal.designHeatingFlowM3S }).map((setpoint) => {
        const designM3S = designFlowAt({ kind: terminal.type, designFlowM3S: terminal.designFlowM3S, designMinFlowM3S: terminal.designMinFlowM3S, designHeatingFlowM3S: terminal.designHeatingFlowM3S }, setpoint);
        const reading = latestFinalElseInitial(mine, setpoint);
        const pct = reading && designM3S ? pctOf(reading.standardFlowM3S, designM3S) : null;
        const within = reading && designM3S ? withinTolerance(reading.standardFlowM3S, designM3S, band) : null;
        push({
          subject: "terminal",
          entityId: terminal.id,
          measure: setpoint,
          label: setpoint === "design" ? `${terminal.tag} airflow` : `${terminal.tag} airflow at ${setpoint}`,
          value: pct,
          unit: "% of design",
          tolerance: formatTolerance(band),
          status: within === null ? "not_measured" : within ? "within" : "outside",
          missing: reading ? (designM3S ? null : `no design airflow scheduled at ${setpoint}`) : `no reading of ${terminal.tag}${setpoint === "design" ? "" : ` at ${setpoint}`}`,
        });
        return { setpoint, designM3S, reading, pctOfDesign: pct, within, band, setStatus: reading ? (setStatus.get(reading.setId) ?? null) : null };
      });
      return { terminal, section, unit: isTerminalUnit(terminal.type), setpoints };
    });
    const outlets = terminalRows.filter((t) => !t.unit);

    // Proportional balancing of each branch's outlets.
    const outletPlans: BranchPlan[] = [];
    const outletPlansWaiting: { branch: string; unread: string[] }[] = [];
    for (const section of systemSections) {
      const mine = outlets.filter((o) => o.section.id === section.id);
      if (mine.length < 2) continue;
      const unread = mine.filter((o) => !o.setpoints[0]?.reading).map((o) => o.terminal.tag);
      if (unread.length > 0) {
        outletPlansWaiting.push({ branch: section.tag, unread });
        continue;
      }
      const plan = proportionalBalance(
        mine.map((o) => ({ id: o.terminal.tag, branch: section.tag, designM3S: o.terminal.designFlowM3S, measuredM3S: o.setpoints[0]!.reading!.standardFlowM3S })),
        { tolerance: toleranceFor(project, "outlet") },
      );
      outletPlans.push(...plan.branches);
    }

    // The fan: the roots of the duct tree against the system's design airflow.
    const roots = view.sections.filter((s) => s.depth === 0);
    const missingRoots = roots.filter((r) => !r.reduction?.ok).map((r) => r.section.tag);
    const fanMeasured = roots.length > 0 && missingRoots.length === 0 ? roots.reduce((a, r) => a + (r.reduction as { ok: true; result: { standardFlowM3S: number } }).result.standardFlowM3S, 0) : null;
    const fanTol = toleranceFor(project, "fan");
    const fanResult: FanResult = {
      designM3S: system.designFlowM3S,
      measuredM3S: fanMeasured,
      pctOfDesign: fanMeasured === null ? null : pctOf(fanMeasured, system.designFlowM3S),
      within: fanMeasured === null ? null : withinTolerance(fanMeasured, system.designFlowM3S, fanTol),
      tolerance: fanTol,
      missing: roots.length === 0 ? ["a trunk leaving the fan in the design"] : missingRoots.map((t) => `a reduced traverse of ${t}`),
    };
    push({
      subject: "system",
      entityId: system.id,
      measure: "fan",
      label: `${system.tag} fan airflow`,
      value: fanResult.pctOfDesign,
      unit: "% of design",
      tolerance: formatTolerance(fanTol),
      status: fanResult.within === null ? "not_measured" : fanResult.within ? "within" : "outside",
      missing: fanResult.measuredM3S === null ? fanResult.missing.join(", ") : null,
    });

    // The fan against the sum of its outlets.
    const unaccounted = fanVersusOutlets(
      roots.map((r) => ({
        tag: r.section.tag,
        standardFlowM3S: r.reduction?.ok ? r.reduction.result.standardFlowM3S : null,
        relativeStandardUncertainty: r.reduction?.ok ? r.reduction.result.uncertainty.standard.combined : null,
        missingReason: r.latest ? (r.reduction && !r.reduction.ok ? `its traverse cannot be reduced yet: ${r.reduction.message}` : "its traverse cannot be reduced yet") : "no traverse taken",
        conditions: traverseConditions(r),
      })),
      outlets.map((o) => {
        const reading = o.setpoints[0]?.reading ?? null;
        const fromTraverse = reading?.method === "traverse" && reading.traverseId ? [...sectionsById.values()].find((s) => s.latest?.id === reading.traverseId) : undefined;
        return {
          tag: o.terminal.tag,
          standardFlowM3S: reading?.standardFlowM3S ?? null,
          phase: reading?.phase ?? null,
          accuracy: reading ? accuracyOfReading(reading, instruments) : outletAccuracy(null),
          ...(fromTraverse?.reduction?.ok ? { relativeStandardUncertainty: fromTraverse.reduction.result.uncertainty.standard.combined } : {}),
          conditions: reading?.conditionsId ? conditionsOf(conditions.get(reading.conditionsId)) : null,
        };
      }),
    );
    push({
      subject: "system",
      entityId: system.id,
      measure: "unaccounted",
      label: `${system.tag} unaccounted airflow (fan against outlets)`,
      value: unaccounted.status === "complete" ? unaccounted.unaccountedPct : null,
      unit: "% of the fan's airflow",
      tolerance: `±${project.continuityTolerancePct} %`,
      status: unaccounted.status === "complete" ? (Math.abs(unaccounted.unaccountedPct) <= project.continuityTolerancePct + 1e-9 ? "within" : "outside") : "not_measured",
      missing: unaccounted.status === "complete" ? null : unaccounted.message,
    });

    // Minimum outside air.
    let outsideAir: OutsideAirResult | null = null;
    if (system.designOutsideAirM3S !== null && system.designOutsideAirM3S > 0) {
      const oaTol = toleranceFor(project, "outsideAir");
      const intakes = terminalRows.filter((t) => t.terminal.service === "outside_air");
      let measured: number | null = null;
      let basis: string;
      if (system.kind === "outside_air") {
        measured = fanMeasured;
        basis = fanMeasured === null ? `Not measured: ${fanResult.missing.join(", ")}.` : "The fan's traversed airflow (an outside-air system).";
      } else if (intakes.length > 0) {
        const unread = intakes.filter((t) => !t.setpoints[0]?.reading).map((t) => t.terminal.tag);
        measured = unread.length === 0 ? intakes.reduce((a, t) => a + t.setpoints[0]!.reading!.standardFlowM3S, 0) : null;
        basis = unread.length === 0 ? `Sum of the outside-air intakes ${intakes.map((t) => t.terminal.tag).join(", ")}.` : `Not measured: no reading of ${unread.join(", ")}.`;
      } else {
        basis = "Not measured: no outside-air intake or outside-air duct of this system is scheduled to be read. Add the intake as an inlet (service outside air) in Set-up to measure it.";
      }
      outsideAir = {
        designM3S: system.designOutsideAirM3S,
        measuredM3S: measured,
        pctOfDesign: measured === null ? null : pctOf(measured, system.designOutsideAirM3S),
        within: measured === null ? null : withinTolerance(measured, system.designOutsideAirM3S, oaTol),
        tolerance: oaTol,
        basis,
      };
      push({
        subject: "system",
        entityId: system.id,
        measure: "outside_air",
        label: `${system.tag} minimum outside air`,
        value: outsideAir.pctOfDesign,
        unit: "% of design",
        tolerance: formatTolerance(oaTol),
        status: outsideAir.within === null ? "not_measured" : outsideAir.within ? "within" : "outside",
        missing: measured === null ? basis : null,
      });
    }

    const motor: FanMotor | null = view.fan
      ? {
          headroom: system.motorPowerKw !== null ? motorHeadroom(view.fan.powerFactor, { powerKw: system.motorPowerKw, serviceFactor: system.motorServiceFactor }) : null,
          fullLoadAmps: system.motorFullLoadAmps,
          serviceFactor: system.motorServiceFactor,
          nameplateMissing: system.motorPowerKw === null,
        }
      : null;

    return { ...view, terminals: terminalRows, outletPlans, outletPlansWaiting, fanResult, unaccounted, outsideAir, junctionConditions, motor, results };
  });
}

/** Loads and assembles the details of every system of a project. */
export async function loadSystemDetails(project: Project): Promise<SystemDetail[]> {
  const [design, traverses, { rows: readings }, sets, instruments, deviations] = await Promise.all([
    getProjectDesign({ projectId: project.id }),
    listTraversesForProject({ projectId: project.id }),
    listTerminalReadings({ projectId: project.id }),
    listTerminalSets({ projectId: project.id }),
    listInstruments({ includeRetired: true }),
    listDeviations({ projectId: project.id }),
  ]);
  const conditionIds = [...traverses.flatMap((t) => (t.conditionsId ? [t.conditionsId] : [])), ...readings.flatMap((r) => (r.conditionsId ? [r.conditionsId] : []))];
  const conditions = new Map((await listConditionsByIds({ ids: conditionIds })).map((c) => [c.id, c]));
  return buildSystemDetails({
    project,
    design,
    views: buildAirflowView(project, design, traverses),
    readings,
    sets,
    conditions,
    instruments: new Map(instruments.map((i) => [i.id, i])),
    deviations,
  });
}

/** Every judged result of the project, flattened (exceptions, deviations, the owner's dashboard, the report). */
export function allResults(details: readonly SystemDetail[]): JudgedResult[] {
  return details.flatMap((d) => d.results);
}

/** Progress as the owner reads it: newest traverse per section, newest reading per terminal setpoint. */
export interface Progress {
  sections: { total: number; traversed: number; approved: number };
  terminalSetpoints: { total: number; read: number; approved: number };
}

export function progressOf(details: readonly SystemDetail[]): Progress {
  const sections = details.flatMap((d) => d.sections);
  const setpoints = details.flatMap((d) => d.terminals.flatMap((t) => t.setpoints));
  return {
    sections: {
      total: sections.length,
      traversed: sections.filter((s) => s.reduction?.ok).length,
      approved: sections.filter((s) => s.latest?.status === "approved").length,
    },
    terminalSetpoints: {
      total: setpoints.length,
      read: setpoints.filter((s) => s.reading).length,
      approved: setpoints.filter((s) => s.reading && s.setStatus === "approved").length,
    },
  };
}
