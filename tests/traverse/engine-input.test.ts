import { describe, expect, it } from "vitest";
import { runCalcCommand } from "@/lib/airflow/commands";
import { engineResultFor, gridOfRows, reduceTraverseSource, traverseCalcInput, type TraverseEngineSource } from "@/lib/traverse/engine-input";

const source: TraverseEngineSource = {
  duct: { shape: "rectangular", diameterMm: null, widthMm: 800, heightMm: 400 },
  straightUpstreamMm: 4100,
  straightDownstreamMm: 1200,
  altitudeM: 210,
  standardDensityKgM3: 1.204,
  method: "log-linear",
  lines: 6,
  pointsPerLine: 5,
  portOffsetMm: 25,
  readingsKind: "velocity_pressure",
  probeCoefficient: 1,
  probeHeadDiameterMm: 8,
  instrumentAccuracy: { pressureAccuracyPct: 1, pressureFloorPa: 1, dimensionAccuracyM: 0.003, temperatureAccuracyC: 0.3 },
  instrumentStandardDensityKgM3: null,
  air: { dryBulbC: 15.4, relativeHumidityPct: 47, wetBulbC: null, barometricPa: 98_790, staticPa: 165 },
};
/** The demo's S1.2 velocity pressures (Pa), an invented scenario. */
const grid = [
  [5.4, 7.5, 9.5, 7.7, 5.6],
  [7.4, 11.5, 14.0, 11.3, 8.0],
  [9.0, 14.6, 16.1, 12.9, 9.7],
  [9.5, 13.5, 16.1, 14.6, 9.0],
  [8.0, 11.3, 14.0, 10.8, 7.8],
  [5.4, 7.5, 9.5, 7.7, 5.6],
];

describe("one mapping from a stored traverse to the engine", () => {
  it("builds the calc command's input: accuracies in its units, the site altitude always, a measured barometer and an unmeasured static as given", () => {
    const input = traverseCalcInput({ ...source, air: { ...source.air, barometricPa: null, staticPa: null } }, grid) as Record<string, Record<string, unknown>>;
    expect(input.instrument).toEqual({ pressure_accuracy_pct: 1, pressure_floor_pa: 1, dimension_accuracy_mm: 3, temperature_accuracy_c: 0.3 });
    expect(input.air).toEqual({ dry_bulb_c: 15.4, altitude_m: 210, static_pa: null, relative_humidity_pct: 47 });
    expect(input.probe).toEqual({ coefficient: 1, head_diameter_mm: 8 });
    expect(input.duct).toEqual({ shape: "rectangular", width_mm: 800, height_mm: 400 });
    const measured = traverseCalcInput(source, grid) as Record<string, Record<string, unknown>>;
    expect(measured.air).toMatchObject({ barometric_pa: 98_790, altitude_m: 210, static_pa: 165 });
  });

  it("gives the screens' engine result and the calc command's output from the same input", () => {
    const screen = engineResultFor(source, grid);
    const calc = runCalcCommand("traverse", traverseCalcInput(source, grid));
    const api = reduceTraverseSource(source, grid);
    if (!screen.ok || !calc.ok || !api.ok) throw new Error("expected a result");
    const out = calc.value as { standard_flow_m3_s: number; mass_flow_kg_s: number; density_kg_m3: number };
    expect(screen.result.standardFlowM3S).toBe(out.standard_flow_m3_s);
    expect(screen.result.massFlowKgS).toBe(out.mass_flow_kg_s);
    expect(api.output).toEqual(calc.value);
    // Continuity of definitions: ṁ = ρ·Q and Q_std = ṁ/ρ_std (ASHRAE Fundamentals, standard air flow).
    expect(out.mass_flow_kg_s / out.density_kg_m3).toBeCloseTo(screen.result.flowM3S, 12);
    expect(out.standard_flow_m3_s).toBeCloseTo(out.mass_flow_kg_s / 1.204, 12);
  });

  it("reads stored rows (1-based) as the API's grid (0-based) with unreadable points apart, and says what is missing", () => {
    const { readings, unreadable } = gridOfRows(2, 3, [
      { line: 1, point: 1, value: 10, unreadable: false },
      { line: 2, point: 3, value: null, unreadable: true },
      { line: 2, point: 1, value: 12, unreadable: false },
    ]);
    expect(readings).toEqual([
      [10, null, null],
      [12, null, null],
    ]);
    expect(unreadable).toEqual([[1, 2]]);
    expect(reduceTraverseSource({ ...source, air: { ...source.air, dryBulbC: null } }, grid)).toMatchObject({ ok: false, message: "Dry-bulb temperature not recorded yet." });
    expect(reduceTraverseSource(source, grid.map((r) => r.map(() => null)))).toMatchObject({ ok: false, message: "No readings yet." });
  });
});
