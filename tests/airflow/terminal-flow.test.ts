import fc from "fast-check";
import psychrolib from "psychrolib";
import { describe, expect, it } from "vitest";
import {
  actualFromStandardM3S,
  correctedFlowFactor,
  flowPlausibility,
  hoodFlow,
  outletAir,
  outOfRange,
  standardFromActualM3S,
  TerminalFlowError,
  velocityAreaFlow,
} from "@/lib/airflow/terminal-flow";
import { convert } from "@/lib/units";

psychrolib.SetUnitSystem(psychrolib.SI);

const rel = (actual: number, expected: number) => Math.abs(actual / expected - 1);

// 1 ft = 0.3048 m exactly (NIST SP 811 B.8), so 1 ft² = 0.09290304 m².
const M2_PER_FT2 = 0.3048 ** 2;

describe("outletAir: the density of the air at an outlet, through the engine's psychrometrics", () => {
  it("equals psychrolib's moist-air density at the standard atmosphere of the site's altitude and room pressure", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -10, max: 45, noNaN: true }),
        fc.double({ min: 0, max: 100, noNaN: true }),
        fc.double({ min: -100, max: 3000, noNaN: true }),
        (t, rh, altitude) => {
          const air = outletAir({ dryBulbC: t, relativeHumidityPct: rh, altitudeM: altitude });
          // psychrolib (ASHRAE Handbook Fundamentals ch. 1 equations): standard atmosphere, W from RH, density of moist air.
          const p = psychrolib.GetStandardAtmPressure(altitude);
          const w = psychrolib.GetHumRatioFromRelHum(t, rh / 100, p);
          expect(rel(air.barometricPa, p)).toBeLessThan(1e-9);
          expect(rel(air.densityKgM3, psychrolib.GetMoistAirDensity(t, w, p))).toBeLessThan(1e-6);
          expect(air.humidityAssumed).toBe(false);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("assumes 50 % RH when humidity was not measured, which at 20 °C is within 0.5 % of dry or saturated air (psychrolib)", () => {
    const assumed = outletAir({ dryBulbC: 20, altitudeM: 210 });
    expect(assumed.humidityAssumed).toBe(true);
    expect(assumed.relativeHumidityPct).toBe(50);
    const p = psychrolib.GetStandardAtmPressure(210);
    for (const rh of [0, 1]) {
      const other = psychrolib.GetMoistAirDensity(20, psychrolib.GetHumRatioFromRelHum(20, rh, p), p);
      expect(rel(assumed.densityKgM3, other)).toBeLessThan(0.005);
    }
  });

  it("uses a barometer's reading over the altitude's standard atmosphere, and warns when they are far apart", () => {
    const measured = outletAir({ dryBulbC: 21, relativeHumidityPct: 40, altitudeM: 0, barometricPa: 95_000 });
    expect(measured.barometricSource).toBe("measured");
    expect(measured.barometricPa).toBe(95_000);
    expect(measured.warnings.join(" ")).toContain("sea-level-corrected");
  });
});

describe("referring a volume flow to standard air conserves mass flow (continuity: ρ·Q = ρ_std·Q_std)", () => {
  it("holds for any flow and densities, both ways", () => {
    fc.assert(
      fc.property(fc.double({ min: -5, max: 5, noNaN: true }), fc.double({ min: 0.6, max: 1.5, noNaN: true }), fc.double({ min: 1.1, max: 1.3, noNaN: true }), (q, rho, std) => {
        const qs = standardFromActualM3S(q, rho, std);
        expect(qs * std).toBeCloseTo(q * rho, 12);
        expect(actualFromStandardM3S(qs, rho, std)).toBeCloseTo(q, 12);
      }),
    );
  });

  it("refuses a density that is not positive", () => {
    expect(() => standardFromActualM3S(1, 0, 1.204)).toThrow(TerminalFlowError);
  });
});

