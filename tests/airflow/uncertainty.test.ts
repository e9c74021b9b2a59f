import psychrolib from "psychrolib";
import { describe, expect, it } from "vitest";
import type { AirConditions } from "@/lib/airflow/air";
import {
  COVERAGE_FACTOR,
  DEFAULT_INSTRUMENT_ACCURACY,
  areaRelativeUncertainty,
  formatExpandedUncertainty,
  samplingUncertainty,
  densityRelativeUncertainty,
  pressureReadingRelativeUncertainty,
  traverseUncertainty,
  velocityReadingRelativeUncertainty,
  type InstrumentAccuracy,
} from "@/lib/airflow/uncertainty";

psychrolib.SetUnitSystem(psychrolib.SI);

const NONE: InstrumentAccuracy = {
  pressureAccuracyPct: 0,
  pressureFloorPa: 0,
  temperatureAccuracyC: 0,
  barometricAccuracyPa: 0,
  dimensionAccuracyM: 0,
  humidityAccuracyPct: 0,
  velocityAccuracyPct: 0,
  velocityFloorMS: 0,
  repeatabilityPct: 0,
};

describe("GUM combination", () => {
  it("specification limits are rectangular, u = a/√3 (GUM §4.3.7): limits 3 mm on 600 mm, Pv ±1 %, ρ ±0.5 %, layout ±1 % combine to 1.52 %/√3", () => {
    // airflow-methods.md §5: the same figures taken as standard uncertainties give 1.52 % (derived); as limits each is a/√3.
    const duct = { shape: "round", diameterM: 0.6 } as const;
    const readingRelative = pressureReadingRelativeUncertainty(Array(16).fill(120), { pressureAccuracyPct: 1, pressureFloorPa: 0 });
    const { combined, expanded, coverageFactor, terms } = traverseUncertainty({
      duct,
      accuracy: { ...NONE, dimensionAccuracyM: 0.003 },
      readingRelative,
      densityRelative: 0.005,
      layoutError: -0.01,
      pointCount: 16,
    });
    const r3 = Math.sqrt(3);
    expect(terms.dimension).toBeCloseTo(0.01 / r3, 12); // 2·u_D/D
    expect(terms.reading).toBeCloseTo(0.005 / r3, 6); // ½·u_Pv/Pv
    expect(terms.density).toBeCloseTo(0.0025 / r3, 12); // ½·u_ρ/ρ
    expect(terms.layout).toBeCloseTo(0.01 / r3, 12);
    expect(terms.sampling).toBe(0);
    expect(combined * 100 * r3).toBeCloseTo(1.52, 2);
    // Expanded U = k·u_c with k = 2 (GUM §6.2.1; about 95 % for a near-normal result, §6.3.3).
    expect(coverageFactor).toBe(2);
    expect(COVERAGE_FACTOR).toBe(2);
    expect(expanded).toBeCloseTo(2 * combined, 15);
  });

  it("point-reading repeatability is a standard deviation and averages down as s/√N (GUM §4.2.3, standard deviation of the mean)", () => {
    const base = { duct: { shape: "round", diameterM: 0.6 } as const, accuracy: { ...NONE, repeatabilityPct: 4 }, readingRelative: 0, densityRelative: 0, layoutError: 0 };
    expect(traverseUncertainty({ ...base, pointCount: 16 }).combined).toBeCloseTo(0.01, 12);
    expect(traverseUncertainty({ ...base, pointCount: 64 }).combined).toBeCloseTo(0.005, 12);
  });

  it("the density term scales with the exponent of ρ in the flow: none for standard flow from standard velocities", () => {
    const base = { duct: { shape: "round", diameterM: 0.6 } as const, accuracy: NONE, readingRelative: 0, densityRelative: 0.01, layoutError: 0, pointCount: 16 };
    expect(traverseUncertainty({ ...base, densitySensitivity: 0 }).terms.density).toBe(0);
    expect(traverseUncertainty({ ...base, densitySensitivity: 1 }).terms.density).toBeCloseTo(0.01 / Math.sqrt(3), 12);
    expect(traverseUncertainty({ ...base, densitySensitivity: 0.5 }).terms.density).toBeCloseTo(0.005 / Math.sqrt(3), 12);
  });

  it("rectangular area: √((u/W)² + (u/H)²); 3 mm on 1200 × 600 mm is 0.559 % (derived)", () => {
    expect(areaRelativeUncertainty({ shape: "rectangular", widthM: 1.2, heightM: 0.6 }, 0.003) * 100).toBeCloseTo(0.559, 3);
  });
});

describe("sampling term (method ours: spread about the better of a flat and a developed shape, s/√N)", () => {
  it("is zero for a flat plane and for a plane that follows the developed shape exactly", () => {
    const developed = [0.6, 0.8, 0.9, 1, 1, 0.9, 0.8, 0.6];
    expect(samplingUncertainty(Array(8).fill(10), developed).relative).toBe(0);
    expect(samplingUncertainty(developed.map((d) => 12 * d), developed).relative).toBeCloseTo(0, 12);
  });

  it("is the sample coefficient of variation over √N (hand-computed: 1, 2, 3, 4 → √(5/3)/2.5/2)", () => {
    const s = samplingUncertainty([1, 2, 3, 4], [1, 1, 1, 1]);
    expect(s.unevenness).toBeCloseTo(Math.sqrt(5 / 3) / 2.5, 12);
    expect(s.relative).toBeCloseTo(Math.sqrt(5 / 3) / 2.5 / 2, 12);
  });

  it("falls as 1/√N with more points and grows by 1.25 / 1.5 on a short / unsuitable straight run (factors ours)", () => {
    const few = samplingUncertainty([5, 10, 5, 10], [1, 1, 1, 1]);
    const many = samplingUncertainty(Array.from({ length: 16 }, (_, i) => (i % 2 === 0 ? 5 : 10)), Array(16).fill(1));
    expect(few.relative / many.relative).toBeCloseTo(2 * (few.unevenness / many.unevenness), 12);
    expect(samplingUncertainty([5, 10, 5, 10], [1, 1, 1, 1], "short").relative).toBeCloseTo(1.25 * few.relative, 12);
    expect(samplingUncertainty([5, 10, 5, 10], [1, 1, 1, 1], "unsuitable").relative).toBeCloseTo(1.5 * few.relative, 12);
    expect(samplingUncertainty([5, 10, 5, 10], [1, 1, 1, 1], "good").relative).toBe(few.relative);
  });
});

