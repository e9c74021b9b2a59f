import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  BalancingError,
  motorHeadroom,
  fanAtSpeed,
  fanSpeedForFlow,
  percentOfDesign,
  proportionalBalance,
  withinTolerance,
  type TerminalReading,
} from "@/lib/airflow/balancing";

describe("percent of design and tolerance", () => {
  it("gives measured/design in % and applies ±10 % by default (common practice)", () => {
    expect(percentOfDesign(0.082, 0.1)).toBeCloseTo(82, 10);
    expect(withinTolerance(0.11, 0.1)).toBe(true); // exactly +10 %
    expect(withinTolerance(0.111, 0.1)).toBe(false);
    expect(withinTolerance(0.09, 0.1)).toBe(true);
  });

  it("honours an asymmetric tolerance such as −0/+10 % for outside air (project specifications)", () => {
    const oa = { minusPct: 0, plusPct: 10 };
    expect(withinTolerance(0.099, 0.1, oa)).toBe(false);
    expect(withinTolerance(0.105, 0.1, oa)).toBe(true);
  });
});

describe("proportionalBalance", () => {
  // Design/measured 0.100/0.082, 0.100/0.095, 0.150/0.171, 0.120/0.131 m³/s (airflow-methods reference §6, derived):
  // ratios 0.820 (index), 0.950, 1.140, 1.092; outside ±10 %: the first and third.
  const terminals: TerminalReading[] = [
    { id: "T1", branch: "A", designM3S: 0.1, measuredM3S: 0.082 },
    { id: "T2", branch: "A", designM3S: 0.1, measuredM3S: 0.095 },
    { id: "T3", branch: "A", designM3S: 0.15, measuredM3S: 0.171 },
    { id: "T4", branch: "A", designM3S: 0.12, measuredM3S: 0.131 },
  ];
  const plan = proportionalBalance(terminals);
  const branch = plan.branches[0];

  it("computes each ratio and picks the lowest as the index terminal", () => {
    const ratios = Object.fromEntries(branch?.steps.map((s) => [s.id, s.ratio]) ?? []);
    expect(ratios.T1).toBeCloseTo(0.82, 3);
    expect(ratios.T2).toBeCloseTo(0.95, 3);
    expect(ratios.T3).toBeCloseTo(1.14, 3);
    expect(ratios.T4).toBeCloseTo(1.092, 3);
    expect(branch?.indexTerminal).toBe("T1");
  });

  it("flags the first and third as outside ±10 %", () => {
    expect(plan.outOfTolerance).toEqual(["T1", "T3"]);
  });

  it("orders the work index first, then by increasing ratio, throttling each to the index ratio", () => {
    expect(branch?.steps.map((s) => [s.id, s.role])).toEqual([
      ["T1", "index"],
      ["T2", "throttle"],
      ["T4", "throttle"],
      ["T3", "throttle"],
    ]);
    const t3 = branch?.steps.find((s) => s.id === "T3");
    expect(t3?.targetRatio).toBeCloseTo(0.82, 12);
    expect(t3?.targetM3S).toBeCloseTo(0.15 * 0.82, 12); // 0.123 m³/s
    expect(branch?.steps[0]?.targetM3S).toBeNull();
  });

  it("estimates the fan-speed factor from the totals (Q ∝ N): 0.47 / 0.479", () => {
    expect(plan.fanSpeedFactorEstimate).toBeCloseTo(0.47 / 0.479, 12);
  });

  it("leaves terminals already within 10 % of the index ratio and sends near-dead terminals to investigation", () => {
    const p = proportionalBalance([
      { id: "a", designM3S: 1, measuredM3S: 0.9 },
      { id: "b", designM3S: 1, measuredM3S: 0.98 }, // 0.98/0.9 = +8.9 %: leave
      { id: "c", designM3S: 1, measuredM3S: 1.2 },
      { id: "dead", designM3S: 1, measuredM3S: 0.1 },
    ]);
    expect(p.branches[0]?.steps.map((s) => [s.id, s.role])).toEqual([
      ["a", "index"],
      ["b", "leave"],
      ["c", "throttle"],
      ["dead", "investigate"],
    ]);
  });

  it("a uniformly low branch (fan at half speed) still takes its lowest terminal as the index: the floor is half the branch's median", () => {
    // The ratios of the reference example (airflow-methods.md §6: 0.820, 0.950, 1.140, 1.092) at half the airflow.
    const p = proportionalBalance([
      { id: "T1", designM3S: 0.1, measuredM3S: 0.041 },
      { id: "T2", designM3S: 0.1, measuredM3S: 0.0475 },
      { id: "T3", designM3S: 0.15, measuredM3S: 0.0855 },
      { id: "T4", designM3S: 0.12, measuredM3S: 0.0655 },
    ]);
    expect(p.branches[0]?.indexTerminal).toBe("T1");
    expect(p.branches[0]?.steps.some((s) => s.role === "investigate")).toBe(false);
    // An absolute floor can still be asked for.
    expect(proportionalBalance([{ id: "a", designM3S: 1, measuredM3S: 0.41 }, { id: "b", designM3S: 1, measuredM3S: 0.47 }], { minIndexRatio: 0.45 }).branches[0]?.indexTerminal).toBe("b");
  });

  it("a terminal with no flow is never the index", () => {
    const p = proportionalBalance([{ id: "a", designM3S: 1, measuredM3S: 0 }, { id: "b", designM3S: 1, measuredM3S: 0 }, { id: "c", designM3S: 1, measuredM3S: 0.5 }]);
    expect(p.branches[0]?.indexTerminal).toBe("c");
    expect(p.branches[0]?.steps.filter((s) => s.role === "investigate").map((s) => s.id)).toEqual(["a", "b"]);
  });

  it("orders branches by their ratio, lowest (index branch) first", () => {
    const p = proportionalBalance([
      { id: "x1", branch: "east", designM3S: 1, measuredM3S: 1.1 },
      { id: "y1", branch: "west", designM3S: 1, measuredM3S: 0.8 },
      { id: "y2", branch: "west", designM3S: 1, measuredM3S: 0.9 },
    ]);
    expect(p.branches.map((b) => [b.branch, b.role])).toEqual([
      ["west", "index"],
      ["east", "throttle"],
    ]);
    expect(p.branches[0]?.ratio).toBeCloseTo(0.85, 12); // (0.8 + 0.9)/2
    expect(p.branches[1]?.ratio).toBeCloseTo(1.1, 12);
  });

  it("after throttling to the plan, every balanced terminal sits at the index ratio", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double({ min: 0.01, max: 5, noNaN: true }), fc.double({ min: 0.5, max: 2, noNaN: true })), { minLength: 1, maxLength: 30 }),
        (rows) => {
          const p = proportionalBalance(rows.map(([d, r], i) => ({ id: `t${i}`, designM3S: d, measuredM3S: d * r })));
          const steps = p.branches[0]?.steps ?? [];
          const index = steps.find((s) => s.role === "index");
          // The index is the lowest ratio not below half the branch's median (the rest go to investigation).
          const sorted = rows.map(([, r]) => r).sort((a, b) => a - b);
          const mid = Math.floor(sorted.length / 2);
          const median = sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
          expect(index?.ratio).toBeCloseTo(sorted.find((r) => r >= median / 2)!, 9);
          for (const s of steps.filter((x) => x.role === "investigate")) expect(s.ratio).toBeLessThan(median / 2);
          for (const s of steps.filter((x) => x.role === "throttle")) expect((s.targetM3S as number) / s.designM3S).toBeCloseTo(index?.ratio as number, 9);
        },
      ),
    );
  });

  it("rejects duplicate ids, non-positive design and negative measured flow by field", () => {
    try {
      proportionalBalance([
        { id: "a", designM3S: 0, measuredM3S: 1 },
        { id: "a", designM3S: 1, measuredM3S: -1 },
      ]);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(BalancingError);
      const f = (e as BalancingError).fields;
      expect(f["terminals.0.design_m3_s"]).toMatch(/Design flow 0 is not allowed/);
      expect(f["terminals.1.id"]).toMatch(/used twice/);
      expect(f["terminals.1.measured_m3_s"]).toMatch(/-1 is not allowed/);
    }
  });
});

