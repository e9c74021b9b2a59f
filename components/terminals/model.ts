/**
 * What the Terminals screen works with: the design it is given by the page, and one shape for a
 * reading whether the server has it or it is still only on this device (worked out here with the
 * same code the server runs, so the numbers agree before and after it is sent).
 */
import type { TerminalSetpoint } from "@/db/schema";
import type { Tolerance } from "@/lib/airflow/balancing";
import type { DeviceTerminalReading, TerminalReading, TerminalReadingBody } from "@/lib/api-client/terminals";
import type { Conditions, Instrument } from "@/lib/api-client/field";
import { instrumentName, KIND_INFO } from "@/lib/instruments/kinds";
import type { SyncError, SyncState } from "@/lib/offline/types";
import { computeReadingFlow, judgeReading, readingValuesFromBody, type ProjectBasis, type QuantityFormat, type ReadingValues } from "@/lib/terminals/reading";
import type { ReadingMethod, ReadingPhase, TerminalDesign } from "@/lib/terminals/setpoints";
import { isTerminalUnit, type TerminalKind } from "@/lib/validation/design";
import type { UnitSystem } from "@/lib/units";

export interface BoardTerminal extends TerminalDesign {
  id: string;
  tag: string;
  kind: TerminalKind;
  service: "supply" | "return" | "exhaust" | "outside_air";
  room: string;
  device: string;
  sectionId: string;
}

export interface BoardBranch {
  id: string;
  tag: string;
  location: string;
  designFlowM3S: number;
  terminals: BoardTerminal[];
}

export interface BoardSystem {
  id: string;
  tag: string;
  name: string;
  kind: "supply" | "return" | "exhaust" | "outside_air";
  location: string;
  fanSpeedRpm: number | null;
  hasVfd: boolean;
  branches: BoardBranch[];
  /** Recorded conditions, newest first, for the picker's first paint. */
  conditions: Conditions[];
}

/** A traverse a terminal reading may take its airflow from (its section feeds one terminal only). */
export interface BoardTraverse {
  id: string;
  sectionId: string;
  revision: number;
  version: number;
  status: "draft" | "submitted" | "approved" | "returned";
  takenAt: string | null;
  /** Null when the engine could not reduce it yet (the reason is in `problem`). */
  flowM3S: number | null;
  standardFlowM3S: number | null;
  densityKgM3: number | null;
  conditionsId: string | null;
  problem: string | null;
}

export interface BoardProject extends ProjectBasis {
  id: string;
  unitSystem: UnitSystem;
}

/** A reading on the screen: from the server, or still on this device (`device` says where it is). */
export interface ReadingView {
  id: string;
  terminalId: string;
  phase: ReadingPhase;
  setpoint: TerminalSetpoint;
  method: ReadingMethod;
  flowM3S: number;
  standardFlowM3S: number;
  designFlowM3S: number | null;
  pctOfDesign: number | null;
  withinTolerance: boolean | null;
  tolerance: Tolerance;
  controllerFlowM3S: number | null;
  controllerFlowFactor: number | null;
  controllerRatio: number | null;
  suggestedFlowFactor: number | null;
  damperMarked: boolean;
  conditionsId: string | null;
  instrumentName: string | null;
  takenAt: string;
  takenByName: string | null;
  steps: string[];
  warnings: string[];
  flags: string[];
  notes: string;
  device: null | { key: string; state: SyncState; error: SyncError | null; nextAttemptAt: number | null; body: TerminalReadingBody };
}

export function viewFromServer(r: TerminalReading): ReadingView {
  return {
    id: r.id,
    terminalId: r.terminalId,
    phase: r.phase,
    setpoint: r.setpoint,
    method: r.method,
    flowM3S: r.flowM3S,
    standardFlowM3S: r.standardFlowM3S,
    designFlowM3S: r.designFlowM3S,
    pctOfDesign: r.pctOfDesign,
    withinTolerance: r.withinTolerance,
    tolerance: r.tolerance,
    controllerFlowM3S: r.controllerFlowM3S,
    controllerFlowFactor: r.controllerFlowFactor,
    controllerRatio: r.controllerRatio,
    suggestedFlowFactor: r.suggestedFlowFactor,
    damperMarked: r.damperMarked,
    conditionsId: r.conditionsId,
    instrumentName: r.instrumentName,
    takenAt: r.takenAt,
    takenByName: r.takenByName,
    steps: r.steps,
    warnings: r.warnings,
    flags: r.flags,
    notes: r.notes,
    device: null,
  };
}