describe("formatExpandedUncertainty", () => {
  it("states the coverage beside the figure", () => {
    expect(formatExpandedUncertainty(0.0612)).toBe("± 6.1 % (k = 2, about 95 %)");
    expect(formatExpandedUncertainty(0.0612, { digits: 2 })).toBe("± 6.12 % (k = 2, about 95 %)");
    expect(formatExpandedUncertainty(Number.POSITIVE_INFINITY)).toMatch(/not determinable \(k = 2/);
  });
});

describe("reading error bounds (specification limits, before the a/√3 conversion)", () => {
  it("a ±1 Pa gauge is about ±9 % on velocity at 3 m/s (airflow-methods.md §5, derived)", () => {
    const pv = 0.5 * 1.204 * 3 * 3; // 5.42 Pa in standard air
    const u = pressureReadingRelativeUncertainty([pv], { pressureAccuracyPct: 0, pressureFloorPa: 1 });
    expect(u).toBeGreaterThan(0.088);
    expect(u).toBeLessThan(0.095);
  });

  it("grows as Pv falls and stays finite at zero or negative Pv", () => {
    const acc = { pressureAccuracyPct: 1, pressureFloorPa: 1 };
    const at = (pv: number) => pressureReadingRelativeUncertainty([pv, 50], acc);
    expect(at(5)).toBeGreaterThan(at(50));
    expect(Number.isFinite(at(0))).toBe(true);
    expect(Number.isFinite(at(-20))).toBe(true);
    expect(pressureReadingRelativeUncertainty([0, -3], acc)).toBe(Number.POSITIVE_INFINITY);
  });

  it("anemometer: ±(3 % + 0.05 m/s) on 5 m/s is ±4 %", () => {
    expect(velocityReadingRelativeUncertainty([5, 5], { velocityAccuracyPct: 3, velocityFloorMS: 0.05 })).toBeCloseTo(0.04, 12);
  });
});

describe("density error bound (from the specification limits)", () => {
  const dry20: AirConditions = { dryBulbC: 20, barometricPa: 101_325, staticPa: 0, relativeHumidityPct: 0 };

  it("1 K on temperature is 0.34 % in density (airflow-methods.md §3, derived: 1/293.15)", () => {
    expect(densityRelativeUncertainty(dry20, { ...NONE, temperatureAccuracyC: 1 }) * 100).toBeCloseTo(0.341, 3);
  });

  it("250 Pa on static pressure is 0.25 % in density (airflow-methods.md §3, derived: 250/101 325)", () => {
    expect(densityRelativeUncertainty(dry20, { ...NONE, pressureFloorPa: 250 }) * 100).toBeCloseTo(0.247, 3);
  });

  it("±3 % RH at 30 °C, 50 % RH matches the density change psychrolib gives", () => {
    const p = 100_000;
    const rhoAt = (rh: number) => psychrolib.GetMoistAirDensity(30, psychrolib.GetHumRatioFromRelHum(30, rh / 100, p), p);
    const expected = Math.abs(rhoAt(53) - rhoAt(47)) / 2 / rhoAt(50);
    const got = densityRelativeUncertainty({ dryBulbC: 30, barometricPa: p, staticPa: 0, relativeHumidityPct: 50 }, { ...NONE, humidityAccuracyPct: 3 });
    expect(got).toBeCloseTo(expected, 5);
  });

  it("is larger when only the altitude is known (weather swing, from memory) than with a measured barometer", () => {
    const measured = densityRelativeUncertainty({ dryBulbC: 20, barometricPa: 95_000, staticPa: 0, relativeHumidityPct: 40 }, DEFAULT_INSTRUMENT_ACCURACY);
    const altitude = densityRelativeUncertainty({ dryBulbC: 20, altitudeM: 500, staticPa: 0, relativeHumidityPct: 40 }, DEFAULT_INSTRUMENT_ACCURACY);
    expect(altitude).toBeGreaterThan(2 * measured);
  });

  it("an unmeasured static pressure counts ±1 kPa (our choice): 1000/101 325 = 0.99 % in density (derived)", () => {
    const { staticPa: _omit, ...noStatic } = dry20;
    void _omit;
    expect(densityRelativeUncertainty(noStatic, NONE) * 100).toBeCloseTo(0.987, 3);
  });

  it("steps one-sided at the edge of the valid range (RH 100 %)", () => {
    const u = densityRelativeUncertainty({ dryBulbC: 25, barometricPa: 100_000, staticPa: 0, relativeHumidityPct: 100 }, { ...NONE, humidityAccuracyPct: 3 });
    expect(u).toBeGreaterThan(0);
    expect(Number.isFinite(u)).toBe(true);
  });
});
