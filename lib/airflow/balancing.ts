/**
 * Balancing aids: per cent of design, a proportional-balancing plan (index terminal per branch,
 * throttle the rest to its ratio, then branch to branch, then fan speed), and fan-law projections.
 * Pure functions, SI units (m³/s, Pa, W, rpm).
 */
import { EngineInputError } from "./errors";

/** Allowed deviation from design, in % (e.g. −5/+10, or −0/+10 for outside air; default ±10, common practice). */
export interface Tolerance {
  minusPct: number;
  plusPct: number;
}

export interface TerminalReading {
  id: string;
  /** Branch the terminal hangs on; terminals without one share a single unnamed branch. */
  branch?: string;
  designM3S: number;
  measuredM3S: number;
}

export type TerminalRole = "index" | "throttle" | "leave" | "investigate";

export interface TerminalStep {
  id: string;
  designM3S: number;
  measuredM3S: number;
  /** measured / design. */
  ratio: number;
  pctOfDesign: number;
  /** Within the tolerance of design as measured now. */
  withinTolerance: boolean;
  /** index: leave fully open, the reference; throttle: close to targetM3S; leave: already matches the index ratio; investigate: too far below design to balance against (closed damper, blockage?). */
  role: TerminalRole;
  /** The ratio to set (the index ratio), null for the index itself and for terminals to investigate. */
  targetRatio: number | null;
  targetM3S: number | null;
}

export interface BranchPlan {
  branch: string;
  designM3S: number;
  measuredM3S: number;
  ratio: number;
  indexTerminal: string | null;
  /** In working order: the index first, then by increasing ratio. */
  steps: TerminalStep[];
  /** Branch damper: "index" for the lowest-ratio branch (stays open), otherwise "throttle" to the index branch's ratio. */
  role: "index" | "throttle";
}

export interface BalancingPlan {
  /** In working order: the index branch first, then by increasing ratio. */
  branches: BranchPlan[];
  /** Terminals outside the tolerance of design, in input order. */
  outOfTolerance: string[];
  /** Σ design / Σ measured: the fan-speed factor that would bring today's total to design (fan law Q ∝ N). Throttling lowers the total, so re-measure before setting the speed. */
  fanSpeedFactorEstimate: number | null;
}

export interface BalancingOptions {
  tolerance?: Tolerance;
  /** Ratios within this % of the index ratio are left alone (default 10, common practice: "ratios within 10 % of each other"). */
  matchPct?: number;
  /**
   * Terminals below this absolute ratio are not used as the index but flagged to investigate. When
   * omitted the floor is relative to the branch: see investigateBelowMedianFraction.
   */
  minIndexRatio?: number;
  /**
   * Terminals whose ratio is below this fraction of their branch's median ratio are flagged to investigate
   * (closed damper, blockage?) rather than taken as the index (default 0.5, our choice). Relative, so a
   * uniformly low branch (a fan at half speed) still gets its lowest terminal as the index.
   */
  investigateBelowMedianFraction?: number;
}

/** Bad balancing input; fields map dotted snake_case paths to a message. */
export class BalancingError extends EngineInputError {}

const DEFAULT_TOLERANCE: Tolerance = { minusPct: 10, plusPct: 10 };
const UNNAMED_BRANCH = "";

/** Measured flow as % of design. */
export function percentOfDesign(measuredM3S: number, designM3S: number): number {
  return (100 * measuredM3S) / designM3S;
}

/** Whether a measured flow is within the tolerance of design (a hair of slack so "exactly 10 %" passes despite rounding). */
export function withinTolerance(measuredM3S: number, designM3S: number, tolerance: Tolerance = DEFAULT_TOLERANCE): boolean {
  const deviationPct = percentOfDesign(measuredM3S, designM3S) - 100;
  return deviationPct >= -tolerance.minusPct - 1e-9 && deviationPct <= tolerance.plusPct + 1e-9;
}

