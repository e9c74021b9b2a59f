import { describe, expect, it } from "vitest";
import type { ConditionsLike } from "@/lib/airflow/conditions";
import {
  DEFAULT_OUTLET_ACCURACY_PCT,
  fanVersusOutlets,
  outletAccuracy,
  outletReadingStandardUncertainty,
  velocityFloorAsFlowM3S,
  type OutletInput,
} from "@/lib/airflow/fan-outlets";

const conditions = (fanSpeedRpm: number): ConditionsLike => ({ fanSpeedRpm, vfdHz: null, boxes: "none", outsideAirDamperPct: null, ductStaticSetpointPa: null, filterState: "clean" });
const hood3 = outletAccuracy({ pct: 3, floorM3S: 0 });
const outlet = (tag: string, q: number | null, extra: Partial<OutletInput> = {}): OutletInput => ({
  tag,
  standardFlowM3S: q,
  phase: q === null ? null : "final",
  accuracy: hood3,
  conditions: conditions(1150),
  ...extra,
});

describe("an outlet reading's standard uncertainty from the instrument's accuracy", () => {
  it("takes a maker's limit ±a as rectangular, u = a/√3 (GUM JCGM 100:2008 §4.3.7)", () => {
    // ±3 % of 0.45 m³/s = ±0.0135 m³/s; u = 0.0135/√3 = 0.0077942 m³/s (closed form).
    expect(outletReadingStandardUncertainty(0.45, { pct: 3, floorM3S: 0 })).toBeCloseTo(0.0135 / Math.sqrt(3), 12);
    // The floor adds to the limit before dividing: (0.03·0.2 + 0.0033)/√3 (closed form).
    expect(outletReadingStandardUncertainty(0.2, { pct: 3, floorM3S: 0.0033 })).toBeCloseTo((0.006 + 0.0033) / Math.sqrt(3), 12);
  });

  it("uses the register's figure when it states one, the documented default otherwise", () => {
    expect(outletAccuracy({ pct: 3, floorM3S: 0.0033 })).toEqual({ pct: 3, floorM3S: 0.0033, source: "register" });
    expect(outletAccuracy({ pct: null, floorM3S: null })).toEqual({ pct: DEFAULT_OUTLET_ACCURACY_PCT, floorM3S: 0, source: "default" });
    expect(outletAccuracy(null).source).toBe("default");
    // ±5 % of reading when unknown (common practice).
    expect(DEFAULT_OUTLET_ACCURACY_PCT).toBe(5);
  });

  it("turns an anemometer's velocity floor into the same fraction of the flow", () => {
    // 0.05 m/s on a mean of 2.5 m/s is 2 % of the flow: 0.02 × 0.3 = 0.006 m³/s (closed form).
    expect(velocityFloorAsFlowM3S(0.05, 2.5, 0.3)).toBeCloseTo(0.006, 12);
    expect(velocityFloorAsFlowM3S(0.05, 0, 0.3)).toBeNull();
  });
});

