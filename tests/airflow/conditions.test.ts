import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  compareConditions,
  compareConditionsAcross,
  conditionsWarnings,
  DEFAULT_CONDITION_TOLERANCES,
  relativeDifferencePct,
  sameConditions,
  summarizeConditions,
  type ConditionsLike,
} from "@/lib/airflow/conditions";
import { fanSpeedForFlow } from "@/lib/airflow/balancing";

const base: ConditionsLike = {
  fanSpeedRpm: 1150,
  vfdHz: null,
  boxes: "maximum",
  outsideAirDamperPct: 30,
  ductStaticSetpointPa: 250,
  filterState: "clean",
};

describe("compareConditions", () => {
  it("finds nothing between identical conditions, or a record and itself", () => {
    expect(compareConditions(base, { ...base })).toEqual([]);
    expect(compareConditions({ ...base, id: "a" }, { ...base, id: "a", fanSpeedRpm: 900 })).toEqual([]);
    expect(sameConditions(base, { ...base })).toBe(true);
  });

  it("treats fan speeds within 2 % as the same (our choice) and says how far apart larger ones are", () => {
    // The tolerance rests on the fan law Q ∝ N (ASHRAE Handbook, HVAC Systems and Equipment, fans chapter):
    // 2 % in speed is 2 % in airflow, which the engine's own fan-law aid reproduces.
    const q = fanSpeedForFlow({ speedRpm: 1000, flowM3S: 2, pressurePa: 500, powerW: 1500 }, 2.04);
    expect(q.speedRpm).toBeCloseTo(1020, 9);
    expect(DEFAULT_CONDITION_TOLERANCES.fanSpeedPct).toBe(2);

    expect(compareConditions(base, { ...base, fanSpeedRpm: 1170 })).toEqual([]); // 1.7 % apart
    const diffs = compareConditions(base, { ...base, fanSpeedRpm: 1100 }, { labels: ["S1", "S1.1"] });
    expect(diffs).toEqual([
      { field: "fanSpeed", kind: "differs", message: "Fan speed: 1,150 rpm for S1, 1,100 rpm for S1.1 (4.4 % apart; more than 2 %)." },
    ]);
  });

  it("compares drive frequencies within 0.5 Hz (our choice) when no rpm was read", () => {
    const a = { ...base, fanSpeedRpm: null, vfdHz: 48 };
    expect(compareConditions(a, { ...a, vfdHz: 48.4 })).toEqual([]);
    const [d] = compareConditions(a, { ...a, vfdHz: 47 });
    expect(d).toMatchObject({ field: "fanSpeed", kind: "differs" });
    expect(d!.message).toContain("1 Hz apart");
  });

  it("cannot compare a tachometer reading with a drive frequency, and says so", () => {
    const [d] = compareConditions(base, { ...base, fanSpeedRpm: null, vfdHz: 50 });
    expect(d).toMatchObject({ field: "fanSpeed", kind: "unknown" });
    expect(d!.message).toBe("Fan speed was recorded as 1,150 rpm for the first readings and as 50 Hz at the drive for the second readings; they cannot be compared.");
  });

  it("lists boxes, damper, static set point and filters in plain words", () => {
    const other: ConditionsLike = { fanSpeedRpm: 1150, vfdHz: null, boxes: "minimum", outsideAirDamperPct: 100, ductStaticSetpointPa: 180, filterState: "loaded" };
    const diffs = compareConditions(base, other, { formatPressure: (pa) => `${(pa / 249.08891).toFixed(2)} in. w.c.` });
    expect(diffs.map((d) => d.field)).toEqual(["boxes", "outsideAirDamperPct", "ductStaticSetpointPa", "filterState"]);
    expect(diffs[0]!.message).toBe("Terminal units: forced to maximum for the first readings, forced to minimum for the second readings.");
    // 250 Pa and 180 Pa in inches of water (1 in. w.c. = 249.08891 Pa, NIST SP 811 B.8).
    expect(diffs[2]!.message).toBe("Duct static set point: 1.00 in. w.c. for the first readings, 0.72 in. w.c. for the second readings.");
    expect(diffs[3]!.message).toBe("Filters: clean for the first readings, loaded (due for change) for the second readings.");
  });

  it("keeps static set points within 10 Pa or 5 % (our choice) and dampers within 5 points as one setting", () => {
    expect(compareConditions(base, { ...base, ductStaticSetpointPa: 259, outsideAirDamperPct: 35 })).toEqual([]);
    expect(compareConditions({ ...base, ductStaticSetpointPa: 1000 }, { ...base, ductStaticSetpointPa: 1045 })).toEqual([]);
    expect(compareConditions({ ...base, ductStaticSetpointPa: 1000 }, { ...base, ductStaticSetpointPa: 1060 })).toHaveLength(1);
  });

  it("flags what was recorded for one set only, and missing conditions, as unknown rather than the same", () => {
    const diffs = compareConditions(base, { ...base, outsideAirDamperPct: null, filterState: "unknown" }, { labels: ["A", "B"] });
    expect(diffs).toEqual([
      { field: "outsideAirDamperPct", kind: "unknown", message: "Outside-air damper position was recorded for A only." },
      { field: "filterState", kind: "unknown", message: "Filters were not checked for B." },
    ]);
    expect(compareConditions(null, base, { labels: ["A", "B"] })).toEqual([{ field: "conditions", kind: "unknown", message: "No operating conditions were recorded for A." }]);
    expect(sameConditions(null, null)).toBe(false);
  });

  it("gives the same verdict whichever set comes first, and none for a condition compared with itself (property)", () => {
    const arb = fc.record({
      fanSpeedRpm: fc.option(fc.double({ min: 100, max: 3000, noNaN: true }), { nil: null }),
      vfdHz: fc.option(fc.double({ min: 10, max: 70, noNaN: true }), { nil: null }),
      boxes: fc.constantFrom("none", "maximum", "minimum", "mixed" as const),
      outsideAirDamperPct: fc.option(fc.double({ min: 0, max: 100, noNaN: true }), { nil: null }),
      ductStaticSetpointPa: fc.option(fc.double({ min: -500, max: 2000, noNaN: true }), { nil: null }),
      filterState: fc.constantFrom("clean", "part_loaded", "loaded", "unknown" as const),
    });
    fc.assert(
      fc.property(arb, arb, (a, b) => {
        const ab = compareConditions(a, b).map((d) => `${d.field}:${d.kind}`);
        const ba = compareConditions(b, a).map((d) => `${d.field}:${d.kind}`);
        expect(ab).toEqual(ba);
        const self = compareConditions(a, { ...a }).filter((d) => d.kind === "differs");
        expect(self).toEqual([]);
      }),
    );
    expect(relativeDifferencePct(1000, 1100)).toBeCloseTo(relativeDifferencePct(1100, 1000), 12);
  });

  it("compares many sets against the first that has conditions", () => {
    const diffs = compareConditionsAcross([
      { label: "S1", conditions: base },
      { label: "S1.1", conditions: { ...base } },
      { label: "S1.2", conditions: { ...base, boxes: "none" } },
      { label: "S1.3", conditions: null },
    ]);
    expect(diffs.map((d) => d.message)).toEqual([
      "Terminal units: forced to maximum for S1, left to their controls for S1.2.",
      "No operating conditions were recorded for S1.3.",
    ]);
    expect(compareConditionsAcross([{ label: "S1", conditions: base }])).toEqual([]);
  });
});

describe("summaries and plausibility", () => {
  it("summarises a record in one line", () => {
    expect(summarizeConditions(base)).toBe("1,150 rpm · terminal units forced to maximum · outside-air damper 30 % open · static set point 250 Pa · filters clean");
  });

  it("flags a fan speed far from the schedule and drive frequencies out of the usual band, without refusing them", () => {
    expect(conditionsWarnings(base, { fanSpeedRpm: 1150, hasVfd: false })).toEqual([]);
    const [far] = conditionsWarnings({ ...base, fanSpeedRpm: 1760 }, { fanSpeedRpm: 1150, hasVfd: false });
    expect(far).toContain("53 % above the scheduled 1,150 rpm");
    const warnings = conditionsWarnings({ ...base, fanSpeedRpm: null, vfdHz: 75 }, { fanSpeedRpm: 1150, hasVfd: false });
    expect(warnings).toHaveLength(2);
    expect(warnings[0]).toContain("outside the usual 15–66 Hz");
    expect(warnings[1]).toContain("not scheduled with a variable-frequency drive");
  });
});
