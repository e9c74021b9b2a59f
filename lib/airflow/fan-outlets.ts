/**
 * The fan's traversed airflow against the sum of its outlets: the everyday check of a balanced system.
 * Everything is referred to standard air (mass flow ÷ standard density), so readings taken at
 * different air densities add up.
 *
 *   unaccounted = Q_fan − Σ Q_outlet               (standard volume flow, m³/s)
 *   u_c(unaccounted) = √( Σ u(Q_fan,j)² + Σ u(Q_outlet,i)² )
 *   U = k · u_c, k = 2 (about 95 %, GUM JCGM 100:2008 §6.2.1)
 *
 * Inputs are treated as uncorrelated (GUM §5.1.2), as the trade does when it adds a traverse and hood
 * readings. Readings of many outlets with one capture hood share that hood's calibration error, which
 * this sum treats as independent: the result is then optimistic for a hood bias, and the screen says so.
 *
 * The difference is called unaccounted airflow, never leakage: leakage is shown only by a pressure test
 * of the ductwork; the difference also holds every measurement error and any outlet left out.
 *
 * Missing measurements are named, never guessed: when a fan section has no reduced traverse or an
 * outlet has no reading, no sum is given (a partial sum would look like a result).
 *
 * Framework-free and pure: SI units in, plain data out.
 */
import { compareConditionsAcross, type ConditionDifference, type ConditionsLike } from "./conditions";
import { COVERAGE_FACTOR } from "./uncertainty";

const SQRT3 = Math.sqrt(3);

/**
 * When the register states no accuracy for the instrument an outlet was read with: ±5 % of reading,
 * as a specification limit (common practice for a capture hood or anemometer on a diffuser face; a
 * maker's own figure replaces it whenever the register holds one).
 */
export const DEFAULT_OUTLET_ACCURACY_PCT = 5;

/** A maker's accuracy of an outlet reading: ± % of reading plus ± a floor, both specification limits. */
export interface OutletAccuracy {
  /** ± % of reading. */
  pct: number;
  /** ± floor, as standard volume flow (m³/s); 0 when none. */
  floorM3S: number;
  /** Where the figure comes from, for the screen: the register, the documented default, or the traverse the reading took its airflow from. */
  source: "register" | "default" | "traverse";
}

/**
 * Standard uncertainty (k = 1) of one outlet reading from the maker's accuracy ±(pct % + floor):
 * a specification limit ±a with no stated distribution is rectangular, u = a/√3 (GUM §4.3.7).
 */
export function outletReadingStandardUncertainty(standardFlowM3S: number, accuracy: Pick<OutletAccuracy, "pct" | "floorM3S">): number {
  const limit = (Math.abs(accuracy.pct) / 100) * Math.abs(standardFlowM3S) + Math.abs(accuracy.floorM3S);
  return limit / SQRT3;
}

/** The accuracy the register states, or the documented default when it states none. */
export function outletAccuracy(registered: { pct: number | null; floorM3S: number | null } | null): OutletAccuracy {
  if (registered && registered.pct !== null && Number.isFinite(registered.pct) && registered.pct >= 0) {
    return { pct: registered.pct, floorM3S: registered.floorM3S !== null && Number.isFinite(registered.floorM3S) ? Math.abs(registered.floorM3S) : 0, source: "register" };
  }
  return { pct: DEFAULT_OUTLET_ACCURACY_PCT, floorM3S: 0, source: "default" };
}

/**
 * An anemometer's floor (m/s) as a floor on the flow of a velocity × effective-area reading: the same
 * fraction of the mean velocity, i.e. floor ÷ v̄ × Q. Null when the mean velocity is not positive.
 */
export function velocityFloorAsFlowM3S(floorMS: number, meanVelocityMS: number, standardFlowM3S: number): number | null {
  if (!(meanVelocityMS > 0)) return null;
  return (Math.abs(floorMS) / meanVelocityMS) * standardFlowM3S;
}

/** One fan-side section (a root of the duct tree) and its latest traverse. */
export interface FanSectionInput {
  tag: string;
  /** Null: no reduced traverse (the reason is in `missingReason`). */
  standardFlowM3S: number | null;
  /** Relative standard uncertainty (k = 1) of the standard flow, from the traverse reduction. */
  relativeStandardUncertainty: number | null;
  missingReason?: string;
  conditions: ConditionsLike | null;
}

/** One outlet (or inlet) of the system and its latest final, else initial, reading. */
export interface OutletInput {
  tag: string;
  /** Null: never read. */
  standardFlowM3S: number | null;
  phase: "initial" | "final" | null;
  accuracy: OutletAccuracy;
  /**
   * A reading taken from a traverse of the outlet's own duct: that reduction's relative standard
   * uncertainty (k = 1), used instead of `accuracy`.
   */
  relativeStandardUncertainty?: number;
  conditions: ConditionsLike | null;
}

export interface OutletTerm {
  tag: string;
  standardFlowM3S: number;
  phase: "initial" | "final";
  /** Standard uncertainty (k = 1), m³/s. */
  standardUncertaintyM3S: number;
  accuracy: OutletAccuracy;
}

export interface FanTerm {
  tag: string;
  standardFlowM3S: number;
  standardUncertaintyM3S: number;
}

