import psychrolib from "psychrolib";
import { describe, expect, it } from "vitest";
import type { AirConditions } from "@/lib/airflow/air";
import { EngineInputError } from "@/lib/airflow/errors";
import { reduceTraverse, type TraverseInput } from "@/lib/airflow/traverse";

psychrolib.SetUnitSystem(psychrolib.SI);

const KAPPA = 1.4;
const AIR: AirConditions = { dryBulbC: 20, barometricPa: 101_325, staticPa: 0, relativeHumidityPct: 50 };
// Reference density from psychrolib (ASHRAE Fundamentals ch. 1 equations), not from the engine.
const RHO = psychrolib.GetMoistAirDensity(20, psychrolib.GetHumRatioFromRelHum(20, 0.5, 101_325), 101_325);
const ROUND_600 = { shape: "round", diameterM: 0.6 } as const;

/** Isentropic pitot series, Pv = ½ρV²(1 + M²/4 + M⁴/40), M² = ρV²/(κp) (closed form, airflow-methods.md §2). */
function pvFromVelocity(v: number, rho = RHO, p = 101_325): number {
  const m2 = (rho * v * v) / (KAPPA * p);
  return 0.5 * rho * v * v * (1 + m2 / 4 + (m2 * m2) / 40);
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);
const base = (readings: (number | null)[][], extra: Partial<TraverseInput> = {}): TraverseInput => ({ duct: ROUND_600, method: "log-linear", air: AIR, readings, ...extra });

describe("flows from a uniform plane", () => {
  const v = 8;
  const r = reduceTraverse(base([Array(8).fill(pvFromVelocity(v)), Array(8).fill(pvFromVelocity(v))]));

  it("velocity, area, actual, mass and standard flow follow Q = A·V, ṁ = ρQ, Q_std = ṁ/1.204 (airflow-methods.md §4)", () => {
    const area = (Math.PI * 0.6 ** 2) / 4;
    expect(rel(r.densityKgM3, RHO)).toBeLessThan(1e-4);
    expect(rel(r.meanVelocityMS, v)).toBeLessThan(1e-5);
    expect(r.areaM2).toBeCloseTo(area, 12);
    expect(rel(r.flowM3S, area * v)).toBeLessThan(1e-5);
    expect(rel(r.massFlowKgS, RHO * area * v)).toBeLessThan(1e-4);
    expect(rel(r.standardFlowM3S, (RHO * area * v) / 1.204)).toBeLessThan(1e-4); // 1.204 kg/m³: ASHRAE SI standard air (common practice)
    expect(r.integrationRule).toBe("equal-weight");
    expect(r.standardDensityKgM3).toBe(1.204);
  });

  it("Reynolds number on the hydraulic diameter with Sutherland viscosity (1.8133e-5 Pa·s at 20 °C, derived)", () => {
    expect(rel(r.reynolds, (RHO * v * 0.6) / 1.8133e-5)).toBeLessThan(1e-3);
  });

  it("a different standard density changes only the standard flow", () => {
    const r12 = reduceTraverse(base([Array(8).fill(50), Array(8).fill(50)], { standardDensityKgM3: 1.2 }));
    const r1204 = reduceTraverse(base([Array(8).fill(50), Array(8).fill(50)]));
    expect(r12.flowM3S).toBe(r1204.flowM3S);
    expect(r12.standardFlowM3S).toBeCloseTo((r1204.standardFlowM3S * 1.204) / 1.2, 12);
  });

  it("uses the standard atmosphere when only the altitude is given (ASHRAE Fundamentals ch. 1: 1000 m → 89 875 Pa)", () => {
    const at = reduceTraverse(base([[50, 50, 50, 50, 50, 50]], { air: { dryBulbC: 20, altitudeM: 1000, staticPa: 0, relativeHumidityPct: 0 } }));
    expect(rel(at.air.barometricPa, 89_875)).toBeLessThan(2e-5);
    expect(rel(at.densityKgM3, psychrolib.GetMoistAirDensity(20, 0, psychrolib.GetStandardAtmPressure(1000)))).toBeLessThan(1e-4);
  });
});