describe("fan laws", () => {
  // Same fan, same system: Q ∝ N, p ∝ N², P ∝ N³ (fan laws, common practice). 1000 → 1100 rpm:
  // 2.0 → 2.2 m³/s, 500 → 605 Pa, 1.5 → 1.9965 kW (hand arithmetic: ×1.1, ×1.21, ×1.331).
  const point = { speedRpm: 1000, flowM3S: 2.0, pressurePa: 500, powerW: 1500, densityKgM3: 1.2 };

  it("projects to 1100 rpm", () => {
    const p = fanAtSpeed(point, 1100);
    expect(p.flowM3S).toBeCloseTo(2.2, 12);
    expect(p.pressurePa).toBeCloseTo(605, 9);
    expect(p.powerW).toBeCloseTo(1996.5, 9);
  });

  it("finds the speed for a design flow of 2.2 m³/s: 1100 rpm", () => {
    const p = fanSpeedForFlow(point, 2.2);
    expect(p.speedRpm).toBeCloseTo(1100, 9);
    expect(p.speedRatio).toBeCloseTo(1.1, 12);
    expect(p.pressurePa).toBeCloseTo(605, 9);
  });

  it("scales pressure and power, not volume flow, with density", () => {
    const p = fanAtSpeed(point, 1000, { densityKgM3: 1.08 }); // 10 % lighter air
    expect(p.flowM3S).toBeCloseTo(2.0, 12);
    expect(p.pressurePa).toBeCloseTo(450, 9);
    expect(p.powerW).toBeCloseTo(1350, 9);
  });

  it("warns past the fan's maximum speed or the motor's rating", () => {
    const p = fanSpeedForFlow(point, 2.4, { maxSpeedRpm: 1150, motorPowerW: 2200 });
    // 1200 rpm; power 1.5 kW × 1.2³ = 2.592 kW.
    expect(p.warnings.join(" ")).toMatch(/1200 rpm is above the fan's maximum of 1150 rpm/);
    expect(p.warnings.join(" ")).toMatch(/2\.59 kW is above the motor rating of 2\.20 kW/);
    expect(fanAtSpeed(point, 1100, { maxSpeedRpm: 1150, motorPowerW: 2200 }).warnings).toEqual([]);
  });

  it("rejects a density change without the measured density, and non-positive speeds", () => {
    expect(() => fanAtSpeed({ ...point, densityKgM3: undefined }, 1000, { densityKgM3: 1.1 })).toThrow(BalancingError);
    expect(() => fanAtSpeed(point, 0)).toThrow(/new fan speed/);
    expect(() => fanSpeedForFlow({ ...point, speedRpm: -5 }, 2)).toThrow(/fan\.speed_rpm/);
  });
});

describe("motor headroom for a fan-law speed increase", () => {
  it("limits today's load to nameplate ÷ (N₂/N₁)³ (fan laws, power ∝ N³; closed form)", () => {
    // 1000 → 1100 rpm: power × 1.331. A 7.5 kW motor stays within its nameplate only if it draws
    // less than 7.5 / 1.331 = 5.635 kW today (75.13 % of nameplate); with service factor 1.15, 6.480 kW.
    const h = motorHeadroom(1.1 ** 3, { powerKw: 7.5, serviceFactor: 1.15 })!;
    expect(h.maxPresentKw).toBeCloseTo(7.5 / 1.331, 9);
    expect(h.maxPresentPctOfNameplate).toBeCloseTo(75.131, 3);
    expect(h.maxPresentWithServiceFactorKw).toBeCloseTo((7.5 * 1.15) / 1.331, 9);
    expect(motorHeadroom(1.331, { powerKw: 7.5, serviceFactor: null })!.maxPresentWithServiceFactorKw).toBeNull();
    expect(motorHeadroom(0, { powerKw: 7.5, serviceFactor: null })).toBeNull();
  });
});
