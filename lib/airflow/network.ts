/**
 * Continuity over a tree of duct sections: at every junction the parent's mass flow should equal the
 * sum of its children's (steady flow, no storage). Volumes are compared only where densities agree.
 * Linear in the number of sections.
 */
import { capFieldErrors, EngineInputError, MAX_FIELD_ERRORS } from "./errors";
import { STANDARD_DENSITY_KG_M3 } from "./constants";

/**
 * One measured section. `parent` is the section upstream of it (null for a root, e.g. the fan).
 * Mass flow is taken from `massFlowKgS` when it is a finite number, otherwise from `flowM3S × densityKgM3`.
 */
export interface NetworkNode {
  id: string;
  parent: string | null;
  massFlowKgS: number;
  flowM3S?: number;
  densityKgM3?: number;
}

export interface Junction {
  /** The parent section's id. */
  id: string;
  parentMassFlowKgS: number;
  childrenMassFlowKgS: number;
  /** Parent − sum of children, kg/s. Positive: the branches account for less than the trunk carries (e.g. leakage). */
  imbalanceKgS: number;
  /** imbalanceKgS as % of the parent's mass flow. */
  imbalancePct: number;
  /** |imbalancePct| within the tolerance. */
  pass: boolean;
  children: string[];
  /** imbalanceKgS expressed as standard volume flow, m³/s (÷ standard density). */
  imbalanceStandardM3S: number;
  /** True when every density at the junction is known and they agree within 0.1 %. */
  volumesSummable: boolean;
  /** Volume imbalance % when volumesSummable, else null. */
  volumeImbalancePct: number | null;
  /** Parent − sum of children by actual volume, % of parent, whenever all volumes are known, summable or not (to show the error of summing them). */
  naiveVolumeImbalancePct: number | null;
  note: string;
}

export interface ContinuityOptions {
  /** Allowed |imbalance| in % of the parent (default 10, common practice for terminals and branches). */
  tolerancePct?: number;
  /** Density that defines standard volume, kg/m³ (default 1.204, ASHRAE SI standard air, common practice). */
  standardDensityKgM3?: number;
}

/** Bad network input. `fields` maps dotted API paths (`nodes.3.parent`) to a message naming the value and what is allowed. */
export class NetworkError extends EngineInputError {}

const DEFAULT_TOLERANCE_PCT = 10;
/** Densities within 0.1 % make the volume error of summing negligible next to field uncertainty (5–10 %, from memory). */
const DENSITY_AGREEMENT = 0.001;
/** Given mass flow and flow × density must agree this closely, or the input contradicts itself. */
const MASS_CONSISTENCY = 0.001;
/**
 * Smallest non-zero flows taken as real: 1 mL/s of air, 1.2 mg/s (our choice, far below anything a field
 * instrument resolves). Smaller non-zero values are typing or unit errors and would make percentages absurd.
 */
export const MIN_FLOW_M3_S = 1e-6;
export const MIN_MASS_FLOW_KG_S = 1e-6;
/** Loop paths in messages show this many ids at each end; longer ids are cut. */
const LOOP_PATH_ENDS = 3;
const ID_SHOWN_CHARS = 40;

