/**
 * The verification sample: which of a submitted system's outlets, terminal units and sections the
 * commissioning agent re-reads, drawn reproducibly from a stored seed, and how the agent's readings
 * are judged against the technician's. Pure functions: no database, no clock, no Math.random.
 *
 * The rule (ours, stated on screen): each kind present gets ⌈N × pct / 100⌉ of its N items (at least
 * one); when the kinds together give fewer than the project's minimum, more items are drawn from the
 * rest of the system until the minimum (or everything) is reached. A reading agrees when it is within
 * ± tolerance % of the technician's (±10 % is common practice); more disagreements than the project
 * allows recommend returning the whole system.
 */
import { uniformInt } from "pure-rand/distribution/uniformInt";
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";

export type SampleKind = "outlet" | "terminal_unit" | "section";
export const SAMPLE_KINDS: readonly SampleKind[] = ["section", "terminal_unit", "outlet"];

export interface Candidate {
  kind: SampleKind;
  id: string;
  tag: string;
}

export interface SampleRule {
  /** Share of each kind to draw, % (0 < pct ≤ 100). */
  pct: number;
  /** The fewest items drawn from the whole system (when it has that many). */
  minCount: number;
}

/** Candidates in a stable order (kind, then tag, then id), so a draw does not depend on how rows came back. */
export function orderPopulation(candidates: readonly Candidate[]): Candidate[] {
  const rank = (k: SampleKind) => SAMPLE_KINDS.indexOf(k);
  return [...candidates].sort((a, b) => rank(a.kind) - rank(b.kind) || a.tag.localeCompare(b.tag, "en") || a.id.localeCompare(b.id));
}

/** How many of each kind the rule draws, and the total after the minimum. */
export function sampleSizes(counts: Readonly<Partial<Record<SampleKind, number>>>, rule: SampleRule): { perKind: Record<SampleKind, number>; total: number } {
  const perKind = { section: 0, terminal_unit: 0, outlet: 0 } as Record<SampleKind, number>;
  let population = 0;
  for (const kind of SAMPLE_KINDS) {
    const n = counts[kind] ?? 0;
    population += n;
    perKind[kind] = n === 0 ? 0 : Math.min(n, Math.max(1, Math.ceil((n * rule.pct) / 100 - 1e-9)));
  }
  const fromKinds = SAMPLE_KINDS.reduce((sum, k) => sum + perKind[k], 0);
  return { perKind, total: Math.min(population, Math.max(fromKinds, rule.minCount)) };
}

/** A generator that yields whole numbers in [0, n) from a 32-bit seed (xoroshiro128+, pure-rand). */
function seededIndex(seed: number): (n: number) => number {
  const rng = xoroshiro128plus(seed >>> 0);
  return (n: number) => uniformInt(rng, 0, n - 1);
}

/** Picks `count` items of `items` without replacement (a partial Fisher–Yates shuffle). */
function pick<T>(items: readonly T[], count: number, next: (n: number) => number): { picked: T[]; rest: T[] } {
  const pool = [...items];
  for (let i = 0; i < count && i < pool.length; i++) {
    const j = i + next(pool.length - i);
    [pool[i], pool[j]] = [pool[j]!, pool[i]!];
  }
  return { picked: pool.slice(0, count), rest: pool.slice(count) };
}

/**
 * Draws the sample: the same candidates, rule and seed give the same items in the same order.
 * Returns the items in the stable order of the population (kind, then tag).
 */
export function drawSample(candidates: readonly Candidate[], rule: SampleRule, seed: number): Candidate[] {
  const population = orderPopulation(candidates);
  const counts: Partial<Record<SampleKind, number>> = {};
  for (const c of population) counts[c.kind] = (counts[c.kind] ?? 0) + 1;
  const sizes = sampleSizes(counts, rule);
  const next = seededIndex(seed);
  const chosen: Candidate[] = [];
  let rest: Candidate[] = [];
  for (const kind of SAMPLE_KINDS) {
    const got = pick(
      population.filter((c) => c.kind === kind),
      sizes.perKind[kind],
      next,
    );
    chosen.push(...got.picked);
    rest = rest.concat(got.rest);
  }
  if (chosen.length < sizes.total) chosen.push(...pick(rest, sizes.total - chosen.length, next).picked);
  const order = new Map(population.map((c, i) => [c, i]));
  return chosen.sort((a, b) => order.get(a)! - order.get(b)!);
}

/** A fresh 32-bit seed from the platform's cryptographic generator (stored with the sample). */
export function newSeed(): number {
  return crypto.getRandomValues(new Uint32Array(1))[0]!;
}

export interface Comparison {
  /** (agent − technician) / technician, %. */
  differencePct: number;
  agrees: boolean;
}

/** The agent's airflow against the technician's, both at standard air: agrees within ± tolerance %. */
export function compareFlows(technicianM3S: number, agentM3S: number, tolerancePct: number): Comparison {
  const differencePct = (100 * (agentM3S - technicianM3S)) / technicianM3S;
  // Rounded to 0.01 % before judging, so a reading shown as exactly the limit is not judged outside it.
  return { differencePct, agrees: Math.abs(Math.round(differencePct * 100) / 100) <= tolerancePct };
}

export interface SampleOutcome {
  read: number;
  agreed: number;
  disagreed: number;
  notRead: number;
  /** More disagreements than allowed: return the whole system. */
  recommendReturn: boolean;
  message: string;
}

/** What the sample says so far, in numbers and words. */
export function sampleOutcome(items: readonly { agrees: boolean | null }[], allowedFailures: number): SampleOutcome {
  const agreed = items.filter((i) => i.agrees === true).length;
  const disagreed = items.filter((i) => i.agrees === false).length;
  const notRead = items.length - agreed - disagreed;
  const recommendReturn = disagreed > allowedFailures;
  const allowed = `${allowedFailures} ${allowedFailures === 1 ? "disagreement is" : "disagreements are"} allowed`;
  const message = recommendReturn
    ? `${disagreed} of ${items.length} sampled items disagree with the technician's readings and ${allowed}: return the whole system for re-reading.`
    : notRead > 0
      ? `${agreed} agree and ${disagreed} disagree so far; ${notRead} still to read (${allowed}).`
      : `All ${items.length} sampled items read: ${agreed} agree, ${disagreed} disagree (${allowed}). The sample supports the technician's readings.`;
  return { read: agreed + disagreed, agreed, disagreed, notRead, recommendReturn, message };
}
