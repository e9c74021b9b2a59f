import psychrolib from "psychrolib";
import { describe, expect, it } from "vitest";
import type { AirConditions } from "@/lib/airflow/air";
import {
  DEFAULT_INSTRUMENT_ACCURACY,
  areaRelativeUncertainty,
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
  it("3 mm on 600 mm, Pv ±1 %, ρ ±0.5 %, layout ±1 % → ±1.52 % (airflow-methods.md §5, derived)", () => {
    const duct = { shape: "round", diameterM: 0.6 } as const;
    const readingRelative = pressureReadingRelativeUncertainty(Array(16).fill(120), { pressureAccuracyPct: 1, pressureFloorPa: 0 });
    const { combined, terms } = traverseUncertainty({
      duct,
      accuracy: { ...NONE, dimensionAccuracyM: 0.003 },
      readingRelative,
      densityRelative: 0.005,
      layoutError: -0.01,
      pointCount: 16,
    });
    expect(terms.dimension).toBeCloseTo(0.01, 12); // 2·u_D/D
    expect(terms.reading).toBeCloseTo(0.005, 6); // ½·u_Pv/Pv
    expect(terms.density).toBeCloseTo(0.0025, 12); // ½·u_ρ/ρ
    expect(terms.layout).toBe(0.01);
    expect(combined * 100).toBeCloseTo(1.52, 2);
  });

  it("point-reading repeatability averages down as u/√N (GUM §4.2.3, standard deviation of the mean)", () => {
    const base = { duct: { shape: "round", diameterM: 0.6 } as const, accuracy: { ...NONE, repeatabilityPct: 4 }, readingRelative: 0, densityRelative: 0, layoutError: 0 };
    expect(traverseUncertainty({ ...base, pointCount: 16 }).combined).toBeCloseTo(0.01, 12);
    expect(traverseUncertainty({ ...base, pointCount: 64 }).combined).toBeCloseTo(0.005, 12);
  });

  it("rectangular area: √((u/W)² + (u/H)²); 3 mm on 1200 × 600 mm is 0.559 % (derived)", () => {
    expect(areaRelativeUncertainty({ shape: "rectangular", widthM: 1.2, heightM: 0.6 }, 0.003) * 100).toBeCloseTo(0.559, 3);
  });
});

describe("reading uncertainty", () => {
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

describe("density uncertainty", () => {
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

  it("steps one-sided at the edge of the valid range (RH 100 %)", () => {
    const u = densityRelativeUncertainty({ dryBulbC: 25, barometricPa: 100_000, staticPa: 0, relativeHumidityPct: 100 }, { ...NONE, humidityAccuracyPct: 3 });
    expect(u).toBeGreaterThan(0);
    expect(Number.isFinite(u)).toBe(true);
  });
});
