import "server-only";
import type { TerminalReadingRow } from "@/db/queries/terminal-readings";
import type { Instrument, Project, Terminal } from "@/db/schema";
import { instrumentName, KIND_INFO } from "@/lib/instruments/kinds";
import { quantityFormat } from "@/lib/terminals/format";
import { computeReadingFlow, judgeReading, type InstrumentRange, type QuantityFormat, type ReadingValues } from "@/lib/terminals/reading";
import type { TerminalDesign } from "@/lib/terminals/setpoints";
import { unitSystemFor, type UnitSystem } from "@/lib/units";

/** A stored terminal's design as the evaluation functions take it (the table calls the kind `type`). */
export function designOf(terminal: Terminal): TerminalDesign {
  return {
    kind: terminal.type,
    designFlowM3S: terminal.designFlowM3S,
    designMinFlowM3S: terminal.designMinFlowM3S,
    designHeatingFlowM3S: terminal.designHeatingFlowM3S,
    effectiveAreaM2: terminal.effectiveAreaM2,
    controllerFlowFactor: terminal.controllerFlowFactor,
  };
}

/** A stored row as the evaluation functions take it. */
export function readingValues(row: TerminalReadingRow): ReadingValues {
  return {
    method: row.method,
    phase: row.phase,
    setpoint: row.setpoint,
    hoodFlowM3S: row.hoodFlowM3S,
    hoodCorrectionFactor: row.hoodCorrectionFactor,
    hoodDensityCorrected: row.hoodDensityCorrected,
    hoodBackPressureCompensated: row.hoodBackPressureCompensated,
    velocitiesMS: row.velocitiesMS,
    velocityBasis: row.velocityBasis,
    effectiveAreaM2: row.effectiveAreaM2,
    dryBulbC: row.dryBulbC,
    relativeHumidityPct: row.relativeHumidityPct,
    barometricPa: row.barometricPa,
    controllerFlowM3S: row.controllerFlowM3S,
    controllerFlowFactor: row.controllerFlowFactor,
    damperMarked: row.damperMarked,
  };
}

/** How an instrument is named in a range message, and its range. */
export function instrumentRange(instrument: Instrument | null | undefined): InstrumentRange | null {
  if (!instrument) return null;
  return { label: KIND_INFO[instrument.kind].label.toLowerCase(), serial: instrument.serial, rangeMin: instrument.rangeMin, rangeMax: instrument.rangeMax };
}

/** The words of readings in the API: the project's own units (the units its schedule is written in). */
export function apiFormat(project: Pick<Project, "unitSystem">): QuantityFormat {
  return quantityFormat(project.unitSystem);
}

export function formatFor(user: { unitSystem: UnitSystem | null }, project: Pick<Project, "unitSystem">): QuantityFormat {
  return quantityFormat(unitSystemFor(user, project));
}

/**
 * A reading as the API answers it (camelCase, SI numbers): what was read, the airflow worked out
 * (actual and standard), the design at the setpoint read with % of design and the verdict, the
 * controller check of a terminal unit, the steps in words, cautions (`warnings`) and what is
 * implausible (`flags`). Flags are worked out against today's design and register, so a changed
 * design airflow shows on old readings too.
 */
export function terminalReadingJson(
  row: TerminalReadingRow,
  { terminal, project, instruments, format }: { terminal: Terminal; project: Project; instruments: ReadonlyMap<string, Instrument>; format?: QuantityFormat },
) {
  const f = format ?? apiFormat(project);
  const values = readingValues(row);
  const design = designOf(terminal);
  const instrument = row.instrumentId ? (instruments.get(row.instrumentId) ?? null) : null;
  let steps: string[] = [];
  let warnings: string[] = [];
  let meanVelocityMS: number | null = null;
  if (row.method === "traverse") {
    steps = [`Airflow of the traverse of the terminal's own duct (version ${row.traverseVersion ?? "?"}): ${f.flow(row.flowM3S)} actual, ${f.flow(row.standardFlowM3S)} at standard air.`];
    if (row.traverseId === null) warnings.push("The traverse this reading was taken from has since been deleted; the airflow shown is the one recorded.");
    else if (row.traverseCurrentVersion !== null && row.traverseVersion !== null && row.traverseCurrentVersion !== row.traverseVersion)
      warnings.push(`The traverse has changed since (version ${row.traverseVersion} → ${row.traverseCurrentVersion}): record the reading again to take its current airflow.`);
  } else {
    try {
      const computed = computeReadingFlow(values, design, project, { format: f, densityKgM3: row.densityKgM3 });
      steps = computed.steps;
      warnings = computed.warnings;
      meanVelocityMS = computed.meanVelocityMS;
    } catch {
      // A row stored by an older version without every input: its stored airflow stands, without the steps.
      steps = [];
    }
  }
  const judged = judgeReading({ ...values, standardFlowM3S: row.standardFlowM3S }, design, project, { instrument: instrumentRange(instrument), format: f });
  return {
    id: row.id,
    terminalId: row.terminalId,
    terminalTag: row.terminalTag,
    sectionId: row.sectionId,
    systemId: row.systemId,
    setId: row.setId,
    phase: row.phase,
    method: row.method,
    setpoint: row.setpoint,
    hoodFlowM3S: row.hoodFlowM3S,
    hoodCorrectionFactor: row.hoodCorrectionFactor,
    hoodDensityCorrected: row.hoodDensityCorrected,
    hoodBackPressureCompensated: row.hoodBackPressureCompensated,
    velocitiesMS: row.velocitiesMS,
    velocityBasis: row.velocityBasis,
    meanVelocityMS,
    effectiveAreaM2: row.effectiveAreaM2,
    traverseId: row.traverseId,
    traverseVersion: row.traverseVersion,
    traverseChanged: row.method === "traverse" && row.traverseId !== null && row.traverseCurrentVersion !== null && row.traverseCurrentVersion !== row.traverseVersion,
    dryBulbC: row.dryBulbC,
    relativeHumidityPct: row.relativeHumidityPct,
    barometricPa: row.barometricPa,
    densityKgM3: row.densityKgM3,
    flowM3S: row.flowM3S,
    standardFlowM3S: row.standardFlowM3S,
    designFlowM3S: judged.designFlowM3S,
    pctOfDesign: judged.pctOfDesign,
    withinTolerance: judged.withinTolerance,
    tolerance: judged.tolerance,
    controllerFlowM3S: row.controllerFlowM3S,
    controllerFlowFactor: judged.controller?.flowFactor ?? row.controllerFlowFactor,
    controllerRatio: judged.controller?.ratio ?? null,
    suggestedFlowFactor: judged.controller?.suggestedFlowFactor ?? null,
    damperMarked: row.damperMarked,
    conditionsId: row.conditionsId,
    instrumentId: row.instrumentId,
    instrumentName: instrument ? instrumentName(instrument) : null,
    airInstrumentId: row.airInstrumentId,
    overdueReason: row.overdueReason,
    notes: row.notes,
    takenBy: row.takenBy,
    takenByName: row.takenByName,
    takenAt: row.takenAt,
    createdAt: row.createdAt,
    steps,
    warnings,
    flags: judged.flags,
  };
}
export type TerminalReadingJson = ReturnType<typeof terminalReadingJson>;
