/**
 * reduceTraverse gathers the plane checks, the reading uncertainty and the sampling sums in one pass and
 * remembers what depends only on the layout and the air. These tests hold it to the plain, separate
 * definitions in quality.ts, uncertainty.ts, integrate.ts and velocity.ts (whose values the other engine
 * tests check against published references): the one-pass reduction must give the same numbers, to the
 * last bit where the arithmetic is the same, for any grid, kind of reading, gaps and instruments.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { airState, airStateFor, type AirConditions } from "@/lib/airflow/air";
import { developedProfileGrid, planeMean, powerLawLayoutError } from "@/lib/airflow/integrate";
import { layoutFor, straightRunClass } from "@/lib/airflow/layout";
import { assessPlane } from "@/lib/airflow/quality";
import { reduceTraverse, type ReadingsKind, type TraverseInput } from "@/lib/airflow/traverse";
import {
  DEFAULT_INSTRUMENT_ACCURACY,
  densityRelativeUncertainty,
  pressureReadingRelativeUncertainty,
  samplingUncertainty,
  traverseUncertainty,
  velocityReadingRelativeUncertainty,
  type InstrumentAccuracy,
} from "@/lib/airflow/uncertainty";
import { actualVelocityFromStandardMS, velocityFromPressureMS, velocityPressureFromVelocityPa } from "@/lib/airflow/velocity";

const EXPONENTS: Record<ReadingsKind, { actual: number; standard: number; mass: number }> = {
  velocity_pressure: { actual: 0.5, standard: 0.5, mass: 0.5 },
  velocity_actual: { actual: 0, standard: 1, mass: 1 },
  velocity_standard: { actual: 1, standard: 0, mass: 0 },
};

const air = fc.record({
  dryBulbC: fc.double({ min: -10, max: 45, noNaN: true }),
  barometricPa: fc.double({ min: 80_000, max: 105_000, noNaN: true }),
  staticPa: fc.option(fc.double({ min: -2_000, max: 2_000, noNaN: true }), { nil: undefined }),
  relativeHumidityPct: fc.double({ min: 0, max: 100, noNaN: true }),
});
const instrument = fc.option(
  fc.record({ pressureAccuracyPct: fc.double({ min: 0, max: 5, noNaN: true }), pressureFloorPa: fc.double({ min: 0, max: 3, noNaN: true }), velocityAccuracyPct: fc.double({ min: 0, max: 5, noNaN: true }), repeatabilityPct: fc.double({ min: 0, max: 5, noNaN: true }) }, { requiredKeys: [] }),
  { nil: undefined },
);
/** A layout with a grid of readings of its shape: mostly forward, some reverse or zero, some not read. */
const traverse = fc
  .record({
    round: fc.boolean(),
    method: fc.constantFrom("equal-area" as const, "log-linear" as const),
    kind: fc.constantFrom<ReadingsKind>("velocity_pressure", "velocity_actual", "velocity_standard"),
    upstream: fc.option(fc.double({ min: 0.2, max: 10, noNaN: true }), { nil: undefined }),
    air,
    instrument,
    coefficient: fc.option(fc.double({ min: 0.5, max: 1.2, noNaN: true }), { nil: undefined }),
    gapShare: fc.constantFrom(0, 0, 0.1, 0.4),
  })
  .chain((t) => {
    const lines = t.round ? 2 : t.method === "log-linear" ? 5 : 4;
    const points = t.round ? (t.method === "log-linear" ? 8 : 6) : t.method === "log-linear" ? 6 : 5;
    const top = t.kind === "velocity_pressure" ? 400 : 25;
    // Whole numbers too, as gauges show them, so the thresholds (5 Pa, a tenth of the largest) are met exactly.
    const value = fc.oneof(
      { weight: 8, arbitrary: fc.double({ min: 0.5, max: top, noNaN: true }) },
      { weight: 4, arbitrary: fc.integer({ min: 0, max: top }) },
      { weight: 1, arbitrary: fc.double({ min: -top / 10, max: 0, noNaN: true }) },
    );
    const cell = t.gapShare === 0 ? value : fc.oneof({ weight: Math.round(10 * (1 - t.gapShare)), arbitrary: value }, { weight: Math.round(10 * t.gapShare), arbitrary: fc.constant(null) });
    return fc.tuple(fc.constant(t), fc.array(fc.array(cell, { minLength: points, maxLength: points }), { minLength: lines, maxLength: lines }));
  })
  .map(([t, readings]): TraverseInput => {
    if (!readings.some((row) => row.some((v) => v !== null && v > 0))) readings[0]![0] = 5;
    return {
      duct: t.round ? { shape: "round", diameterM: 0.6 } : { shape: "rectangular", widthM: 1.2, heightM: 0.8 },
      method: t.method,
      straightUpstreamM: t.upstream,
      air: t.air,
      readings,
      readingsKind: t.kind,
      instrument: t.instrument,
      probeCoefficient: t.coefficient,
    };
  });

