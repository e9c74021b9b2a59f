import { describe, expect, it } from "vitest";
import { assessPlane } from "@/lib/airflow/quality";

// Standard air 1.204 kg/m³ (ASHRAE SI, common practice); Pv = ½ρV² is the incompressible pitot relation.
const RHO = 1.204;
const pvOf = (v: number) => 0.5 * RHO * v * v;
const plane = (velocities: number[]) => assessPlane(velocities.map(pvOf), velocities);

describe("plane quality statistics", () => {
  it("coefficient of variation is the sample standard deviation over the mean (hand-computed: 1,2,3,4 → √(5/3)/2.5)", () => {
    const q = plane([1, 2, 3, 4]);
    expect(q.cv).toBeCloseTo(Math.sqrt(5 / 3) / 2.5, 12);
    expect(q.maxOverMean).toBeCloseTo(4 / 2.5, 12);
    expect(q.count).toBe(4);
  });

  it("share above a tenth of the largest Pv counts Pv, not velocity (Pv ∝ V², so 0.1 Pv_max is 0.316 V_max)", () => {
    // Velocities 10 and 3.5: Pv ratio 0.1225 > 0.1 counts; 3.0: ratio 0.09 does not.
    const q = plane([10, 10, 3.5, 3.0]);
    expect(q.shareAboveTenthOfMax).toBeCloseTo(3 / 4, 12);
  });

  it("a fully developed profile (1/7 law on the ISO 5802 log-linear 8-point diameter) is good", () => {
    // y/D positions from ISO 5802:2001; u/u_max = (1 − r/R)^(1/7) with r/R = |1 − 2y/D|.
    const ys = [0.021, 0.117, 0.184, 0.345, 0.655, 0.816, 0.883, 0.979];
    const q = plane(ys.map((y) => 20 * (1 - Math.abs(1 - 2 * y)) ** (1 / 7)));
    expect(q.verdict).toBe("good");
    expect(q.shareAboveTenthOfMax).toBe(1);
    expect(q.reasons).toHaveLength(1);
  });
});

// The bands are common practice and the 75 % share is from memory (no published source confirmed): these tests check
// the engine applies its stated bands, not that the bands are right.
describe("verdicts against the engine's own bands (common practice; the 75 % share from memory)", () => {
  it("70 % above a tenth is marginal and says so", () => {
    // 7 points at 10 m/s; 3 at 2 m/s (Pv ratio 0.04). Max/mean 10/7.6 = 1.32 stays in the good band.
    const q = plane([10, 10, 10, 10, 10, 10, 10, 2, 2, 2]);
    expect(q.shareAboveTenthOfMax).toBeCloseTo(0.7, 12);
    expect(q.verdict).not.toBe("good");
    expect(q.reasons.join(" ")).toMatch(/70 % of points read more than a tenth/);
  });

  it("flow concentrated in a corner is poor", () => {
    const q = plane([20, 18, 2, 1, 1, 1, 1, 1, 1]);
    expect(q.verdict).toBe("poor");
    expect(q.maxOverMean).toBeGreaterThan(2);
  });

  it("zero and negative readings are counted, flagged and at least marginal", () => {
    const v = [10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10, 0];
    const pvs = v.map(pvOf);
    pvs[19] = -2; // a negative velocity pressure reads as zero velocity
    const q = assessPlane(pvs, v);
    expect(q.zeroOrNegativeCount).toBe(1);
    expect(q.verdict).toBe("marginal");
    expect(q.reasons.join(" ")).toMatch(/zero or negative/);
  });

  it("velocity pressures under 5 Pa are counted; a plane that is mostly under 5 Pa is marginal", () => {
    // 2.5 m/s in standard air is Pv = 3.76 Pa.
    const q = plane([2.5, 2.5, 2.5, 2.6, 2.6, 2.7]);
    expect(q.lowPressureCount).toBe(6);
    expect(q.verdict).toBe("marginal");
  });

  it("the under-5 Pa criterion applies only to readings taken as pressures, not to an anemometer's equivalent", () => {
    const velocities = [2.5, 2.5, 2.5, 2.6, 2.6, 2.7];
    const q = assessPlane(velocities.map(pvOf), velocities, { readAsPressures: false });
    expect(q.lowPressureCount).toBe(0);
    expect(q.verdict).toBe("good");
  });

  it("no forward flow anywhere is poor, with no division by zero", () => {
    const q = assessPlane([0, -1, 0], [0, 0, 0]);
    expect(q.verdict).toBe("poor");
    expect(q.zeroOrNegativeCount).toBe(3);
    expect(q.shareAboveTenthOfMax).toBe(0);
  });

  it("rejects empty or mismatched input", () => {
    expect(() => assessPlane([], [])).toThrow(RangeError);
    expect(() => assessPlane([1, 2], [1])).toThrow(RangeError);
  });
});
