import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { NetworkError, checkContinuity, type NetworkNode } from "@/lib/airflow/network";

function errorFields(nodes: NetworkNode[]): Record<string, string> {
  try {
    checkContinuity(nodes);
  } catch (e) {
    if (e instanceof NetworkError) return e.fields;
    throw e;
  }
  throw new Error("expected a NetworkError");
}

describe("checkContinuity: densities that differ", () => {
  // Trunk 1.50 m³/s at 1.180 kg/m³ feeding 0.80 m³/s at 1.170 and 0.72 m³/s at 1.150 (airflow-methods reference §4, derived).
  // Closed-form arithmetic, recomputed here: mass 1.77 vs 0.936 + 0.828 = 1.764 kg/s; volume 1.50 vs 1.52 m³/s.
  // The reference quotes "−0.34 % by mass, +1.33 % by volume" as children − parent; the contract's sign is parent − children.
  const parentMass = 1.5 * 1.18;
  const childMass = 0.8 * 1.17 + 0.72 * 1.15;
  const nodes: NetworkNode[] = [
    { id: "trunk", parent: null, massFlowKgS: Number.NaN, flowM3S: 1.5, densityKgM3: 1.18 },
    { id: "b1", parent: "trunk", massFlowKgS: Number.NaN, flowM3S: 0.8, densityKgM3: 1.17 },
    { id: "b2", parent: "trunk", massFlowKgS: Number.NaN, flowM3S: 0.72, densityKgM3: 1.15 },
  ];
  const [j] = checkContinuity(nodes).junctions;

  it("balances by mass: +0.34 % (parent − children), within ±10 %", () => {
    expect(j?.parentMassFlowKgS).toBeCloseTo(parentMass, 12);
    expect(j?.childrenMassFlowKgS).toBeCloseTo(childMass, 12);
    expect(j?.imbalanceKgS).toBeCloseTo(parentMass - childMass, 12);
    expect(j?.imbalancePct).toBeCloseTo((100 * (parentMass - childMass)) / parentMass, 10);
    expect(j?.imbalancePct).toBeCloseTo(0.34, 2);
    expect(j?.pass).toBe(true);
    expect(j?.imbalanceStandardM3S).toBeCloseTo((parentMass - childMass) / 1.204, 12);
    expect(j?.children).toEqual(["b1", "b2"]);
  });

  it("refuses to sum volumes, and shows what naive summing would give (−1.33 %)", () => {
    expect(j?.volumesSummable).toBe(false);
    expect(j?.volumeImbalancePct).toBeNull();
    expect(j?.naiveVolumeImbalancePct).toBeCloseTo((100 * (1.5 - 1.52)) / 1.5, 10);
    expect(j?.naiveVolumeImbalancePct).toBeCloseTo(-1.33, 2);
    expect(j?.note).toMatch(/Densities differ by 2\.6 % \(1\.150–1\.180 kg\/m³\): compare mass flows, not volumes\. Summing actual volumes would show -1\.33 %/);
  });
});

describe("checkContinuity: a multi-level tree", () => {
  const nodes: NetworkNode[] = [
    { id: "fan", parent: null, massFlowKgS: 6.0 },
    { id: "north", parent: "fan", massFlowKgS: 3.2 },
    { id: "south", parent: "fan", massFlowKgS: 2.5 },
    { id: "n1", parent: "north", massFlowKgS: 1.0 },
    { id: "n2", parent: "north", massFlowKgS: 1.1 },
    { id: "n3", parent: "north", massFlowKgS: 1.2 },
    { id: "s1", parent: "south", massFlowKgS: 1.0, flowM3S: 1.0 / 1.2, densityKgM3: 1.2 },
    { id: "s2", parent: "south", massFlowKgS: 1.2, flowM3S: 1.0, densityKgM3: 1.2 },
  ];

  it("gives one junction per section with children, in input order, each against its own tolerance", () => {
    const { junctions } = checkContinuity(nodes, { tolerancePct: 5 });
    expect(junctions.map((x) => x.id)).toEqual(["fan", "north", "south"]);
    const [fan, north, south] = junctions;
    // Hand arithmetic: fan 6.0 − 5.7 = 0.3 (5 %); north 3.2 − 3.3 = −0.1 (−3.125 %); south 2.5 − 2.2 = 0.3 (12 %).
    expect(fan?.imbalancePct).toBeCloseTo(5, 10);
    expect(fan?.pass).toBe(true);
    expect(north?.imbalancePct).toBeCloseTo(-3.125, 10);
    expect(north?.pass).toBe(true);
    expect(south?.imbalancePct).toBeCloseTo(12, 10);
    expect(south?.pass).toBe(false);
    expect(fan?.note).toMatch(/Density not given for "fan", "north", "south"/);
    expect(fan?.volumesSummable).toBe(false);
  });

  it("uses a ±10 % tolerance by default (common practice)", () => {
    expect(checkContinuity(nodes).junctions.map((x) => x.pass)).toEqual([true, true, false]);
  });

  it("sums volumes where all densities agree within 0.1 %, and then volume and mass imbalance coincide", () => {
    const same: NetworkNode[] = [
      { id: "t", parent: null, massFlowKgS: Number.NaN, flowM3S: 2.0, densityKgM3: 1.2 },
      { id: "a", parent: "t", massFlowKgS: Number.NaN, flowM3S: 1.1, densityKgM3: 1.2005 },
      { id: "b", parent: "t", massFlowKgS: Number.NaN, flowM3S: 0.8, densityKgM3: 1.2 },
    ];
    const [j] = checkContinuity(same).junctions;
    expect(j?.volumesSummable).toBe(true);
    expect(j?.volumeImbalancePct).toBeCloseTo(5, 10); // (2.0 − 1.9)/2.0
    expect(j?.imbalancePct).toBeCloseTo((100 * (2.4 - (1.1 * 1.2005 + 0.96))) / 2.4, 10);
    expect(j?.note).toMatch(/may be summed/);
  });
});