/** Everything reduceTraverse reports, worked out again from the separate definitions, point list by point list. */
function reference(input: TraverseInput) {
  const kind = input.readingsKind ?? "velocity_pressure";
  const state = airState(input.air);
  const rho = state.densityKgM3;
  const p = state.absolutePressurePa;
  const accuracy: InstrumentAccuracy = { ...DEFAULT_INSTRUMENT_ACCURACY, ...Object.fromEntries(Object.entries(input.instrument ?? {}).filter(([, v]) => v !== undefined)) };
  const layout = layoutFor({ ...input, lines: input.readings.length, pointsPerLine: input.readings[0]!.length });
  const profile = developedProfileGrid(layout);
  const velocity = (r: number) =>
    kind === "velocity_pressure" ? velocityFromPressureMS(r, rho, p, input.probeCoefficient ?? 1) : Math.max(0, kind === "velocity_actual" ? r : actualVelocityFromStandardMS(r, rho, input.standardDensityKgM3 ?? 1.204));
  const pressure = (r: number, v: number) => (kind === "velocity_pressure" ? r : r < 0 ? -velocityPressureFromVelocityPa(-r, rho, p) : velocityPressureFromVelocityPa(v, rho, p));
  const read = input.readings.flatMap((row, k) => row.flatMap((r, i) => (r === null ? [] : [{ r, v: velocity(r), developed: profile[k]![i]! }])));
  const pvs = read.map(({ r, v }) => pressure(r, v));
  const velocities = read.map(({ v }) => v);
  const mask = input.readings.map((row) => row.map((r) => r !== null));
  const common = {
    duct: input.duct,
    accuracy,
    readingRelative: kind === "velocity_pressure" ? pressureReadingRelativeUncertainty(pvs, accuracy) : velocityReadingRelativeUncertainty(read.map(({ r }) => r), accuracy),
    densityRelative: densityRelativeUncertainty(input.air, accuracy),
    layoutError: powerLawLayoutError(layout, mask),
    pointCount: read.length,
    samplingRelative: samplingUncertainty(velocities, read.map(({ developed }) => developed), straightRunClass(input)).relative,
  };
  return {
    air: state,
    velocity,
    pressure,
    mean: planeMean(layout, input.readings.map((row) => row.map((r) => (r === null ? null : velocity(r))))).mean,
    quality: assessPlane(pvs, velocities, { readAsPressures: kind === "velocity_pressure" }),
    sampling: samplingUncertainty(velocities, read.map(({ developed }) => developed), straightRunClass(input)),
    actual: traverseUncertainty(common, EXPONENTS[kind].actual),
    standard: traverseUncertainty(common, EXPONENTS[kind].standard),
    mass: traverseUncertainty(common, EXPONENTS[kind].mass),
  };
}

describe("the one-pass reduction agrees with the separate definitions", () => {
  it("for any grid, kind of reading, gaps, straight run and instruments", () => {
    let reduced = 0;
    fc.assert(
      fc.property(traverse, (input) => {
        let r;
        try {
          r = reduceTraverse(input);
        } catch (error) {
          // Most readings reverse: refused with the reason, never half-computed.
          expect((error as Error).message).toMatch(/negative|forward flow/);
          return;
        }
        reduced++;
        const ref = reference(input);
        expect(r.air).toEqual(ref.air);
        expect(r.meanVelocityMS).toBe(ref.mean);
        expect(r.quality).toEqual(ref.quality);
        expect(r.uncertainty.sampling).toEqual(ref.sampling);
        // Root-sum-squares are not Math.hypot's exact rounding: to 1e-14 of the value.
        for (const flow of ["actual", "standard", "mass"] as const) {
          const got = r.uncertainty[flow];
          const want = ref[flow];
          expect(got.terms).toEqual(want.terms);
          expect(Math.abs(got.combined / want.combined - 1)).toBeLessThan(1e-14);
          expect(got.expanded).toBe(2 * got.combined);
        }
        r.points.forEach((point) => {
          const reading = input.readings[point.line]![point.point]!;
          expect(point.reading).toBe(reading);
          if (reading === null) return expect(point.velocityMS).toBeNull();
          const v = ref.velocity(reading);
          expect(point.velocityMS).toBe(v);
          expect(point.velocityPressurePa).toBe(ref.pressure(reading, v));
        });
      }),
      { numRuns: 300, seed: 20_261_203 },
    );
    expect(reduced).toBeGreaterThan(200);
  });
});