const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);
/** Min and max without spreading (a junction may have thousands of children). */
function range(values: number[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}
const fmtPct = (v: number) => `${v >= 0 ? "+" : ""}${v.toFixed(2)} %`;

/** Resolves each node's mass flow, recording field errors for missing, negative or contradictory values. */
function resolveMassFlows(nodes: NetworkNode[], fields: Record<string, string>): Float64Array {
  const mass = new Float64Array(nodes.length);
  nodes.forEach((node, i) => {
    const at = `nodes.${i}`;
    const hasVolume = isNum(node.flowM3S) && isNum(node.densityKgM3);
    if (node.densityKgM3 !== undefined && !(isNum(node.densityKgM3) && node.densityKgM3 > 0)) {
      fields[`${at}.density_kg_m3`] = `Density ${String(node.densityKgM3)} is not allowed: give a positive number of kg/m³.`;
      return;
    }
    if (node.flowM3S !== undefined && !(isNum(node.flowM3S) && node.flowM3S >= 0)) {
      fields[`${at}.flow_m3_s`] = `Flow ${String(node.flowM3S)} is not allowed: give zero or a positive number of m³/s.`;
      return;
    }
    if (isNum(node.flowM3S) && node.flowM3S > 0 && node.flowM3S < MIN_FLOW_M3_S) {
      fields[`${at}.flow_m3_s`] = `Flow ${node.flowM3S} m³/s is too small to be a measured flow: give 0 (no flow) or at least ${MIN_FLOW_M3_S} m³/s.`;
      return;
    }
    if (isNum(node.massFlowKgS) && node.massFlowKgS > 0 && node.massFlowKgS < MIN_MASS_FLOW_KG_S) {
      fields[`${at}.mass_flow_kg_s`] = `Mass flow ${node.massFlowKgS} kg/s is too small to be a measured flow: give 0 (no flow) or at least ${MIN_MASS_FLOW_KG_S} kg/s.`;
      return;
    }
    const fromVolume = hasVolume ? (node.flowM3S as number) * (node.densityKgM3 as number) : undefined;
    if (isNum(node.massFlowKgS)) {
      if (node.massFlowKgS < 0) {
        fields[`${at}.mass_flow_kg_s`] = `Mass flow ${node.massFlowKgS} kg/s is negative: give zero or a positive number (flow direction comes from the tree).`;
        return;
      }
      if (fromVolume !== undefined && Math.abs(fromVolume - node.massFlowKgS) > MASS_CONSISTENCY * Math.max(fromVolume, node.massFlowKgS)) {
        fields[`${at}.mass_flow_kg_s`] =
          `Mass flow ${node.massFlowKgS} kg/s disagrees with flow × density = ${fromVolume.toPrecision(6)} kg/s: give one or make them agree.`;
        return;
      }
      mass[i] = node.massFlowKgS;
    } else if (fromVolume !== undefined) {
      mass[i] = fromVolume;
    } else {
      fields[`${at}.mass_flow_kg_s`] = `Section "${node.id}" has no flow: give mass_flow_kg_s, or flow_m3_s together with density_kg_m3.`;
    }
  });
  return mass;
}

/** An id as shown in a message: quoted, cut to ID_SHOWN_CHARS. */
function shownId(id: string | undefined): string {
  const text = id ?? "";
  return JSON.stringify(text.length > ID_SHOWN_CHARS ? `${text.slice(0, ID_SHOWN_CHARS)}…` : text);
}

/** A loop's path for a message, a → b → … → a, with only a few ids at each end of a long loop. */
function loopPath(nodes: NetworkNode[], loop: number[]): string {
  const ids = loop.map((k) => shownId(nodes[k]?.id));
  const first = ids[0] ?? "";
  if (ids.length <= 2 * LOOP_PATH_ENDS) return [...ids, first].join(" → ");
  const skipped = ids.length - 2 * LOOP_PATH_ENDS;
  return [...ids.slice(0, LOOP_PATH_ENDS), `… ${skipped.toLocaleString("en-US")} more …`, ...ids.slice(-LOOP_PATH_ENDS), first].join(" → ");
}

/**
 * Finds loops in the parent links (each node has one parent, so unreachable nodes lead into a loop). O(n).
 * Each loop is reported once, at its first member found, with a shortened path. Past MAX_FIELD_ERRORS
 * loops are only counted: returns the number left unreported.
 */
function findLoops(nodes: NetworkNode[], parentIndex: Int32Array, fields: Record<string, string>): number {
  const state = new Uint8Array(nodes.length); // 0 unseen, 1 on the current walk, 2 settled
  let unreported = 0;
  for (let start = 0; start < nodes.length; start++) {
    if (state[start] !== 0) continue;
    const walk: number[] = [];
    let i = start;
    while (i >= 0 && state[i] === 0) {
      state[i] = 1;
      walk.push(i);
      i = parentIndex[i] ?? -1;
    }
    if (i >= 0 && state[i] === 1) {
      if (Object.keys(fields).length >= MAX_FIELD_ERRORS) unreported++;
      else {
        const loop = walk.slice(walk.indexOf(i));
        const size = loop.length === 1 ? "is its own parent" : `and ${(loop.length - 1).toLocaleString("en-US")} other section${loop.length === 2 ? "" : "s"} form a loop`;
        fields[`nodes.${i}.parent`] =
          `Section ${shownId(nodes[i]?.id)} ${size} by parent links (${loopPath(nodes, loop)}); sections must form a tree leading back to a root with parent null.`;
      }
    }
    for (const k of walk) state[k] = 2;
  }
  return unreported;
}

function volumeNote(ids: string[], densities: (number | undefined)[], naivePct: number | null, summable: boolean): string {
  const missing = ids.filter((_, k) => densities[k] === undefined);
  if (missing.length > 0) {
    return `Density not given for ${missing.map((s) => `"${s}"`).join(", ")}: only mass flows are compared here.`;
  }
  const [lo, hi] = range(densities as number[]);
  if (summable) {
    const vol = naivePct === null ? "" : ` Volume imbalance ${fmtPct(naivePct)}.`;
    return `Densities agree within 0.1 % (${lo.toFixed(3)}–${hi.toFixed(3)} kg/m³), so volume flows may be summed here.${vol}`;
  }
  const vol = naivePct === null ? "" : ` Summing actual volumes would show ${fmtPct(naivePct)}.`;
  return `Densities differ by ${(100 * (hi / lo - 1)).toFixed(1)} % (${lo.toFixed(3)}–${hi.toFixed(3)} kg/m³): compare mass flows, not volumes.${vol}`;
}

/**
 * Checks continuity at every junction (every section with children), in input order.
 * Imbalance = parent − sum of children, by mass, in kg/s, % of parent, and in standard m³/s.
 * Throws NetworkError with per-field messages for duplicate ids, unknown parents, loops, missing,
 * negative or contradictory flows, and junction parents without flow. Runs in O(n).
 */
export function checkContinuity(nodes: NetworkNode[], options: ContinuityOptions = {}): { junctions: Junction[] } {
  const tolerancePct = options.tolerancePct ?? DEFAULT_TOLERANCE_PCT;
  const standardDensity = options.standardDensityKgM3 ?? STANDARD_DENSITY_KG_M3;
  const fields: Record<string, string> = {};

  const indexById = new Map<string, number>();
  nodes.forEach((node, i) => {
    const first = indexById.get(node.id);
    if (first !== undefined) fields[`nodes.${i}.id`] = `Section id "${node.id}" is used twice (first at nodes.${first}); ids must be unique.`;
    else indexById.set(node.id, i);
  });

  const parentIndex = new Int32Array(nodes.length).fill(-1);
  nodes.forEach((node, i) => {
    if (node.parent === null) return;
    const p = indexById.get(node.parent);
    if (p === undefined) fields[`nodes.${i}.parent`] = `Parent "${node.parent}" of section "${node.id}" is not in the list; use an id given above, or null for a root.`;
    else parentIndex[i] = p;
  });
  const unreportedLoops = findLoops(nodes, parentIndex, fields);
  const mass = resolveMassFlows(nodes, fields);

  const children: number[][] = nodes.map(() => []);
  const childSum = new Float64Array(nodes.length);
  parentIndex.forEach((p, i) => {
    if (p < 0) return;
    children[p]?.push(i);
    childSum[p] = (childSum[p] ?? 0) + (mass[i] ?? 0);
  });
  children.forEach((kids, p) => {
    if (kids.length > 0 && !(`nodes.${p}.mass_flow_kg_s` in fields) && !((mass[p] ?? 0) > 0)) {
      fields[`nodes.${p}.mass_flow_kg_s`] = `Section "${nodes[p]?.id}" feeds ${kids.length} section(s) but has zero flow; a junction's parent needs a positive flow to compare against.`;
    }
  });

  const keys = Object.keys(fields);
  if (keys.length > 0) {
    const total = keys.length + unreportedLoops;
    const shown = keys.slice(0, 3).join(", ") + (total > 3 ? ` and ${(total - Math.min(3, keys.length)).toLocaleString("en-US")} more` : "");
    throw new NetworkError(`The section tree is not valid: check ${shown}.`, capFieldErrors(fields, total));
  }

  const junctions: Junction[] = [];
  children.forEach((kids, p) => {
    if (kids.length === 0) return;
    const parent = nodes[p] as NetworkNode;
    const parentMass = mass[p] ?? 0;
    const childrenMass = childSum[p] ?? 0;
    const imbalanceKgS = parentMass - childrenMass;
    const imbalancePct = (100 * imbalanceKgS) / parentMass;

    const members = [p, ...kids];
    const densities = members.map((k) => nodes[k]?.densityKgM3);
    const volumes = members.map((k, j) => nodes[k]?.flowM3S ?? (densities[j] !== undefined ? (mass[k] ?? 0) / (densities[j] as number) : undefined));
    let naiveVolumeImbalancePct: number | null = null;
    if (volumes.every((v) => v !== undefined) && (volumes[0] as number) > 0) {
      const [trunk, ...branches] = volumes as number[];
      naiveVolumeImbalancePct = (100 * ((trunk as number) - branches.reduce((a, b) => a + b, 0))) / (trunk as number);
    }
    const known = densities.filter((d): d is number => d !== undefined);
    const [lo, hi] = range(known);
    const summable = known.length === densities.length && hi <= lo * (1 + DENSITY_AGREEMENT);

    junctions.push({
      id: parent.id,
      parentMassFlowKgS: parentMass,
      childrenMassFlowKgS: childrenMass,
      imbalanceKgS,
      imbalancePct,
      // A hair of slack so a value printed as exactly the tolerance is not failed by rounding.
      pass: Math.abs(imbalancePct) <= tolerancePct + 1e-9,
      children: kids.map((k) => nodes[k]?.id ?? ""),
      imbalanceStandardM3S: imbalanceKgS / standardDensity,
      volumesSummable: summable,
      volumeImbalancePct: summable ? naiveVolumeImbalancePct : null,
      naiveVolumeImbalancePct,
      note: volumeNote(members.map((k) => nodes[k]?.id ?? ""), densities, naiveVolumeImbalancePct, summable),
    });
  });
  return { junctions };
}