describe("the fan's traversed airflow against the sum of its outlets", () => {
  it("works the example: one trunk traverse, four outlets read with a ±3 % hood", () => {
    // Worked example (closed form, GUM §5.1.2 for uncorrelated inputs, §6.2.1 for U = k·u_c with k = 2):
    //   fan: Q = 2.000 m³/s with relative standard uncertainty 2.5 % → u_fan = 0.0500 m³/s
    //   outlets: 4 × 0.450 m³/s, each ±3 % → u_i = 0.0135/√3 = 0.0077942 m³/s, u_i² = 6.075e-5
    //   unaccounted = 2.000 − 1.800 = 0.200 m³/s = 10.0 % of the fan
    //   u_c = √(0.05² + 4 × 6.075e-5) = √0.002743 = 0.0523737 m³/s
    //   U = 2 × 0.0523737 = 0.1047474 m³/s = 5.237 % of the fan → the difference exceeds U.
    const check = fanVersusOutlets(
      [{ tag: "S1", standardFlowM3S: 2, relativeStandardUncertainty: 0.025, conditions: conditions(1150) }],
      ["SD-1", "SD-2", "SD-3", "SD-4"].map((t) => outlet(t, 0.45)),
    );
    expect(check.status).toBe("complete");
    if (check.status !== "complete") return;
    expect(check.fanStandardM3S).toBeCloseTo(2, 12);
    expect(check.outletsStandardM3S).toBeCloseTo(1.8, 12);
    expect(check.unaccountedStandardM3S).toBeCloseTo(0.2, 12);
    expect(check.unaccountedPct).toBeCloseTo(10, 10);
    expect(check.standardUncertaintyM3S).toBeCloseTo(Math.sqrt(0.002743), 12);
    expect(check.standardUncertaintyM3S).toBeCloseTo(0.0523737, 6);
    expect(check.coverageFactor).toBe(2);
    expect(check.expandedUncertaintyM3S).toBeCloseTo(0.1047474, 6);
    expect(check.expandedUncertaintyPct).toBeCloseTo(5.23737, 4);
    expect(check.withinUncertainty).toBe(false);
    expect(check.conditionDifferences).toEqual([]);
    expect(check.initialOnly).toEqual([]);
    expect(check.defaultAccuracy).toEqual([]);
  });

  it("adds several fan-side sections and their uncertainties in quadrature", () => {
    // Two roots 1.0 ± 0.02 and 0.5 ± 0.01 (k = 1), one outlet 1.45 read at the ±5 % default:
    //   u_c² = 0.02² + 0.01² + (0.05 × 1.45 / √3)² (closed form).
    const check = fanVersusOutlets(
      [
        { tag: "A", standardFlowM3S: 1, relativeStandardUncertainty: 0.02, conditions: null },
        { tag: "B", standardFlowM3S: 0.5, relativeStandardUncertainty: 0.02, conditions: null },
      ],
      [outlet("G-1", 1.45, { accuracy: outletAccuracy(null), conditions: null })],
    );
    expect(check.status).toBe("complete");
    if (check.status !== "complete") return;
    const expected = Math.sqrt(0.02 ** 2 + 0.01 ** 2 + ((0.05 * 1.45) / Math.sqrt(3)) ** 2);
    expect(check.standardUncertaintyM3S).toBeCloseTo(expected, 12);
    expect(check.unaccountedStandardM3S).toBeCloseTo(0.05, 12);
    expect(check.withinUncertainty).toBe(Math.abs(0.05) <= 2 * expected);
    expect(check.defaultAccuracy).toEqual(["G-1"]);
    // No conditions recorded for any of them: the check says so rather than implying they match.
    expect(check.conditionDifferences.map((d) => d.kind)).toContain("unknown");
  });

  it("names outlets read only as found, and warns when readings were taken under different conditions", () => {
    const check = fanVersusOutlets(
      [{ tag: "S1", standardFlowM3S: 1, relativeStandardUncertainty: 0.03, conditions: conditions(1150) }],
      [outlet("SD-1", 0.5, { phase: "initial" }), outlet("SD-2", 0.45, { conditions: conditions(1000) })],
    );
    expect(check.status).toBe("complete");
    if (check.status !== "complete") return;
    expect(check.initialOnly).toEqual(["SD-1"]);
    expect(check.conditionDifferences.length).toBeGreaterThan(0);
    expect(check.conditionDifferences[0]!.message).toMatch(/SD-2/);
  });
});

describe("missing measurements are named, never summed in part", () => {
  it("gives no sum while an outlet is unread, and lists which", () => {
    const check = fanVersusOutlets(
      [{ tag: "S1", standardFlowM3S: 2, relativeStandardUncertainty: 0.025, conditions: null }],
      [outlet("SD-1", 0.5), outlet("SD-2", null), outlet("SD-3", 0.5), outlet("SD-4", null)],
    );
    expect(check.status).toBe("incomplete");
    if (check.status !== "incomplete") return;
    expect(check.missingOutlets).toEqual(["SD-2", "SD-4"]);
    expect(check.outletsRead).toBe(2);
    expect(check.outletsTotal).toBe(4);
    expect(check.missingTraverses).toEqual([]);
    expect(check.message).toMatch(/2 of 4 outlets \(SD-2, SD-4\)/);
    expect(check.message).toMatch(/No partial sum/);
    expect(check).not.toHaveProperty("outletsStandardM3S");
    expect(check).not.toHaveProperty("unaccountedStandardM3S");
  });

  it("gives no sum without the fan-side traverse, saying why it is missing", () => {
    const check = fanVersusOutlets(
      [
        { tag: "X1", standardFlowM3S: null, relativeStandardUncertainty: null, missingReason: "no traverse taken", conditions: null },
        { tag: "X2", standardFlowM3S: 0.4, relativeStandardUncertainty: 0.03, conditions: null },
      ],
      [outlet("EG-1", 0.4)],
    );
    expect(check.status).toBe("incomplete");
    if (check.status !== "incomplete") return;
    expect(check.missingTraverses).toEqual([{ tag: "X1", reason: "no traverse taken" }]);
    expect(check.missingOutlets).toEqual([]);
    expect(check.message).toMatch(/X1 \(no traverse taken\)/);
  });

  it("treats a traverse whose uncertainty cannot be determined as missing", () => {
    const check = fanVersusOutlets([{ tag: "S1", standardFlowM3S: 1, relativeStandardUncertainty: Number.POSITIVE_INFINITY, conditions: null }], [outlet("SD-1", 1)]);
    expect(check.status).toBe("incomplete");
  });

  it("says so when the design has no fan section or no outlets", () => {
    expect(fanVersusOutlets([], [outlet("SD-1", 1)]).status).toBe("no_fan_section");
    expect(fanVersusOutlets([{ tag: "S1", standardFlowM3S: 1, relativeStandardUncertainty: 0.02, conditions: null }], []).status).toBe("no_outlets");
  });
});
