/**
 * What a terminal is read at: outlets and inlets at their design setting; terminal units forced to
 * their scheduled maximum, minimum and (where scheduled) heating airflow. Framework-free.
 */
import type { TerminalSetpoint } from "@/db/schema";
import { isTerminalUnit, type TerminalKind } from "@/lib/validation/design";

export const TERMINAL_SETPOINTS = ["design", "maximum", "minimum", "heating"] as const satisfies readonly TerminalSetpoint[];
export const READING_PHASES = ["initial", "final"] as const;
export const READING_METHODS = ["hood", "velocity_area", "traverse"] as const;
export type ReadingPhase = (typeof READING_PHASES)[number];
export type ReadingMethod = (typeof READING_METHODS)[number];

export const SETPOINT_LABELS: Record<TerminalSetpoint, string> = {
  design: "Design",
  maximum: "Maximum",
  minimum: "Minimum",
  heating: "Heating",
};

export const PHASE_LABELS: Record<ReadingPhase, string> = { initial: "Initial", final: "Final" };

export const METHOD_LABELS: Record<ReadingMethod, string> = {
  hood: "Capture hood",
  velocity_area: "Velocity × effective area",
  traverse: "Traverse of its duct",
};

/** The design fields of a terminal that readings are judged against. */
export interface TerminalDesign {
  kind: TerminalKind;
  designFlowM3S: number;
  designMinFlowM3S: number | null;
  designHeatingFlowM3S: number | null;
  effectiveAreaM2: number | null;
  controllerFlowFactor: number | null;
}

/** The setpoints a terminal can be read at, in the order a technician works through them. */
export function setpointsFor(terminal: Pick<TerminalDesign, "kind" | "designMinFlowM3S" | "designHeatingFlowM3S">): TerminalSetpoint[] {
  if (!isTerminalUnit(terminal.kind)) return ["design"];
  return [
    "maximum",
    ...(terminal.designMinFlowM3S !== null ? (["minimum"] as const) : []),
    ...(terminal.designHeatingFlowM3S !== null ? (["heating"] as const) : []),
  ];
}

/** The design airflow (standard air) at a setpoint, or null when the terminal has none scheduled there. */
export function designFlowAt(terminal: Pick<TerminalDesign, "kind" | "designFlowM3S" | "designMinFlowM3S" | "designHeatingFlowM3S">, setpoint: TerminalSetpoint): number | null {
  const unit = isTerminalUnit(terminal.kind);
  switch (setpoint) {
    case "design":
      return unit ? null : terminal.designFlowM3S;
    case "maximum":
      return unit ? terminal.designFlowM3S : null;
    case "minimum":
      return unit ? terminal.designMinFlowM3S : null;
    case "heating":
      return unit ? terminal.designHeatingFlowM3S : null;
  }
}

/** Which tolerance band applies: the outlet band for outlets and inlets, the terminal-unit band for boxes. */
export function toleranceCategoryOf(kind: TerminalKind): "outlet" | "terminalUnit" {
  return isTerminalUnit(kind) ? "terminalUnit" : "outlet";
}

/** The methods that suit a terminal: boxes are read at their outlets by hood, or by a traverse of the inlet duct. */
export function methodsFor(kind: TerminalKind): ReadingMethod[] {
  return isTerminalUnit(kind) ? ["hood", "traverse", "velocity_area"] : ["hood", "velocity_area", "traverse"];
}