describe("hoodFlow", () => {
  it("refers a reading the hood did not density-correct to standard air: Q_std = R·k·ρ/ρ_std (closed form)", () => {
    const r = hoodFlow({ readingM3S: 0.3, correctionFactor: 1.05, densityCorrected: false, densityKgM3: 1.15, standardDensityKgM3: 1.204 });
    expect(r.correctedReadingM3S).toBeCloseTo(0.315, 12);
    expect(r.flowM3S).toBeCloseTo(0.315, 12);
    expect(r.standardFlowM3S).toBeCloseTo((0.315 * 1.15) / 1.204, 12);
    expect(r.densityRatio).toBeCloseTo(1.15 / 1.204, 12);
  });

  it("reads 466.7 scfm from 500 cfm of air at 0.0700 lb/ft³ with US standard air at 0.075 lb/ft³ (density ratio, closed form)", () => {
    // 0.075 lb/ft³: US standard air (common practice); lb/ft³ → kg/m³ and cfm → m³/s by NIST SP 811 exact factors.
    const rho = convert(0.07, "lb/ft3", "kg/m3");
    const std = convert(0.075, "lb/ft3", "kg/m3");
    const r = hoodFlow({ readingM3S: convert(500, "cfm", "m3/s"), correctionFactor: 1, densityCorrected: false, densityKgM3: rho, standardDensityKgM3: std });
    expect(convert(r.standardFlowM3S, "m3/s", "cfm")).toBeCloseTo((500 * 0.07) / 0.075, 9);
  });

  it("takes a density-corrected hood's figure as standard airflow, and gives the actual airflow at the outlet's density", () => {
    const r = hoodFlow({ readingM3S: 0.25, correctionFactor: 0.97, densityCorrected: true, densityKgM3: 1.1, standardDensityKgM3: 1.204 });
    expect(r.standardFlowM3S).toBeCloseTo(0.2425, 12);
    expect(r.flowM3S).toBeCloseTo((0.2425 * 1.204) / 1.1, 12);
    expect(r.densityRatio).toBeNull();
  });

  it("names the field of an unusable input", () => {
    expect(() => hoodFlow({ readingM3S: Number.NaN, correctionFactor: 0, densityCorrected: true, densityKgM3: 1.2, standardDensityKgM3: 1.204 })).toThrow(
      expect.objectContaining({ fields: expect.objectContaining({ hoodFlowM3S: expect.any(String), hoodCorrectionFactor: expect.any(String) }) }),
    );
  });
});

describe("velocityAreaFlow", () => {
  it("gives 500 cfm from an average of 500 fpm over an Ak of 1 ft² (definition of the units, NIST SP 811 exact foot)", () => {
    const r = velocityAreaFlow({
      velocitiesMS: [450, 520, 530].map((v) => convert(v, "fpm", "m/s")),
      basis: "standard",
      effectiveAreaM2: M2_PER_FT2,
      densityKgM3: 1.18,
      standardDensityKgM3: 1.204,
    });
    expect(convert(r.meanVelocityMS, "m/s", "fpm")).toBeCloseTo(500, 9);
    expect(convert(r.standardFlowM3S, "m3/s", "cfm")).toBeCloseTo(500, 9);
  });

  it("averages the velocities themselves, not their squares (velocity pressures): 2 and 4 m/s average 3 m/s", () => {
    const r = velocityAreaFlow({ velocitiesMS: [2, 4], basis: "actual", effectiveAreaM2: 0.1, densityKgM3: 1.204, standardDensityKgM3: 1.204 });
    expect(r.meanVelocityMS).toBe(3);
    expect(r.flowM3S).toBeCloseTo(0.3, 12);
    // Averaging pressures first would give √((4 + 16)/2) = 3.162 m/s (airflow-methods §2, derived).
    expect(r.meanVelocityMS).not.toBeCloseTo(Math.sqrt(10), 2);
  });

  it("refers actual velocities to standard air with the outlet's density, and standard ones back to actual", () => {
    const actual = velocityAreaFlow({ velocitiesMS: [2.5], basis: "actual", effectiveAreaM2: 0.08, densityKgM3: 1.1, standardDensityKgM3: 1.2 });
    expect(actual.flowM3S).toBeCloseTo(0.2, 12);
    expect(actual.standardFlowM3S).toBeCloseTo((0.2 * 1.1) / 1.2, 12);
    const standard = velocityAreaFlow({ velocitiesMS: [2.5], basis: "standard", effectiveAreaM2: 0.08, densityKgM3: 1.1, standardDensityKgM3: 1.2 });
    expect(standard.standardFlowM3S).toBeCloseTo(0.2, 12);
    expect(standard.flowM3S).toBeCloseTo((0.2 * 1.2) / 1.1, 12);
  });

  it("refuses no readings, too many, and an area that is not positive, naming each", () => {
    const base = { basis: "actual" as const, densityKgM3: 1.2, standardDensityKgM3: 1.204 };
    expect(() => velocityAreaFlow({ ...base, velocitiesMS: [], effectiveAreaM2: 0 })).toThrow(
      expect.objectContaining({ fields: expect.objectContaining({ velocitiesMS: expect.any(String), effectiveAreaM2: expect.any(String) }) }),
    );
    expect(() => velocityAreaFlow({ ...base, velocitiesMS: Array(61).fill(1), effectiveAreaM2: 0.1 })).toThrow(/velocity readings/);
  });
});

