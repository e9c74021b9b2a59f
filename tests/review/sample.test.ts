/**
 * The verification sample's draw (reproducible from its seed, sized by the project's rule) and the
 * comparison of the agent's readings with the technician's. The rule and the ±10 % default are common
 * practice; the draw's reproducibility is checked against a second, independent run of the generator.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { compareFlows, drawSample, orderPopulation, sampleOutcome, sampleSizes, type Candidate, type SampleKind } from "@/lib/review/sample";

function population(counts: Partial<Record<SampleKind, number>>): Candidate[] {
  const out: Candidate[] = [];
  for (const [kind, n] of Object.entries(counts) as [SampleKind, number][])
    for (let i = 0; i < n; i++) out.push({ kind, id: `${kind}-${i}`, tag: `${kind.slice(0, 2).toUpperCase()}-${String(i).padStart(3, "0")}` });
  return out;
}

describe("sampleSizes", () => {
  it("takes ⌈N × pct⌉ of each kind present (at least one), then tops up to the minimum", () => {
    // 40 outlets at 10 % → 4; 6 terminal units → 1; 4 sections → 1: 6 in all, above a minimum of 3.
    expect(sampleSizes({ outlet: 40, terminal_unit: 6, section: 4 }, { pct: 10, minCount: 3 })).toEqual({ perKind: { outlet: 4, terminal_unit: 1, section: 1 }, total: 6 });
    // 12 outlets at 10 % → 2 (⌈1.2⌉), below a minimum of 5: topped up.
    expect(sampleSizes({ outlet: 12 }, { pct: 10, minCount: 5 }).total).toBe(5);
    // Exactly 10 % of 30 is 3, not 4 (no rounding up of an exact product).
    expect(sampleSizes({ outlet: 30 }, { pct: 10, minCount: 1 }).perKind.outlet).toBe(3);
    // Never more than there is.
    expect(sampleSizes({ outlet: 2, section: 1 }, { pct: 10, minCount: 10 }).total).toBe(3);
    expect(sampleSizes({}, { pct: 10, minCount: 3 }).total).toBe(0);
  });
});

describe("drawSample", () => {
  const items = population({ outlet: 40, terminal_unit: 6, section: 4 });

  it("draws the same items for the same seed, whatever order the candidates come in", () => {
    const a = drawSample(items, { pct: 10, minCount: 3 }, 123456789);
    const b = drawSample([...items].reverse(), { pct: 10, minCount: 3 }, 123456789);
    expect(b).toEqual(a);
    expect(a.length).toBe(6);
    expect(a.filter((c) => c.kind === "outlet").length).toBe(4);
    expect(a.filter((c) => c.kind === "terminal_unit").length).toBe(1);
    expect(a.filter((c) => c.kind === "section").length).toBe(1);
  });

  it("draws differently for a different seed", () => {
    const draws = new Set([1, 2, 3, 4, 5].map((seed) => drawSample(items, { pct: 10, minCount: 3 }, seed).map((c) => c.id).join()));
    expect(draws.size).toBeGreaterThan(1);
    expect(drawSample(items, { pct: 10, minCount: 3 }, 1).map((c) => c.id)).not.toEqual(drawSample(items, { pct: 10, minCount: 3 }, 2).map((c) => c.id));
  });

  it("has the rule's size, no item twice, only candidates, at least the minimum (property)", () => {
    fc.assert(
      fc.property(
        fc.record({ outlet: fc.nat(60), terminal_unit: fc.nat(10), section: fc.nat(12) }),
        fc.double({ min: 1, max: 100, noNaN: true }),
        fc.integer({ min: 1, max: 20 }),
        fc.integer({ min: 0, max: 0xffffffff }),
        (counts, pct, minCount, seed) => {
          const pop = population(counts);
          const drawn = drawSample(pop, { pct, minCount }, seed);
          expect(drawn.length).toBe(sampleSizes(counts, { pct, minCount }).total);
          expect(new Set(drawn.map((c) => c.id)).size).toBe(drawn.length);
          expect(drawn.every((c) => pop.some((p) => p.id === c.id))).toBe(true);
          expect(drawn.length).toBeGreaterThanOrEqual(Math.min(pop.length, minCount));
          expect(drawSample(pop, { pct, minCount }, seed)).toEqual(drawn);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("gives every outlet a fair chance over many seeds (each drawn roughly 4 in 40 times)", () => {
    const outlets = population({ outlet: 40 });
    const hits = new Map<string, number>();
    const runs = 4000;
    for (let seed = 0; seed < runs; seed++) for (const c of drawSample(outlets, { pct: 10, minCount: 1 }, seed)) hits.set(c.id, (hits.get(c.id) ?? 0) + 1);
    // Expected 4000 × 4 / 40 = 400 each; a binomial sd is √(4000 × 0.1 × 0.9) ≈ 19, so ±100 is beyond 5 sd.
    for (const c of outlets) expect(Math.abs((hits.get(c.id) ?? 0) - 400)).toBeLessThan(100);
  });

  it("orders the population by kind and tag", () => {
    expect(orderPopulation(population({ outlet: 2, section: 1 })).map((c) => c.kind)).toEqual(["section", "outlet", "outlet"]);
  });
});

describe("compareFlows and the outcome", () => {
  it("agrees within ± tolerance of the technician's airflow, limits included", () => {
    expect(compareFlows(0.5, 0.55, 10)).toEqual({ differencePct: expect.closeTo(10, 9), agrees: true });
    expect(compareFlows(0.5, 0.45, 10).agrees).toBe(true);
    expect(compareFlows(0.5, 0.5501, 10).agrees).toBe(false);
    expect(compareFlows(0.5, 0.44, 10)).toEqual({ differencePct: expect.closeTo(-12, 9), agrees: false });
  });

  it("recommends returning the system when more items disagree than the project allows", () => {
    expect(sampleOutcome([{ agrees: true }, { agrees: false }, { agrees: null }], 0)).toMatchObject({ read: 2, agreed: 1, disagreed: 1, notRead: 1, recommendReturn: true });
    expect(sampleOutcome([{ agrees: true }, { agrees: false }, { agrees: true }], 1)).toMatchObject({ recommendReturn: false });
    expect(sampleOutcome([{ agrees: true }, { agrees: false }, { agrees: false }], 1).message).toMatch(/return the whole system/);
  });
});
