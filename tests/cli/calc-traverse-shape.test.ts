/**
 * The traverse command skips the schema for plainly valid input and shapes its answer straight from the
 * engine's per-point values. These tests hold both to the straightforward way: the schema decides every
 * input the quick check does not accept (so messages stay the schema's), the quick check accepts nothing
 * the schema refuses, and the answer is, key for key and in the same order, what a plain mapping of
 * `reduceTraverse`'s records gives.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { runCalcCommand, traverseRequestFromJson } from "@/lib/airflow/commands";
import { reduceTraverse, type TraversePoint } from "@/lib/airflow/traverse";
import { formatExpandedUncertainty, type FlowUncertainty, type UncertaintyTerms } from "@/lib/airflow/uncertainty";
import { plainlyValidTraverseInput, traverseInputSchema } from "@/lib/validation/calc";

/** The answer as the command first shaped it: the schema's parse, the engine's records, one mapping each. */
function referenceAnswer(input: unknown): unknown {
  const parsed = traverseInputSchema.safeParse(input);
  if (!parsed.success) throw new Error("the reference takes valid input only");
  const d = parsed.data;
  const r = reduceTraverse(traverseRequestFromJson(d));
  const mm01 = (m: number) => Math.round(m * 1000 * 10) / 10 + 0;
  const finiteOrNull = (x: number) => (Number.isFinite(x) ? x : null);
  const pct = (x: number) => finiteOrNull(x * 100);
  const terms = (t: UncertaintyTerms) => ({ dimension: pct(t.dimension), reading: pct(t.reading), density: pct(t.density), layout: pct(t.layout), random: pct(t.random), sampling: pct(t.sampling) });
  const flow = (f: FlowUncertainty) => ({ expanded_pct: pct(f.expanded), combined_standard_pct: pct(f.combined), terms_pct: terms(f.terms) });
  const point = (p: TraversePoint) => ({
    line: p.line,
    point: p.point,
    x_mm: mm01(p.xM),
    y_mm: mm01(p.yM),
    depth_mm: mm01(p.depthM),
    position_mm: mm01(p.positionM),
    read_position_mm: mm01(p.readPositionM),
    ...(p.beyondProbeReach ? { beyond_probe_reach: true } : {}),
    reading: p.reading,
    velocity_pressure_pa: p.velocityPressurePa,
    velocity_m_s: p.velocityMS,
    ...(p.filledFrom !== null ? { filled_from: p.filledFrom, filled_velocity_m_s: p.filledVelocityMS } : {}),
  });
  const u = r.uncertainty;
  return {
    method: r.layout.method,
    rule: r.layout.rule,
    readings_kind: r.readingsKind,
    integration_rule: r.integrationRule,
    filled_points: r.filled.length,
    density_kg_m3: r.densityKgM3,
    standard_density_kg_m3: r.standardDensityKgM3,
    ...(r.instrumentStandardDensityKgM3 !== null ? { instrument_standard_density_kg_m3: r.instrumentStandardDensityKgM3 } : {}),
    mean_velocity_m_s: r.meanVelocityMS,
    area_m2: r.areaM2,
    hydraulic_diameter_mm: r.hydraulicDiameterM * 1000,
    flow_m3_s: r.flowM3S,
    standard_flow_m3_s: r.standardFlowM3S,
    mass_flow_kg_s: r.massFlowKgS,
    reynolds: r.reynolds,
    max_mach: r.maxMach,
    air: {
      dry_bulb_c: r.air.dryBulbC,
      barometric_pa: r.air.barometricPa,
      barometric_source: r.air.barometricSource,
      ...(d.air.altitude_m !== undefined ? { altitude_m: d.air.altitude_m } : {}),
      static_pa: r.air.staticPa,
      static_assumed: r.air.staticAssumed,
      absolute_pressure_pa: r.air.absolutePressurePa,
      humidity_ratio: r.air.humidityRatio,
      vapour_pressure_pa: r.air.vapourPressurePa,
      relative_humidity_pct: r.air.relativeHumidityPct,
      viscosity_pa_s: r.air.viscosityPaS,
    },
    probe: { coefficient: d.probe?.coefficient ?? 1, head_diameter_mm: mm01(r.layout.probeHeadDiameterM), reach_mm: mm01(r.layout.probeReachM) },
    points: r.points.map(point),
    quality: {
      share_above_tenth_of_max: r.quality.shareAboveTenthOfMax,
      max_over_mean: finiteOrNull(r.quality.maxOverMean),
      cv: finiteOrNull(r.quality.cv),
      zero_or_negative_count: r.quality.zeroOrNegativeCount,
      low_pressure_count: r.quality.lowPressureCount,
      verdict: r.quality.verdict,
      reasons: r.quality.reasons,
    },
    uncertainty_pct: pct(u.expanded),
    uncertainty_terms_pct: terms(u.terms),
    uncertainty: {
      expanded_pct: pct(u.expanded),
      coverage_factor: u.coverageFactor,
      coverage: "k = 2, about 95 %",
      shown: formatExpandedUncertainty(u.expanded),
      combined_standard_pct: pct(u.combined),
      terms_pct: terms(u.terms),
      actual: flow(u.actual),
      standard: flow(u.standard),
      mass: flow(u.mass),
      sampling: { unevenness: finiteOrNull(u.sampling.unevenness), straight_run_factor: u.sampling.factor, points: u.sampling.pointCount },
    },
    layout_reason: r.layout.reason,
    beyond_probe_reach_count: r.layout.beyondReachCount,
    warnings: r.warnings,
  };
}