function checkTerminals(terminals: TerminalReading[]): void {
  const fields: Record<string, string> = {};
  const seen = new Map<string, number>();
  terminals.forEach((t, i) => {
    const first = seen.get(t.id);
    if (first !== undefined) fields[`terminals.${i}.id`] = `Terminal id "${t.id}" is used twice (first at terminals.${first}).`;
    else seen.set(t.id, i);
    if (!(Number.isFinite(t.designM3S) && t.designM3S > 0)) fields[`terminals.${i}.design_m3_s`] = `Design flow ${t.designM3S} is not allowed: give a positive number of m³/s.`;
    if (!(Number.isFinite(t.measuredM3S) && t.measuredM3S >= 0)) fields[`terminals.${i}.measured_m3_s`] = `Measured flow ${t.measuredM3S} is not allowed: give zero or a positive number of m³/s.`;
  });
  const keys = Object.keys(fields);
  if (keys.length > 0) throw new BalancingError(`Terminal readings are not valid: check ${keys.slice(0, 3).join(", ")}.`, fields);
}

/** Median of sorted numbers (empty → NaN). */
function medianOfSorted(sorted: readonly number[]): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const mid = Math.floor(n / 2);
  return n % 2 === 1 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

function planBranch(branch: string, terminals: TerminalReading[], tolerance: Tolerance, matchPct: number, floor: { absolute?: number; medianFraction: number }): BranchPlan {
  const rows = terminals.map((t) => ({ t, ratio: t.measuredM3S / t.designM3S })).sort((a, b) => a.ratio - b.ratio);
  const minIndexRatio = floor.absolute ?? floor.medianFraction * medianOfSorted(rows.map((r) => r.ratio));
  // A terminal with no flow at all is never an index, whatever the floor.
  const tooLow = (ratio: number) => !(ratio > 0) || ratio < minIndexRatio;
  const index = rows.find((r) => !tooLow(r.ratio));
  const steps: TerminalStep[] = rows.map(({ t, ratio }) => {
    let role: TerminalRole;
    if (tooLow(ratio)) role = "investigate";
    else if (t === index?.t) role = "index";
    else if (index && ratio <= index.ratio * (1 + matchPct / 100)) role = "leave";
    else role = "throttle";
    const targetRatio = index && (role === "throttle" || role === "leave") ? index.ratio : null;
    return {
      id: t.id,
      designM3S: t.designM3S,
      measuredM3S: t.measuredM3S,
      ratio,
      pctOfDesign: 100 * ratio,
      withinTolerance: withinTolerance(t.measuredM3S, t.designM3S, tolerance),
      role,
      targetRatio,
      targetM3S: targetRatio === null ? null : targetRatio * t.designM3S,
    };
  });
  // Working order: the index first (it is measured and left open), then by increasing ratio; investigations last.
  const order = (s: TerminalStep) => (s.role === "index" ? 0 : s.role === "investigate" ? 2 : 1);
  steps.sort((a, b) => order(a) - order(b) || a.ratio - b.ratio);
  const designM3S = terminals.reduce((a, t) => a + t.designM3S, 0);
  const measuredM3S = terminals.reduce((a, t) => a + t.measuredM3S, 0);
  return { branch, designM3S, measuredM3S, ratio: measuredM3S / designM3S, indexTerminal: index?.t.id ?? null, steps, role: "throttle" };
}

/**
 * A proportional-balancing plan (common practice): in each branch the terminal with the lowest
 * measured/design ratio is the index and stays open; the others are throttled to the index's ratio
 * (those already within matchPct of it are left); a terminal far below the rest of its branch (under half
 * its median ratio by default) is sent to investigation instead of becoming the index. Branch dampers follow the same rule between branches,
 * lowest branch ratio first; finally the fan speed brings all ratios towards 1.0.
 * Throws BalancingError for duplicate ids, non-positive design or negative measured flows.
 */