describe("velocities are averaged, never pressures", () => {
  it("on the 1/7 law the pressure-averaged velocity over-reads by about √(mean u²)/mean u − 1 = +1.0 % and the traverse does not", () => {
    // Continuous 1/7 law: mean u² = 2/((a+1)(a+2)) with a = 2/7, mean u = 98/120 → ratio − 1 = +1.0 % (derived).
    const a = 2 / 7;
    const continuous = Math.sqrt(2 / ((a + 1) * (a + 2))) / (98 / 120) - 1;
    expect(continuous * 100).toBeCloseTo(1.0, 1);

    // ISO 3966 / ASHRAE 10-point log-linear positions; u = 15·(1 − r/R)^(1/7).
    const ys = [0.019, 0.076, 0.153, 0.217, 0.361, 0.639, 0.783, 0.847, 0.924, 0.981];
    const u = ys.map((y) => 15 * (1 - Math.abs(1 - 2 * y)) ** (1 / 7));
    const r = reduceTraverse(base([u.map((x) => pvFromVelocity(x)), u.map((x) => pvFromVelocity(x))], { duct: { shape: "round", diameterM: 1 } }));
    const meanU = u.reduce((s, x) => s + x, 0) / u.length;
    expect(rel(r.meanVelocityMS, meanU)).toBeLessThan(1e-6);
    const meanPv = u.reduce((s, x) => s + pvFromVelocity(x), 0) / u.length;
    const fromMeanPressure = Math.sqrt((2 * meanPv) / RHO);
    expect(fromMeanPressure / r.meanVelocityMS - 1).toBeGreaterThan(0.008);
    expect(fromMeanPressure / r.meanVelocityMS - 1).toBeLessThan(0.013);
  });
});