describe("correctedFlowFactor: new factor = old factor × (measured/displayed)²", () => {
  it("recovers the true factor of a controller whose display goes as √(factor × sensed velocity pressure) (closed-form sensor model)", () => {
    // A flow cross in the inlet: Q = A·√(2·Δp_v/ρ); the controller multiplies its sensed Δp by its factor F.
    fc.assert(
      fc.property(
        fc.double({ min: 0.3, max: 3, noNaN: true }),
        fc.double({ min: 0.3, max: 3, noNaN: true }),
        fc.double({ min: 5, max: 500, noNaN: true }),
        fc.double({ min: 0.01, max: 0.3, noNaN: true }),
        (configured, truth, sensedPa, areaM2) => {
          const flowFor = (factor: number) => areaM2 * Math.sqrt((2 * factor * sensedPa) / 1.204);
          const r = correctedFlowFactor({ measuredM3S: flowFor(truth), displayedM3S: flowFor(configured), flowFactor: configured });
          expect(r.suggestedFlowFactor!).toBeCloseTo(truth, 9);
          // and the corrected display reads what was measured
          expect(flowFor(r.suggestedFlowFactor!)).toBeCloseTo(flowFor(truth), 9);
        },
      ),
    );
  });

  it("gives 0.87 × 0.9² = 0.7047 when a box measures 90 % of what its controller shows", () => {
    const r = correctedFlowFactor({ measuredM3S: 0.297, displayedM3S: 0.33, flowFactor: 0.87 });
    expect(r.ratio).toBeCloseTo(0.9, 12);
    expect(r.suggestedFlowFactor).toBeCloseTo(0.7047, 12);
  });

  it("gives no factor without a configured one, and no ratio when the display reads zero", () => {
    expect(correctedFlowFactor({ measuredM3S: 0.3, displayedM3S: 0.33, flowFactor: null })).toEqual({ ratio: 0.3 / 0.33, suggestedFlowFactor: null });
    expect(correctedFlowFactor({ measuredM3S: 0.3, displayedM3S: 0, flowFactor: 1 })).toEqual({ ratio: null, suggestedFlowFactor: null });
  });
});

describe("flowPlausibility (our limits: 3 × design, a tenth of design)", () => {
  it("flags negative airflow, above 3 × design and below 10 % of design, and nothing in between", () => {
    expect(flowPlausibility(-0.01, 0.3)).toEqual([{ kind: "negative", valueM3S: -0.01 }]);
    expect(flowPlausibility(0.91, 0.3)[0]).toMatchObject({ kind: "above-design" });
    expect(flowPlausibility(0.9, 0.3)).toEqual([]);
    expect(flowPlausibility(0.03, 0.3)).toEqual([]);
    expect(flowPlausibility(0.0299, 0.3)[0]).toMatchObject({ kind: "below-design" });
    expect(flowPlausibility(0.5, null)).toEqual([]);
    expect(flowPlausibility(0.5, 0)).toEqual([]);
  });

  it("finds readings outside an instrument's range, either bound optional", () => {
    expect(outOfRange([0.2, 31, 15, -1], { min: 0.3, max: 30 })).toEqual([
      { index: 0, value: 0.2, side: "below" },
      { index: 1, value: 31, side: "above" },
      { index: 3, value: -1, side: "below" },
    ]);
    expect(outOfRange([100], { min: null, max: null })).toEqual([]);
  });
});