describe("checkContinuity: bad input", () => {
  it("names a duplicate id, an unknown parent and a missing flow by dotted path", () => {
    const fields = errorFields([
      { id: "a", parent: null, massFlowKgS: 1 },
      { id: "a", parent: null, massFlowKgS: 1 },
      { id: "c", parent: "nowhere", massFlowKgS: 1 },
      { id: "d", parent: "a", massFlowKgS: Number.NaN, flowM3S: 0.5 },
    ]);
    expect(fields["nodes.1.id"]).toMatch(/"a" is used twice \(first at nodes\.0\)/);
    expect(fields["nodes.2.parent"]).toMatch(/Parent "nowhere" of section "c" is not in the list/);
    expect(fields["nodes.3.mass_flow_kg_s"]).toMatch(/no flow: give mass_flow_kg_s, or flow_m3_s together with density_kg_m3/);
  });

  it("finds loops, including a section that is its own parent, and reports each loop once with its path", () => {
    const fields = errorFields([
      { id: "root", parent: null, massFlowKgS: 3 },
      { id: "x", parent: "y", massFlowKgS: 1 },
      { id: "y", parent: "z", massFlowKgS: 1 },
      { id: "z", parent: "x", massFlowKgS: 1 },
      { id: "self", parent: "self", massFlowKgS: 1 },
      { id: "below", parent: "x", massFlowKgS: 1 },
    ]);
    expect(Object.keys(fields).sort()).toEqual(["nodes.1.parent", "nodes.4.parent"]);
    expect(fields["nodes.1.parent"]).toMatch(/"x" and 2 other sections form a loop by parent links \("x" → "y" → "z" → "x"\)/);
    expect(fields["nodes.4.parent"]).toMatch(/"self" is its own parent by parent links \("self" → "self"\)/);
  });

  it("reports a 100 000-section loop once, with a shortened path, in a small error", () => {
    const n = 100_000;
    const nodes: NetworkNode[] = Array.from({ length: n }, (_, i) => ({ id: `s${i}`, parent: `s${(i + 1) % n}`, massFlowKgS: 1 }));
    try {
      checkContinuity(nodes);
      expect.unreachable();
    } catch (e) {
      const err = e as NetworkError;
      expect(Object.keys(err.fields)).toEqual(["nodes.0.parent"]);
      expect(err.fields["nodes.0.parent"]).toMatch(/"s0" and 99,999 other sections form a loop .*"s0" → "s1" → "s2" → … 99,994 more … → "s99997" → "s99998" → "s99999" → "s0"/);
      expect(JSON.stringify({ error: { message: err.message, fields: err.fields } }).length).toBeLessThan(1000);
    }
  });

  it("returns at most 50 field errors and a count of the rest", () => {
    const nodes: NetworkNode[] = Array.from({ length: 500 }, (_, i) => ({ id: `s${i}`, parent: `s${i}`, massFlowKgS: 1 }));
    const fields = errorFields(nodes);
    expect(Object.keys(fields)).toHaveLength(51);
    expect(fields["(more)"]).toMatch(/^450 more fields have problems/);
  });

  it("refuses non-zero flows too small to be real (under 1e-6 kg/s or m³/s), which would make percentages absurd", () => {
    const fields = errorFields([
      { id: "p", parent: null, massFlowKgS: 1e-300 },
      { id: "q", parent: "p", massFlowKgS: 0 },
      { id: "r", parent: "p", massFlowKgS: 0, flowM3S: 1e-9, densityKgM3: 1.2 },
    ]);
    expect(fields["nodes.0.mass_flow_kg_s"]).toMatch(/1e-300 kg\/s is too small to be a measured flow/);
    expect(fields["nodes.2.flow_m3_s"]).toMatch(/too small/);
  });

  it("rejects negative flows, zero-flow junction parents and contradictory mass vs flow × density", () => {
    const fields = errorFields([
      { id: "p", parent: null, massFlowKgS: 0 },
      { id: "q", parent: "p", massFlowKgS: -1 },
      { id: "r", parent: "p", massFlowKgS: 1.3, flowM3S: 1, densityKgM3: 1.2 },
      { id: "s", parent: "p", massFlowKgS: Number.NaN, flowM3S: 1, densityKgM3: -1.2 },
    ]);
    expect(fields["nodes.0.mass_flow_kg_s"]).toMatch(/zero flow/);
    expect(fields["nodes.1.mass_flow_kg_s"]).toMatch(/-1 kg\/s is negative/);
    expect(fields["nodes.2.mass_flow_kg_s"]).toMatch(/disagrees with flow × density = 1\.20000 kg\/s/);
    expect(fields["nodes.3.density_kg_m3"]).toMatch(/-1\.2 is not allowed/);
  });

  it("throws a NetworkError whose message lists the first fields", () => {
    expect(() => checkContinuity([{ id: "a", parent: "b", massFlowKgS: 1 }])).toThrow(/not valid: check nodes\.0\.parent/);
  });
});