/** The body kept on the device as the arithmetic takes it (SI, every method's fields). */
export function valuesFromBody(body: TerminalReadingBody, terminal: BoardTerminal, instrument: Instrument | null): ReadingValues {
  return readingValuesFromBody(body, body.setpoint ?? "design", { isUnit: isTerminalUnit(terminal.kind), effectiveAreaM2: terminal.effectiveAreaM2, controllerFlowFactor: terminal.controllerFlowFactor }, instrument);
}

/**
 * What a reading means, worked out on the device: the airflow (hood or velocity × area, or the chosen
 * traverse's), % of design and the verdict, the controller check and the flags, in the user's units.
 * Throws (ReadingInputError, EngineInputError) when something needed is missing.
 */
export function evaluateBody(
  body: TerminalReadingBody,
  ctx: { terminal: BoardTerminal; project: BoardProject; format: QuantityFormat; instrument: Instrument | null; traverse: BoardTraverse | null },
) {
  const values = valuesFromBody(body, ctx.terminal, ctx.instrument);
  let flow: { flowM3S: number; standardFlowM3S: number; steps: string[]; warnings: string[] };
  if (body.method === "traverse") {
    const t = ctx.traverse;
    if (!t || t.standardFlowM3S === null || t.flowM3S === null) throw new Error(t?.problem ?? "Choose a traverse of the terminal's own duct.");
    flow = {
      flowM3S: t.flowM3S,
      standardFlowM3S: t.standardFlowM3S,
      steps: [`Airflow of the traverse of the terminal's own duct (revision ${t.revision}, version ${t.version}): ${ctx.format.flow(t.flowM3S)} actual, ${ctx.format.flow(t.standardFlowM3S)} at standard air.`],
      warnings: [],
    };
  } else flow = computeReadingFlow(values, ctx.terminal, ctx.project, { format: ctx.format });
  const judged = judgeReading(
    { ...values, standardFlowM3S: flow.standardFlowM3S },
    ctx.terminal,
    ctx.project,
    {
      format: ctx.format,
      instrument: ctx.instrument ? { label: KIND_INFO[ctx.instrument.kind].label.toLowerCase(), serial: ctx.instrument.serial, rangeMin: ctx.instrument.rangeMin, rangeMax: ctx.instrument.rangeMax } : null,
    },
  );
  return { values, flow, judged };
}

/** A reading still on this device, shown like one from the server (worked out here). */
export function viewFromDevice(
  record: DeviceTerminalReading,
  ctx: { terminal: BoardTerminal; project: BoardProject; format: QuantityFormat; instruments: ReadonlyMap<string, Instrument>; traverses: readonly BoardTraverse[]; userName: string | null },
): ReadingView {
  const body = record.value;
  const instrument = body.instrumentId ? (ctx.instruments.get(body.instrumentId) ?? null) : null;
  const traverse = body.traverseId ? (ctx.traverses.find((t) => t.id === body.traverseId) ?? null) : null;
  const device = { key: record.key, state: record.state, error: record.error, nextAttemptAt: record.nextAttemptAt, body };
  const common = {
    id: body.id,
    terminalId: record.terminalId,
    phase: body.phase,
    setpoint: body.setpoint ?? "design",
    method: body.method,
    damperMarked: body.damperMarked ?? false,
    conditionsId: body.conditionsId ?? traverse?.conditionsId ?? null,
    instrumentName: instrument ? instrumentName(instrument) : null,
    takenAt: body.takenAt,
    takenByName: ctx.userName,
    notes: body.notes ?? "",
    device,
  } as const;
  try {
    const { flow, judged } = evaluateBody(body, { terminal: ctx.terminal, project: ctx.project, format: ctx.format, instrument, traverse });
    return {
      ...common,
      flowM3S: flow.flowM3S,
      standardFlowM3S: flow.standardFlowM3S,
      designFlowM3S: judged.designFlowM3S,
      pctOfDesign: judged.pctOfDesign,
      withinTolerance: judged.withinTolerance,
      tolerance: judged.tolerance,
      controllerFlowM3S: judged.controller?.displayedM3S ?? null,
      controllerFlowFactor: judged.controller?.flowFactor ?? null,
      controllerRatio: judged.controller?.ratio ?? null,
      suggestedFlowFactor: judged.controller?.suggestedFlowFactor ?? null,
      steps: flow.steps,
      warnings: flow.warnings,
      flags: judged.flags,
    };
  } catch (err) {
    return {
      ...common,
      flowM3S: Number.NaN,
      standardFlowM3S: Number.NaN,
      designFlowM3S: null,
      pctOfDesign: null,
      withinTolerance: null,
      tolerance: { minusPct: 0, plusPct: 0 },
      controllerFlowM3S: null,
      controllerFlowFactor: null,
      controllerRatio: null,
      suggestedFlowFactor: null,
      steps: [],
      warnings: [err instanceof Error ? err.message : "This reading cannot be worked out on the device."],
      flags: [],
    };
  }
}