export function proportionalBalance(terminals: TerminalReading[], options: BalancingOptions = {}): BalancingPlan {
  checkTerminals(terminals);
  const tolerance = options.tolerance ?? DEFAULT_TOLERANCE;
  const matchPct = options.matchPct ?? 10;
  const floor = { absolute: options.minIndexRatio, medianFraction: options.investigateBelowMedianFraction ?? 0.5 };

  const byBranch = new Map<string, TerminalReading[]>();
  for (const t of terminals) {
    const key = t.branch ?? UNNAMED_BRANCH;
    const list = byBranch.get(key);
    if (list) list.push(t);
    else byBranch.set(key, [t]);
  }
  const branches = [...byBranch].map(([b, list]) => planBranch(b, list, tolerance, matchPct, floor)).sort((a, b) => a.ratio - b.ratio);
  if (branches[0]) branches[0].role = "index";

  const totalDesign = terminals.reduce((a, t) => a + t.designM3S, 0);
  const totalMeasured = terminals.reduce((a, t) => a + t.measuredM3S, 0);
  return {
    branches,
    outOfTolerance: terminals.filter((t) => !withinTolerance(t.measuredM3S, t.designM3S, tolerance)).map((t) => t.id),
    fanSpeedFactorEstimate: totalMeasured > 0 ? totalDesign / totalMeasured : null,
  };
}

/** A fan's operating point. Density only matters when projecting to a different density. */
export interface FanPoint {
  speedRpm: number;
  flowM3S: number;
  pressurePa: number;
  powerW: number;
  densityKgM3?: number;
}

export interface FanProjection extends FanPoint {
  /** New speed / old speed. */
  speedRatio: number;
  warnings: string[];
}

export interface FanLimits {
  /** Air density at the new condition, kg/m³; needs the point's density. Pressure and power scale with it. */
  densityKgM3?: number;
  maxSpeedRpm?: number;
  motorPowerW?: number;
}

function checkFanPoint(point: FanPoint, limits: FanLimits): void {
  const fields: Record<string, string> = {};
  const positive = (v: number | undefined) => v === undefined || (Number.isFinite(v) && v > 0);
  if (!positive(point.speedRpm)) fields["fan.speed_rpm"] = `Fan speed ${point.speedRpm} is not allowed: give a positive number of rpm.`;
  if (!positive(point.flowM3S)) fields["fan.flow_m3_s"] = `Fan flow ${point.flowM3S} is not allowed: give a positive number of m³/s.`;
  if (!(Number.isFinite(point.pressurePa) && point.pressurePa >= 0)) fields["fan.pressure_pa"] = `Fan pressure ${point.pressurePa} is not allowed: give zero or a positive number of Pa.`;
  if (!(Number.isFinite(point.powerW) && point.powerW >= 0)) fields["fan.power_w"] = `Fan power ${point.powerW} is not allowed: give zero or a positive number of W.`;
  if (!positive(point.densityKgM3)) fields["fan.density_kg_m3"] = `Density ${point.densityKgM3} is not allowed: give a positive number of kg/m³.`;
  if (!positive(limits.densityKgM3)) fields["density_kg_m3"] = `Density ${limits.densityKgM3} is not allowed: give a positive number of kg/m³.`;
  if (limits.densityKgM3 !== undefined && point.densityKgM3 === undefined) {
    fields["fan.density_kg_m3"] = "Give the air density at the measured point to project to another density.";
  }
  const keys = Object.keys(fields);
  if (keys.length > 0) throw new BalancingError(`Fan data are not valid: check ${keys.join(", ")}.`, fields);
}

/**
 * Fan laws for the same fan on the same system (common practice): flow ∝ N, pressure ∝ N²·ρ, power ∝ N³·ρ.
 * Projects the point to a new speed (rpm) and optionally a new density; warns past the fan's speed or the motor's power.
 */