describe("checkContinuity: properties and scale", () => {
  it("finds zero imbalance wherever children sum exactly to the parent, and is unchanged by scaling all flows", () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.nat(), fc.double({ min: 0.01, max: 10, noNaN: true })), { minLength: 1, maxLength: 60 }), fc.double({ min: 0.1, max: 10, noNaN: true }), (spec, k) => {
        // Random tree: node i+1 hangs under some earlier node; leaves carry given flows, parents the sum.
        const parents = spec.map(([r], i) => (r % (i + 1)).toString());
        const n = spec.length + 1;
        const flow = new Array<number>(n).fill(0);
        const hasChild = new Array<boolean>(n).fill(false);
        parents.forEach((p) => (hasChild[Number(p)] = true));
        spec.forEach(([, f], i) => (flow[i + 1] = hasChild[i + 1] ? 0 : f));
        for (let i = n - 1; i >= 1; i--) flow[Number(parents[i - 1])]! += flow[i]!;
        const nodes: NetworkNode[] = flow.map((f, i) => ({ id: String(i), parent: i === 0 ? null : (parents[i - 1] as string), massFlowKgS: f }));
        const base = checkContinuity(nodes).junctions;
        for (const j of base) {
          expect(Math.abs(j.imbalancePct)).toBeLessThan(1e-9);
          expect(j.pass).toBe(true);
        }
        const scaled = checkContinuity(nodes.map((x, i) => ({ ...x, massFlowKgS: x.massFlowKgS * k * (i === 0 ? 1.05 : 1) }))).junctions;
        expect(scaled[0]?.imbalancePct).toBeCloseTo(100 * (1 - 1 / 1.05), 8);
      }),
    );
  });

  it("handles 20 000 sections, wide and deep, without recursion (its speed is measured in npm run bench)", () => {
    const n = 20_000;
    const chain: NetworkNode[] = Array.from({ length: n }, (_, i) => ({ id: `c${i}`, parent: i === 0 ? null : `c${i - 1}`, massFlowKgS: 1 }));
    const star: NetworkNode[] = [{ id: "hub", parent: null, massFlowKgS: n - 1 }, ...Array.from({ length: n - 1 }, (_, i) => ({ id: `s${i}`, parent: "hub", massFlowKgS: 1 }))];
    const deep = checkContinuity(chain).junctions;
    const wide = checkContinuity(star).junctions;
    expect(deep).toHaveLength(n - 1);
    expect(wide).toHaveLength(1);
    expect(wide[0]?.imbalanceKgS).toBe(0);
  });
});