/** Valid traverse inputs as clients send them: every optional field sometimes, gaps, all kinds and shapes. */
const validInput = fc
  .record(
    {
      round: fc.boolean(),
      method: fc.constantFrom("equal-area", "log-linear"),
      size: fc.integer({ min: 150, max: 3_000 }),
      kind: fc.option(fc.constantFrom("velocity_pressure", "velocity_actual", "velocity_standard"), { nil: undefined }),
      countsGiven: fc.boolean(),
      straight_upstream_mm: fc.option(fc.integer({ min: 0, max: 20_000 }), { nil: undefined }),
      straight_downstream_mm: fc.option(fc.integer({ min: 0, max: 5_000 }), { nil: undefined }),
      port_offset_mm: fc.option(fc.integer({ min: 0, max: 80 }), { nil: undefined }),
      probe: fc.option(fc.record({ coefficient: fc.double({ min: 0.5, max: 1.2, noNaN: true }), head_diameter_mm: fc.integer({ min: 1, max: 30 }) }, { requiredKeys: [] }), { nil: undefined }),
      standard_density_kg_m3: fc.option(fc.constantFrom(1.2, 1.204, 1.225), { nil: undefined }),
      instrument: fc.option(fc.record({ pressure_accuracy_pct: fc.double({ min: 0, max: 5, noNaN: true }), dimension_accuracy_mm: fc.integer({ min: 0, max: 10 }), standard_density_kg_m3: fc.constant(1.2) }, { requiredKeys: [] }), { nil: undefined }),
      air: fc.record({
        dry_bulb_c: fc.integer({ min: -20, max: 45 }),
        static_pa: fc.option(fc.integer({ min: -1_500, max: 1_500 }), { nil: null }),
        pressure: fc.oneof(fc.record({ barometric_pa: fc.integer({ min: 85_000, max: 103_000 }) }), fc.record({ altitude_m: fc.integer({ min: 0, max: 2_000 }) }), fc.record({ barometric_pa: fc.integer({ min: 85_000, max: 103_000 }), altitude_m: fc.integer({ min: 0, max: 2_000 }) })),
        humidity: fc.oneof(fc.record({ relative_humidity_pct: fc.integer({ min: 0, max: 100 }) }), fc.record({ wet_bulb_depression: fc.integer({ min: 0, max: 15 }) })),
      }),
      gapShare: fc.constantFrom(0, 0, 0.2, 0.6),
      beyondReach: fc.boolean(),
    },
    { requiredKeys: ["round", "method", "size", "kind", "countsGiven", "air", "gapShare", "beyondReach"] },
  )
  .chain((t) => {
    const lines = t.round ? (t.method === "log-linear" ? 2 : 3) : t.method === "log-linear" ? 5 : 4;
    const points = t.round ? (t.method === "log-linear" ? 10 : 6) : t.method === "log-linear" ? 7 : 5;
    const top = t.kind === undefined || t.kind === "velocity_pressure" ? 300 : 20;
    const value = fc.oneof({ weight: 10, arbitrary: fc.double({ min: 0.5, max: top, noNaN: true }) }, { weight: 3, arbitrary: fc.integer({ min: 0, max: top }) }, { weight: 1, arbitrary: fc.double({ min: -top / 20, max: 0, noNaN: true }) });
    const cell = fc.oneof({ weight: Math.round(10 * (1 - t.gapShare)), arbitrary: value }, { weight: Math.round(10 * t.gapShare), arbitrary: fc.constant(null) });
    return fc.tuple(fc.constant(t), fc.array(fc.array(cell, { minLength: points, maxLength: points }), { minLength: lines, maxLength: lines }));
  })
  .map(([t, readings]) => {
    if (!readings.some((row) => row.some((v) => v !== null && v > 0))) readings[0]![0] = 7;
    const { pressure, humidity, ...air } = t.air;
    const hum = "wet_bulb_depression" in humidity ? { wet_bulb_c: air.dry_bulb_c - humidity.wet_bulb_depression } : humidity;
    const input: Record<string, unknown> = {
      // A small duct with a big probe head puts the wall points beyond reach.
      duct: t.round ? { shape: "round", diameter_mm: t.beyondReach ? 150 : t.size } : { shape: "rectangular", width_mm: t.size, height_mm: t.beyondReach ? 100 : Math.round(t.size / 2) },
      method: t.method,
      air: { ...air, ...pressure, ...hum },
      readings,
    };
    if (t.countsGiven) Object.assign(input, { lines: readings.length, points_per_line: readings[0]!.length });
    for (const key of ["straight_upstream_mm", "straight_downstream_mm", "port_offset_mm", "probe", "standard_density_kg_m3", "instrument"] as const) if (t[key] !== undefined) input[key] = t[key];
    if (t.beyondReach) input.probe = { ...(t.probe ?? {}), head_diameter_mm: 30 };
    if (t.kind !== undefined) input.readings_kind = t.kind;
    return input;
  });