export function fanAtSpeed(point: FanPoint, newSpeedRpm: number, limits: FanLimits = {}): FanProjection {
  if (!(Number.isFinite(newSpeedRpm) && newSpeedRpm > 0)) {
    throw new BalancingError("The new fan speed is not valid.", { new_speed_rpm: `Speed ${newSpeedRpm} is not allowed: give a positive number of rpm.` });
  }
  checkFanPoint(point, limits);
  const n = newSpeedRpm / point.speedRpm;
  const densityRatio = limits.densityKgM3 !== undefined && point.densityKgM3 !== undefined ? limits.densityKgM3 / point.densityKgM3 : 1;
  const projected: FanProjection = {
    speedRpm: newSpeedRpm,
    flowM3S: point.flowM3S * n,
    pressurePa: point.pressurePa * n * n * densityRatio,
    powerW: point.powerW * n ** 3 * densityRatio,
    densityKgM3: limits.densityKgM3 ?? point.densityKgM3,
    speedRatio: n,
    warnings: [],
  };
  if (limits.maxSpeedRpm !== undefined && newSpeedRpm > limits.maxSpeedRpm) {
    projected.warnings.push(`Projected speed ${Math.round(newSpeedRpm)} rpm is above the fan's maximum of ${limits.maxSpeedRpm} rpm.`);
  }
  if (limits.motorPowerW !== undefined && projected.powerW > limits.motorPowerW) {
    projected.warnings.push(`Projected shaft power ${(projected.powerW / 1000).toFixed(2)} kW is above the motor rating of ${(limits.motorPowerW / 1000).toFixed(2)} kW.`);
  }
  return projected;
}

/** The speed (and resulting pressure and power) at which the fan delivers targetFlowM3S on the same system: N₂ = N₁·Q₂/Q₁. */
export function fanSpeedForFlow(point: FanPoint, targetFlowM3S: number, limits: FanLimits = {}): FanProjection {
  if (!(Number.isFinite(targetFlowM3S) && targetFlowM3S > 0)) {
    throw new BalancingError("The target flow is not valid.", { target_flow_m3_s: `Target flow ${targetFlowM3S} is not allowed: give a positive number of m³/s.` });
  }
  checkFanPoint(point, limits);
  return fanAtSpeed(point, (point.speedRpm * targetFlowM3S) / point.flowM3S, limits);
}

/** What a fan-law speed change asks of the motor, from its nameplate (no measured power needed). */
export interface MotorHeadroom {
  /** Shaft power at the target speed as a multiple of today's (fan laws, N³). */
  powerFactor: number;
  nameplateKw: number;
  /**
   * Today's shaft power must stay below this for the target speed to remain within the nameplate
   * rating: nameplate ÷ powerFactor (fan laws, same density). Compare it with the measured motor power.
   */
  maxPresentKw: number;
  /** maxPresentKw as % of the nameplate. */
  maxPresentPctOfNameplate: number;
  /** The same limit against nameplate × service factor, null when no service factor is stated. */
  maxPresentWithServiceFactorKw: number | null;
}

/**
 * The motor load today below which a fan-law speed increase stays within the nameplate: P_new = P_now ×
 * (N_new/N_now)³ ≤ P_rated ⇔ P_now ≤ P_rated ÷ (N_new/N_now)³. A service factor above 1 is a margin for
 * occasional overload, not running capacity: the screen says a qualified person decides.
 */
export function motorHeadroom(powerFactor: number, motor: { powerKw: number; serviceFactor: number | null }): MotorHeadroom | null {
  if (!(powerFactor > 0) || !(motor.powerKw > 0)) return null;
  const maxPresentKw = motor.powerKw / powerFactor;
  return {
    powerFactor,
    nameplateKw: motor.powerKw,
    maxPresentKw,
    maxPresentPctOfNameplate: 100 / powerFactor,
    maxPresentWithServiceFactorKw: motor.serviceFactor !== null && motor.serviceFactor > 0 ? (motor.powerKw * motor.serviceFactor) / powerFactor : null,
  };
}