describe("what the reduction remembers does not leak from one traverse into another", () => {
  const grid = (scale: number) => Array.from({ length: 4 }, (_, k) => Array.from({ length: 5 }, (_, i) => scale * (20 + ((k * 5 + i) % 7))));
  const input = (airAt: AirConditions, readings: (number | null)[][], extra: Partial<TraverseInput> = {}): TraverseInput => ({
    duct: { shape: "rectangular", widthM: 1.2, heightM: 0.8 },
    method: "equal-area",
    air: airAt,
    readings,
    ...extra,
  });
  const airA: AirConditions = { dryBulbC: 18, barometricPa: 99_800, staticPa: 320, relativeHumidityPct: 55 };
  const airB: AirConditions = { dryBulbC: 31, altitudeM: 1_200, relativeHumidityPct: 20 };

  it("the same traverse gives the same result whatever was reduced in between", () => {
    const first = reduceTraverse(input(airA, grid(1)));
    reduceTraverse(input(airB, grid(2), { instrument: { pressureAccuracyPct: 3 }, straightUpstreamM: 0.5 }));
    reduceTraverse(input(airA, grid(3), { duct: { shape: "rectangular", widthM: 1.2, heightM: 0.6 } }));
    const again = reduceTraverse(input(airA, grid(1)));
    expect(again.flowM3S).toBe(first.flowM3S);
    expect(again.uncertainty).toEqual(first.uncertainty);
    expect(again.quality).toEqual(first.quality);
    expect(again.points).toEqual(first.points);
  });

  it("a remembered air state is the state airState gives, frozen, and −0 Pa static is not 0 Pa", () => {
    for (const c of [airA, airB, { ...airA, staticPa: -0 }, { ...airA, staticPa: 0 }, airA]) {
      const state = airStateFor(c);
      expect(state).toEqual(airState(c));
      expect(Object.is(state.staticPa, airState(c).staticPa)).toBe(true);
      expect(Object.isFrozen(state)).toBe(true);
    }
  });

  it("the points keep the readings as they were: reusing the grid afterwards changes nothing", () => {
    const readings = grid(1);
    const r = reduceTraverse(input(airA, readings));
    const before = r.pointValues.reading.slice();
    readings[0]![0] = 999;
    expect(r.points[0]?.reading).toBe(before[0]);
    expect(r.pointValues.reading).toEqual(before);
  });

  it("different readings with the same layout and air give different results (nothing is keyed by the layout alone)", () => {
    const a = reduceTraverse(input(airA, grid(1)));
    const b = reduceTraverse(input(airA, grid(1.5)));
    expect(b.meanVelocityMS).toBeGreaterThan(a.meanVelocityMS);
    expect(b.uncertainty.terms.reading).not.toBe(a.uncertainty.terms.reading);
  });

  it("gaps that come and go give each grid its own layout error", () => {
    const full = grid(1) as (number | null)[][];
    const gap = full.map((row) => row.slice());
    gap[1]![2] = null;
    const withGap = reduceTraverse(input(airA, full.map((row) => row.slice())));
    const a = reduceTraverse(input(airA, gap));
    const b = reduceTraverse(input(airA, full));
    const c = reduceTraverse(input(airA, gap));
    expect(c.uncertainty.terms.layout).toBe(a.uncertainty.terms.layout);
    expect(b.uncertainty.terms.layout).toBe(withGap.uncertainty.terms.layout);
    const layout = layoutFor({ duct: { shape: "rectangular", widthM: 1.2, heightM: 0.8 }, method: "equal-area", lines: 4, pointsPerLine: 5 });
    expect(a.uncertainty.terms.layout).toBe(Math.abs(powerLawLayoutError(layout, gap.map((row) => row.map((v) => v !== null)))) / Math.sqrt(3));
  });

  it("the caller's duct is not frozen by the shared layout", () => {
    const duct = { shape: "rectangular" as const, widthM: 0.9, heightM: 0.7 };
    reduceTraverse(input(airA, grid(1), { duct }));
    expect(Object.isFrozen(duct)).toBe(false);
  });
});