describe("the traverse command's answer", () => {
  it("is, key for key and in order, the plain mapping of the engine's records", () => {
    let compared = 0;
    fc.assert(
      fc.property(validInput, (input) => {
        const got = runCalcCommand("traverse", input);
        if (!got.ok) {
          // Possible air or reversed readings only, never a shape problem.
          expect(got.error.fields?.readings ?? got.error.fields?.["air.relative_humidity_pct"] ?? got.error.fields?.["air.wet_bulb_c"]).toBeDefined();
          return;
        }
        compared++;
        expect(JSON.stringify(got.value)).toBe(JSON.stringify(referenceAnswer(input)));
      }),
      { numRuns: 250, seed: 20_261_204 },
    );
    expect(compared).toBeGreaterThan(200);
  });
});

describe("the quick check of traverse input", () => {
  it("accepts what clients send, and the schema agrees and parses it to the input itself", () => {
    fc.assert(
      fc.property(validInput, (input) => {
        const parsed = traverseInputSchema.safeParse(input);
        const quick = plainlyValidTraverseInput(input);
        if (!parsed.success) return expect(quick).toBeNull();
        expect(quick).toBe(input);
        expect(parsed.data).toEqual(input);
      }),
      { numRuns: 250, seed: 20_261_205 },
    );
  });

  /**
   * One field of a valid input replaced by something else: anything at all, a number near a bound, the
   * field's own value nudged (a fraction added to a count, a wet-bulb pushed above the dry-bulb, air hot
   * enough to hold more vapour than the pressure allows), or a new key.
   */
  const replacement = fc.oneof(
    fc.record({ value: fc.oneof(fc.anything(), fc.double(), fc.integer({ min: -20_000, max: 200_000 }), fc.double({ min: -600, max: 6_000, noNaN: true }), fc.constantFrom(null, undefined, -0, Number.NaN, Infinity, "", "round", [], {})) }),
    fc.record({ nudge: fc.constantFrom(-1, -0.5, 0.5, 1, 5, 10, 30, 60, 90, 100_000) }),
  );
  const mutated = fc.tuple(validInput, fc.integer({ min: 0, max: 1_000 }), replacement).map(([input, pick, change]) => {
    const copy = JSON.parse(JSON.stringify(input)) as Record<string, unknown>;
    // Every place a value lives: top-level fields, the nested objects' fields, each reading.
    const places: [Record<string, unknown> | unknown[], string | number][] = [];
    const visit = (node: unknown) => {
      if (Array.isArray(node)) {
        node.forEach((v, i) => {
          places.push([node, i]);
          visit(v);
        });
      } else if (node && typeof node === "object") {
        for (const [k, v] of Object.entries(node)) {
          places.push([node as Record<string, unknown>, k]);
          visit(v);
        }
      }
    };
    visit(copy);
    const [container, key] = places[pick % places.length]!;
    const at = container as Record<string | number, unknown>;
    const value = "value" in change ? change.value : typeof at[key] === "number" ? (at[key] as number) + change.nudge : change.nudge;
    if (pick % 7 === 0 && !Array.isArray(container)) at[`extra_${pick}`] = value;
    else at[key] = value;
    return copy;
  });

  it("accepts nothing the schema refuses: one field changed to anything at all", () => {
    let refused = 0;
    fc.assert(
      fc.property(mutated, (input) => {
        const parsed = traverseInputSchema.safeParse(input);
        if (!parsed.success) refused++;
        if (plainlyValidTraverseInput(input) !== null) {
          expect(parsed.success).toBe(true);
          if (parsed.success) expect(parsed.data).toEqual(input);
        }
      }),
      { numRuns: 2_000, seed: 20_261_206 },
    );
    expect(refused).toBeGreaterThan(500);
  });

  it("leaves every bad input to the schema, whose messages the command returns unchanged", () => {
    const base = { duct: { shape: "rectangular", width_mm: 1200, height_mm: 800 }, method: "equal-area", air: { dry_bulb_c: 18, barometric_pa: 99_800, static_pa: 320, relative_humidity_pct: 55 } };
    const row = [40, 50, 60, 50, 40];
    const cases: [unknown, string, RegExp][] = [
      [{ ...base, readings: [row, row, row, [40, 50, 6000, 50, 40]] }, "readings.3.2", /from -500 to 5000 Pa.*got 6000/],
      [{ ...base, readings: [row, row, row, [40, 50, "x", 50, 40]] }, "readings.3.2", /must be a number.*got the text "x"/],
      [{ ...base, readings: [row, row, row, [40, 50, 60, 50]] }, "readings.3", /has 4 readings; every line needs 5/],
      [{ ...base, air: { ...base.air, relative_humidity_pct: 101 }, readings: [row, row, row, row] }, "air.relative_humidity_pct", /from 0 to 100 %; got 101/],
      [{ ...base, air: { ...base.air, static_pa: undefined }, readings: [row, row, row, row] }, "air.static_pa", /is needed/],
      [{ ...base, duct: { shape: "oval" }, readings: [row, row, row, row] }, "duct.shape", /"round" or "rectangular"; got the text "oval"/],
      [{ ...base, readings: [row, row, row, row], colour: "red" }, "colour", /not a field/],
      [{ ...base, readings: [row, row, row, row].map((r) => r.map(() => null)) }, "readings", /every reading is null/],
      [{ ...base, lines: 4.5, readings: [row, row, row, row] }, "lines", /whole number from 1 to 100; got 4.5/],
      [{ ...base, air: { dry_bulb_c: 18, barometric_pa: 99_800, static_pa: 0, wet_bulb_c: 19 }, readings: [row, row, row, row] }, "air.wet_bulb_c", /at or below the dry-bulb 18 °C; got 19/],
      // Saturated air at 100 °C holds about 101 kPa of vapour (ASHRAE Fundamentals ch. 1, from memory): more than 60 kPa can carry.
      [{ ...base, air: { dry_bulb_c: 100, barometric_pa: 60_000, static_pa: 0, relative_humidity_pct: 100 }, readings: [row, row, row, row] }, "air.relative_humidity_pct", /no such air exists/],
    ];
    for (const [input, field, message] of cases) {
      expect(plainlyValidTraverseInput(input)).toBeNull();
      const r = runCalcCommand("traverse", input);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.error.fields?.[field]).toMatch(message);
    }
  });
});