export type FanOutletsCheck =
  | {
      status: "no_fan_section";
      message: string;
    }
  | {
      status: "no_outlets";
      message: string;
    }
  | {
      status: "incomplete";
      /** Fan sections without a reduced traverse, with why. */
      missingTraverses: { tag: string; reason: string }[];
      /** Outlets with no reading at all. */
      missingOutlets: string[];
      outletsRead: number;
      outletsTotal: number;
      message: string;
    }
  | {
      status: "complete";
      fan: FanTerm[];
      outlets: OutletTerm[];
      fanStandardM3S: number;
      outletsStandardM3S: number;
      /** Fan − Σ outlets, standard m³/s. Positive: the outlets deliver less than the fan moves. */
      unaccountedStandardM3S: number;
      /** Unaccounted as % of the fan's airflow. */
      unaccountedPct: number;
      /** Combined standard uncertainty (k = 1) of the unaccounted airflow, m³/s. */
      standardUncertaintyM3S: number;
      coverageFactor: number;
      /** Expanded uncertainty U = k·u_c, m³/s. */
      expandedUncertaintyM3S: number;
      /** U as % of the fan's airflow. */
      expandedUncertaintyPct: number;
      /** |unaccounted| ≤ U: the difference cannot be told apart from the measurements' own uncertainty. */
      withinUncertainty: boolean;
      /** Outlets read only as found (initial), not after adjustment. */
      initialOnly: string[];
      /** Outlets whose accuracy is the documented default (the register states none). */
      defaultAccuracy: string[];
      /** Differences between the recorded operating conditions of the readings summed. */
      conditionDifferences: ConditionDifference[];
    };

/**
 * The fan-versus-outlets check for one system. `fanSections` are the roots of its duct tree (the trunk
 * at the fan); `outlets` every outlet or inlet the system serves (terminal units are passed through,
 * not counted: their air leaves through the outlets downstream).
 */
export function fanVersusOutlets(fanSections: readonly FanSectionInput[], outlets: readonly OutletInput[]): FanOutletsCheck {
  if (fanSections.length === 0) {
    return { status: "no_fan_section", message: "No duct section leaves the fan in the design: add the trunk in Set-up to compare the fan with its outlets." };
  }
  if (outlets.length === 0) {
    return { status: "no_outlets", message: "No outlets or inlets are scheduled on this system, so there is nothing to add up against the fan." };
  }
  const missingTraverses = fanSections
    .filter((s) => s.standardFlowM3S === null || s.relativeStandardUncertainty === null || !Number.isFinite(s.relativeStandardUncertainty))
    .map((s) => ({ tag: s.tag, reason: s.missingReason ?? "no reduced traverse" }));
  const missingOutlets = outlets.filter((o) => o.standardFlowM3S === null || o.phase === null).map((o) => o.tag);
  const outletsRead = outlets.length - missingOutlets.length;
  if (missingTraverses.length > 0 || missingOutlets.length > 0) {
    const parts: string[] = [];
    if (missingTraverses.length > 0) parts.push(`the fan-side traverse of ${missingTraverses.map((m) => `${m.tag} (${m.reason})`).join(", ")}`);
    if (missingOutlets.length > 0) parts.push(`readings of ${missingOutlets.length} of ${outlets.length} outlets (${missingOutlets.join(", ")})`);
    return {
      status: "incomplete",
      missingTraverses,
      missingOutlets,
      outletsRead,
      outletsTotal: outlets.length,
      message: `Not compared yet: missing ${parts.join(" and ")}. No partial sum is shown.`,
    };
  }

  const fan: FanTerm[] = fanSections.map((s) => ({
    tag: s.tag,
    standardFlowM3S: s.standardFlowM3S!,
    standardUncertaintyM3S: Math.abs(s.relativeStandardUncertainty!) * s.standardFlowM3S!,
  }));
  const terms: OutletTerm[] = outlets.map((o) => ({
    tag: o.tag,
    standardFlowM3S: o.standardFlowM3S!,
    phase: o.phase!,
    accuracy: o.accuracy,
    standardUncertaintyM3S:
      o.relativeStandardUncertainty !== undefined && Number.isFinite(o.relativeStandardUncertainty)
        ? Math.abs(o.relativeStandardUncertainty) * o.standardFlowM3S!
        : outletReadingStandardUncertainty(o.standardFlowM3S!, o.accuracy),
  }));
  const fanStandardM3S = fan.reduce((a, f) => a + f.standardFlowM3S, 0);
  const outletsStandardM3S = terms.reduce((a, t) => a + t.standardFlowM3S, 0);
  const unaccountedStandardM3S = fanStandardM3S - outletsStandardM3S;
  const standardUncertaintyM3S = Math.sqrt(fan.reduce((a, f) => a + f.standardUncertaintyM3S ** 2, 0) + terms.reduce((a, t) => a + t.standardUncertaintyM3S ** 2, 0));
  const expandedUncertaintyM3S = COVERAGE_FACTOR * standardUncertaintyM3S;
  const pctOfFan = (v: number) => (fanStandardM3S > 0 ? (100 * v) / fanStandardM3S : Number.NaN);
  return {
    status: "complete",
    fan,
    outlets: terms,
    fanStandardM3S,
    outletsStandardM3S,
    unaccountedStandardM3S,
    unaccountedPct: pctOfFan(unaccountedStandardM3S),
    standardUncertaintyM3S,
    coverageFactor: COVERAGE_FACTOR,
    expandedUncertaintyM3S,
    expandedUncertaintyPct: pctOfFan(expandedUncertaintyM3S),
    withinUncertainty: Math.abs(unaccountedStandardM3S) <= expandedUncertaintyM3S,
    initialOnly: terms.filter((t) => t.phase === "initial").map((t) => t.tag),
    defaultAccuracy: terms.filter((t) => t.accuracy.source === "default").map((t) => t.tag),
    conditionDifferences: compareConditionsAcross([
      ...fanSections.map((s) => ({ label: `the traverse of ${s.tag}`, conditions: s.conditions })),
      ...outlets.map((o) => ({ label: `the reading of ${o.tag}`, conditions: o.conditions })),
    ]),
  };
}
