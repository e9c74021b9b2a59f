import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { runCalcCommand } from "@/lib/airflow/commands";
import { reduceTraverse, type TraverseInput } from "@/lib/airflow/traverse";

const KAPPA = 1.4;
const AIR = { dryBulbC: 20, barometricPa: 101_325, staticPa: 0, relativeHumidityPct: 50 };

const pvReading = fc.double({ min: 1, max: 1_000, noNaN: true });
const rectGrid = fc.tuple(fc.constantFrom(5, 6, 7), fc.constantFrom(5, 6, 7)).chain(([lines, points]) => fc.array(fc.array(pvReading, { minLength: points, maxLength: points }), { minLength: lines, maxLength: lines }));
const roundGrid = fc.integer({ min: 1, max: 4 }).chain((lines) => fc.array(fc.array(pvReading, { minLength: 8, maxLength: 8 }), { minLength: lines, maxLength: lines }));

describe("scaling", () => {
  it("scaling every velocity pressure by k scales every velocity by √k, within the compressibility term (k−1)·Pv/(4κp)", () => {
    // V ≈ √(2Pv/ρ)·(1 − Pv/(4κp)) (isentropic pitot series, airflow-methods.md §2), so the ratio departs from √k by about that.
    fc.assert(
      fc.property(roundGrid, fc.double({ min: 0.2, max: 4, noNaN: true }), (readings, k) => {
        const input: TraverseInput = { duct: { shape: "round", diameterM: 0.6 }, method: "log-linear", air: AIR, readings };
        const a = reduceTraverse(input);
        const b = reduceTraverse({ ...input, readings: readings.map((row) => row.map((pv) => pv * k)) });
        const p = a.air.absolutePressurePa;
        a.points.forEach((pa, i) => {
          const pb = b.points[i];
          const pv = pa.velocityPressurePa ?? 0;
          const bound = (Math.abs(k - 1) * pv) / (4 * KAPPA * p) * 1.05 + 1e-12;
          expect(Math.abs((pb?.velocityMS ?? 0) / (Math.sqrt(k) * (pa.velocityMS ?? 0)) - 1)).toBeLessThanOrEqual(bound);
        });
      }),
      { numRuns: 60 },
    );
  });
});

describe("order of lines", () => {
  it("does not change the mean velocity of a complete traverse (round diameters or rectangular lines)", () => {
    fc.assert(
      fc.property(
        fc
          .oneof(roundGrid.map((g) => ["round", g] as const), rectGrid.map((g) => ["rectangular", g] as const))
          .chain(([shape, g]) => fc.tuple(fc.constant(shape), fc.constant(g), fc.shuffledSubarray(g.map((_, i) => i), { minLength: g.length, maxLength: g.length }))),
        ([shape, readings, order]) => {
          const duct = shape === "round" ? ({ shape, diameterM: 0.6 } as const) : ({ shape, widthM: 1.2, heightM: 0.8 } as const);
          const shuffled = order.map((i) => readings[i] ?? []);
          const a = reduceTraverse({ duct, method: "log-linear", air: AIR, readings });
          const b = reduceTraverse({ duct, method: "log-linear", air: AIR, readings: shuffled });
          expect(b.meanVelocityMS).toBeCloseTo(a.meanVelocityMS, 10);
          expect(b.flowM3S).toBeCloseTo(a.flowM3S, 10);
        },
      ),
      { numRuns: 60 },
    );
  });
});

/** Every number in a JSON-like value is finite (null allowed, NaN never). */
function noNaN(value: unknown): boolean {
  if (typeof value === "number") return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(noNaN);
  if (value && typeof value === "object") return Object.values(value).every(noNaN);
  return true;
}

describe("no NaN for any valid input", () => {
  // Every range the contract allows: dry-bulb −40…120 °C, RH 0…100 %, barometric 50–110 kPa, altitude −500…5 000 m,
  // static ±10 kPa, Pv −500…5 000 Pa, coefficient 0.5…1.2, dimensions 50…10 000 mm; missing points as null.
  const air = fc.record({
    dry_bulb_c: fc.double({ min: -40, max: 120, noNaN: true }),
    pressure: fc.oneof(fc.record({ barometric_pa: fc.double({ min: 50_000, max: 110_000, noNaN: true }) }), fc.record({ altitude_m: fc.double({ min: -500, max: 5_000, noNaN: true }) })),
    static_pa: fc.double({ min: -10_000, max: 10_000, noNaN: true }),
    humidity: fc.oneof(fc.record({ relative_humidity_pct: fc.double({ min: 0, max: 100, noNaN: true }) }), fc.record({ wet_bulb_depression: fc.double({ min: 0, max: 40, noNaN: true }) })),
  });
  const reading = fc.oneof({ weight: 8, arbitrary: fc.double({ min: -500, max: 5_000, noNaN: true }) }, { weight: 1, arbitrary: fc.constant(null) });
  const duct = fc.oneof(
    fc.record({ shape: fc.constant("round"), diameter_mm: fc.double({ min: 50, max: 10_000, noNaN: true }) }),
    fc.record({ shape: fc.constant("rectangular"), width_mm: fc.double({ min: 50, max: 10_000, noNaN: true }), height_mm: fc.double({ min: 50, max: 10_000, noNaN: true }) }),
  );

  it("traverse: either a result with only finite numbers (or null) or a field error", () => {
    let computed = 0;
    fc.assert(
      fc.property(duct, fc.constantFrom("equal-area", "log-linear"), air, fc.double({ min: 0.5, max: 1.2, noNaN: true }), fc.array(fc.array(reading, { minLength: 6, maxLength: 6 }), { minLength: 5, maxLength: 6 }), (d, method, a, coefficient, readings) => {
        const { pressure, humidity, ...rest } = a;
        const hum = "wet_bulb_depression" in humidity ? { wet_bulb_c: Math.max(-40, a.dry_bulb_c - humidity.wet_bulb_depression) } : humidity;
        const rows = readings.every((row) => row.every((v) => v === null)) ? [[10, ...readings[0]!.slice(1)], ...readings.slice(1)] : readings;
        const result = runCalcCommand("traverse", { duct: d, method, air: { ...rest, ...pressure, ...hum }, probe: { coefficient }, readings: rows });
        if (result.ok) {
          computed++;
          expect(noNaN(result.value)).toBe(true);
        } else expect(Object.keys(result.error.fields ?? {}).length).toBeGreaterThan(0);
      }),
      // A fixed seed keeps the draw, and so the count below, the same on every run.
      { numRuns: 150, seed: 20_261_202 },
    );
    // Only impossible air (vapour pressure above total pressure) or an implausible grid may refuse; many random inputs must compute.
    expect(computed).toBeGreaterThan(60);
  });

  it("layout: always finite coordinates", () => {
    fc.assert(
      fc.property(duct, fc.constantFrom("equal-area", "log-linear"), fc.option(fc.double({ min: 0, max: 100_000, noNaN: true }), { nil: undefined }), (d, method, upstream) => {
        const result = runCalcCommand("layout", { duct: d, method, ...(upstream === undefined ? {} : { straight_upstream_mm: upstream }) });
        expect(result.ok).toBe(true);
        if (result.ok) expect(noNaN(result.value)).toBe(true);
      }),
      { numRuns: 150 },
    );
  });
});