describe("flags and warnings", () => {
  it("negative velocity pressures count as zero velocity and are flagged", () => {
    const r = reduceTraverse(base([[-3, 40, 50, 50, 40, 0]]));
    expect(r.points[0]?.velocityMS).toBe(0);
    expect(r.points[5]?.velocityMS).toBe(0);
    expect(r.quality.zeroOrNegativeCount).toBe(2);
    expect(r.warnings.join(" ")).toMatch(/2 points read zero or negative/);
  });

  it("warns beyond Mach 0.25 (ISO 3966 limit): 95 m/s at 20 °C is Mach 0.277 with a = √(κRT) = 343.2 m/s", () => {
    const pv = pvFromVelocity(95);
    const r = reduceTraverse(base([Array(6).fill(pv)]));
    expect(r.maxMach).toBeCloseTo(95 / Math.sqrt(1.4 * 287.042 * 293.15), 3);
    expect(r.warnings.join(" ")).toMatch(/Mach 0\.28/);
  });

  it("warns about low velocity pressures (< 5 Pa, common practice)", () => {
    const r = reduceTraverse(base([[3, 4, 4, 4, 4, 3]]));
    expect(r.warnings.join(" ")).toMatch(/6 points read under 5 Pa/);
  });

  it("warns about a point over 3 × the mean (common practice)", () => {
    const r = reduceTraverse(base([[2, 2, 2, 2, 2, 2, 2, 2, 2, 400]], { duct: ROUND_600, method: "equal-area" }));
    expect(r.warnings.join(" ")).toMatch(/Line 1 point 10 reads .* over 3 × the mean/);
  });

  it("fewer lines or points than recommended is a warning, never an error", () => {
    const r = reduceTraverse(base([[40, 50, 50, 40]], { method: "equal-area" }));
    expect(r.layout.lineCount).toBe(1);
    expect(r.warnings.join(" ")).toMatch(/fewer than the 2 recommended/);
    expect(r.warnings.join(" ")).toMatch(/4 points per line is fewer than the 8 recommended/);
  });

  it("a missing point keeps the method's weights, is filled from the same radius and says so", () => {
    const row = [30, 45, 50, 50, 45, 30];
    const full = reduceTraverse(base([row, row]));
    const r = reduceTraverse(base([row, [null, ...row.slice(1)]]));
    expect(r.integrationRule).toBe("equal-weight");
    expect(r.filled).toEqual([expect.objectContaining({ line: 1, point: 0, from: "mirror" })]);
    expect(r.points[6]).toEqual(expect.objectContaining({ reading: null, velocityMS: null, filledFrom: "mirror", filledVelocityMS: r.points[11]?.velocityMS }));
    expect(r.meanVelocityMS).toBeCloseTo(full.meanVelocityMS, 12); // symmetric readings: the filled plane is the full one
    expect(r.warnings.join(" ")).toMatch(/1 point was not read; the method's own weights were kept/);
    expect(r.quality.count).toBe(11);
  });

  it("falls back to tributary areas when a gap has no counterpart, and says so", () => {
    const r = reduceTraverse(base([[null, 45, 50, 50, 45, null]]));
    expect(r.integrationRule).toBe("tributary-area");
    expect(r.warnings.join(" ")).toMatch(/2 points were not read, too many to fill/);
  });

  it("refuses a traverse whose readings are mostly negative: the pitot connections are probably swapped", () => {
    const swapped = [[-30, -45, -50, -50, -45, 2], [-31, -44, -52, -49, -46, -29]];
    try {
      reduceTraverse(base(swapped));
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(EngineInputError);
      expect((e as EngineInputError).fields.readings).toMatch(/11 of 12 readings are negative.*total and static connections .* reversed/);
    }
    expect(() => reduceTraverse(base(swapped.map((row) => row.map((v) => -v / 10))))).not.toThrow(); // mostly positive: a flagged plane, not refused
  });

  it("refuses a traverse with no forward flow at all instead of a flow of 0 with an infinite uncertainty", () => {
    expect(() => reduceTraverse(base([[0, 0, -1, 0, 0, 0]]))).toThrow(EngineInputError);
    expect(() => reduceTraverse(base([[0, 0, 0, 0, 0, 0]], { readingsKind: "velocity_actual" }))).toThrow(/No reading shows forward flow/);
  });

  it("reports each point's published and read position, flagging those the probe head cannot reach", () => {
    // 150 mm round, log-linear 10: wall points at 0.019 D = 2.85 mm (ISO 3966 positions), an 8 mm head reads at 4 mm.
    const r = reduceTraverse(base([Array(10).fill(40), Array(10).fill(40)], { duct: { shape: "round", diameterM: 0.15 } }));
    expect(r.points[0]).toEqual(expect.objectContaining({ beyondProbeReach: true, positionM: expect.closeTo(0.00285, 12), readPositionM: expect.closeTo(0.004, 12) }));
    expect(r.points[1]?.beyondProbeReach).toBe(false);
    expect(r.warnings.join(" ")).toMatch(/closer to a wall than the 8 mm probe head can reach/);
  });
});

describe("air inputs", () => {
  it("a barometer that disagrees with the altitude by over 4 kPa is warned about: 101 325 Pa at 1500 m (standard 84 556 Pa) makes pitot flows 8.6 % low", () => {
    // Standard atmosphere at 1500 m, ASHRAE Fundamentals ch. 1 eq. 3: 84 556 Pa; √(84 556/101 325) − 1 = −8.64 % (derived).
    const r = reduceTraverse(base([Array(6).fill(50)], { air: { ...AIR, barometricPa: 101_325, altitudeM: 1500 } }));
    expect(r.air.barometricPa).toBe(101_325);
    expect(r.warnings.join(" ")).toMatch(/sea-level-corrected.*8\.6 % too low/);
    const near = reduceTraverse(base([Array(6).fill(50)], { air: { ...AIR, barometricPa: 86_000, altitudeM: 1500 } }));
    expect(near.warnings.join(" ")).not.toMatch(/sea-level-corrected/);
  });

  it("a missing static pressure is assumed 0 Pa, said so, and widens the density uncertainty", () => {
    const { staticPa: _s, ...noStatic } = AIR;
    void _s;
    const measured = reduceTraverse(base([Array(6).fill(50)]));
    const assumed = reduceTraverse(base([Array(6).fill(50)], { air: noStatic }));
    expect(assumed.air.staticAssumed).toBe(true);
    expect(measured.air.staticAssumed).toBe(false);
    expect(assumed.densityKgM3).toBe(measured.densityKgM3);
    expect(assumed.warnings.join(" ")).toMatch(/static pressure was not given: 0 Pa \(ambient\) was assumed/);
    expect(assumed.uncertainty.terms.density).toBeGreaterThan(2 * measured.uncertainty.terms.density);
  });
});

describe("anemometer readings", () => {
  it("standard velocities: ṁ = ρ_std·A·mean(V_std) whatever the plane density (thermal anemometers sense mass flux)", () => {
    const hot: AirConditions = { dryBulbC: 45, barometricPa: 90_000, staticPa: -300, relativeHumidityPct: 20 };
    const r = reduceTraverse(base([[4, 5, 6, 6, 5, 4]], { readingsKind: "velocity_standard", air: hot }));
    expect(rel(r.massFlowKgS, 1.204 * r.areaM2 * 5)).toBeLessThan(1e-12);
    expect(r.meanVelocityMS).toBeGreaterThan(5); // hot, thin air: actual velocity above standard
  });

  it("standard velocities use the instrument's own reference density when given (here 1.2 kg/m³ against the project's 1.204)", () => {
    const r = reduceTraverse(base([[4, 5, 6, 6, 5, 4]], { readingsKind: "velocity_standard", instrumentStandardDensityKgM3: 1.2 }));
    expect(rel(r.massFlowKgS, 1.2 * r.areaM2 * 5)).toBeLessThan(1e-12);
    expect(r.standardFlowM3S).toBeCloseTo((1.2 * r.areaM2 * 5) / 1.204, 12);
    expect(r.instrumentStandardDensityKgM3).toBe(1.2);
  });

  it("low anemometer velocities are not judged by the pitot gauge's 5 Pa criterion", () => {
    // 2 m/s is about 2.4 Pa in standard air: a pitot reading that low would be flagged; an anemometer reading is not.
    const r = reduceTraverse(base([[1.9, 2, 2.1, 2.1, 2, 1.9]], { readingsKind: "velocity_actual" }));
    expect(r.quality.lowPressureCount).toBe(0);
    expect(r.quality.verdict).toBe("good");
    expect(r.warnings.join(" ")).not.toMatch(/under 5 Pa/);
  });

  it("actual velocities are used as read", () => {
    const r = reduceTraverse(base([[4, 5, 6, 6, 5, 4]], { readingsKind: "velocity_actual" }));
    expect(r.meanVelocityMS).toBeCloseTo(5, 12);
    expect(r.flowM3S).toBeCloseTo(5 * r.areaM2, 12);
  });
});

describe("uncertainty", () => {
  it("is finite and smaller on a well-read plane than with a coarse gauge on low pressures", () => {
    const good = reduceTraverse(base([Array(8).fill(80), Array(8).fill(82)]));
    const poor = reduceTraverse(base([Array(8).fill(4), Array(8).fill(5)], { instrument: { pressureFloorPa: 2 } }));
    expect(Number.isFinite(good.uncertainty.expanded)).toBe(true);
    expect(good.uncertainty.expanded).toBeLessThan(0.03);
    expect(poor.uncertainty.expanded).toBeGreaterThan(0.15);
    expect(poor.warnings.join(" ")).toMatch(/uncertainty.*\(k = 2, about 95 %\)/);
  });

  it("is expanded with k = 2 for actual, standard and mass flow, the top-level figures being the standard flow's", () => {
    const r = reduceTraverse(base([Array(8).fill(80), Array(8).fill(82)]));
    const u = r.uncertainty;
    expect(u.coverageFactor).toBe(2);
    for (const f of [u, u.actual, u.standard, u.mass]) expect(f.expanded).toBeCloseTo(2 * f.combined, 15);
    expect(u.expanded).toBe(u.standard.expanded);
    expect(u.terms).toEqual(u.standard.terms);
  });

  it("takes density into each flow by its exponent: pitot ½ for all; actual velocities none for actual flow; standard velocities none for standard or mass flow", () => {
    const pitot = reduceTraverse(base([Array(6).fill(50)])).uncertainty;
    expect(pitot.actual.terms.density).toBeGreaterThan(0);
    expect(pitot.standard.terms.density).toBeCloseTo(pitot.actual.terms.density, 15);
    const actual = reduceTraverse(base([[4, 5, 6, 6, 5, 4]], { readingsKind: "velocity_actual" })).uncertainty;
    expect(actual.actual.terms.density).toBe(0);
    expect(actual.standard.terms.density).toBeCloseTo(2 * pitot.standard.terms.density, 12);
    const standard = reduceTraverse(base([[4, 5, 6, 6, 5, 4]], { readingsKind: "velocity_standard" })).uncertainty;
    expect(standard.standard.terms.density).toBe(0);
    expect(standard.mass.terms.density).toBe(0);
    expect(standard.actual.terms.density).toBeGreaterThan(0);
  });

  it("grows with an uneven plane and a short straight run: a poor plane 1 D from a fitting against a developed plane 10 D downstream", () => {
    // 1/7-law plane on the ISO 5802 8-point positions: velocities follow the developed shape, no sampling term.
    const ys = [0.021, 0.117, 0.184, 0.345, 0.655, 0.816, 0.883, 0.979];
    const developed = ys.map((y) => pvFromVelocity(12 * (1 - Math.abs(1 - 2 * y)) ** (1 / 7)));
    const even = reduceTraverse(base([developed, developed], { straightUpstreamM: 6, straightDownstreamM: 1.8 }));
    expect(even.quality.verdict).toBe("good");
    expect(even.uncertainty.terms.sampling).toBeLessThan(1e-4);
    // Skewed plane, flow thrown to one side, 0.6 m (1 D) after a fitting.
    const skew = [0.3, 0.5, 0.8, 1.0, 1.3, 1.6, 1.8, 1.9].map((k) => pvFromVelocity(8 * k));
    const poor = reduceTraverse(base([skew, [...skew].reverse()], { straightUpstreamM: 0.6, straightDownstreamM: 1.8 }));
    expect(poor.quality.verdict).toBe("poor");
    expect(poor.uncertainty.sampling.factor).toBe(1.5);
    expect(poor.uncertainty.expanded).toBeGreaterThan(0.1); // field traverses are typically good to 5–10 % (from memory); a poor plane worse
    expect(poor.uncertainty.expanded).toBeGreaterThan(5 * even.uncertainty.expanded);
    // Sampling: the spread about the better shape (here flat, CV of the velocities) / √16, × 1.5 for under 2 D upstream (method ours).
    const v = poor.points.map((p) => p.velocityMS ?? 0);
    const mean = v.reduce((a, b) => a + b, 0) / v.length;
    const cv = Math.sqrt(v.reduce((a, b) => a + (b - mean) ** 2, 0) / (v.length - 1)) / mean;
    expect(poor.uncertainty.terms.sampling).toBeCloseTo((1.5 * cv) / 4, 12);
  });
});

describe("uncertainty of a traverse", () => {
  it("keeps the repeatability of point readings apart from the profile's spread (GUM: only the scatter of repeated readings is the random term)", () => {
    const pv = pvFromVelocity(10);
    const uniform = reduceTraverse(base([Array(8).fill(pv), Array(8).fill(pv)]));
    // A skewed but steady plane at the same level: ±30 % velocity across the duct.
    const skew = [0.7, 0.8, 0.9, 1.0, 1.0, 1.1, 1.2, 1.3].map((k) => pvFromVelocity(10 * k));
    const skewed = reduceTraverse(base([skew, skew]));
    expect(skewed.uncertainty.terms.random).toBe(uniform.uncertainty.terms.random);
    // Default 2 % repeatability (one standard deviation) over 16 points: 0.02/√16 = 0.5 %.
    expect(uniform.uncertainty.terms.random).toBeCloseTo(0.005, 12);
    // The spread shows in the sampling term instead.
    expect(uniform.uncertainty.terms.sampling).toBe(0);
    expect(skewed.uncertainty.terms.sampling).toBeGreaterThan(0.02);
  });
});
