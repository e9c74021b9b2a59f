import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { runCalcCommand } from "@/lib/airflow/commands";

const ROOT = path.resolve(__dirname, "../..");
const TSX = path.join(ROOT, "node_modules/.bin/tsx");

function cli(command: string, stdin: string) {
  const r = spawnSync(TSX, ["lib/cli/calc.ts", command], { cwd: ROOT, input: stdin, encoding: "utf8", timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

const AIR = { dry_bulb_c: 22, barometric_pa: 100_500, static_pa: 250, relative_humidity_pct: 45 };
const TRAVERSE = { duct: { shape: "round", diameter_mm: 600 }, method: "log-linear", air: AIR, readings: [[30, 55, 62, 61, 54, 31], [32, 56, 63, 60, 52, 29]] };

/** The field errors of a failing command; fails the test if the command succeeded. */
function fieldsOf(command: string, input: unknown): Record<string, string> {
  const r = runCalcCommand(command, input);
  if (r.ok) throw new Error(`expected ${command} to fail`);
  expect(r.error.message.length).toBeGreaterThan(0);
  return r.error.fields ?? {};
}
const traverseWith = (patch: Record<string, unknown>) => ({ ...TRAVERSE, ...patch });
const airWith = (patch: Record<string, unknown>) => traverseWith({ air: { ...AIR, ...patch } });

describe("the CLI process (npm run -s calc -- <command>)", () => {
  it("layout: exit 0 and one JSON document on stdout", () => {
    const r = cli("layout", JSON.stringify({ duct: { shape: "rectangular", width_mm: 1200, height_mm: 600 }, method: "log-linear" }));
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    // ASHRAE log-Tchebycheff: 1200 mm side → 7 lines, 600 mm side → 5 points; first line at 0.053·1200 = 63.6 mm.
    expect(out.lines).toHaveLength(7);
    expect(out.lines[0].points).toHaveLength(5);
    expect(out.lines[0].points[0].x_mm).toBeCloseTo(63.6, 1);
    expect(out.lines[0].points[0].depth_mm).toBeCloseTo(44.4, 1); // 0.074 · 600
    expect(typeof out.reason).toBe("string");
    expect(r.stderr).toBe("");
  });

  it("traverse: exit 0 with the contract's fields", () => {
    const r = cli("traverse", JSON.stringify(TRAVERSE));
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    for (const key of ["density_kg_m3", "mean_velocity_m_s", "area_m2", "flow_m3_s", "standard_flow_m3_s", "mass_flow_kg_s", "reynolds", "points", "quality", "uncertainty_pct", "warnings"]) expect(out).toHaveProperty(key);
    expect(out.points[0]).toEqual(expect.objectContaining({ line: 0, point: 0, x_mm: expect.any(Number), y_mm: expect.any(Number), velocity_pressure_pa: 30, velocity_m_s: expect.any(Number) }));
    expect(out.quality).toEqual(expect.objectContaining({ share_above_tenth_of_max: expect.any(Number), max_over_mean: expect.any(Number), cv: expect.any(Number), verdict: expect.any(String), reasons: expect.any(Array) }));
    expect(out.area_m2).toBeCloseTo((Math.PI * 0.36) / 4, 12);
  });

  it("network: continuity by mass, imbalance = parent − sum of children", () => {
    // airflow-methods.md §4: trunk 1.50 m³/s at 1.180 kg/m³, branches 0.80 at 1.170 and 0.72 at 1.150 → 0.34 % by
    // mass, 1.33 % by naive volume (the reference quotes children − parent; the contract's sign is parent − children).
    const input = { nodes: [
      { id: "trunk", parent: null, flow_m3_s: 1.5, density_kg_m3: 1.18 },
      { id: "a", parent: "trunk", flow_m3_s: 0.8, density_kg_m3: 1.17 },
      { id: "b", parent: "trunk", flow_m3_s: 0.72, density_kg_m3: 1.15 },
    ] };
    const r = cli("network", JSON.stringify(input));
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout).junctions[0];
    expect(j.id).toBe("trunk");
    expect(j.parent_mass_flow_kg_s).toBeCloseTo(1.77, 12);
    expect(j.children_mass_flow_kg_s).toBeCloseTo(1.764, 12);
    expect(j.imbalance_pct).toBeCloseTo(0.34, 2);
    expect(j.pass).toBe(true);
  });

  it("bad fields: exit 2, nothing on stdout, the error JSON on stderr", () => {
    const r = cli("traverse", JSON.stringify(traverseWith({ duct: { shape: "round", diameter_mm: -5 } })));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    const err = JSON.parse(r.stderr);
    expect(err.error.message).toMatch(/duct\.diameter_mm/);
    expect(err.error.fields["duct.diameter_mm"]).toMatch(/-5/);
  });

  it("unparsable JSON: exit 2, nothing on stdout", () => {
    const r = cli("layout", "{ duct: round }");
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    expect(JSON.parse(r.stderr).error.message).toMatch(/not valid JSON/);
  });

  it("unknown command: exit 2 with a command field", () => {
    const r = cli("balance", "{}");
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    expect(JSON.parse(r.stderr).error.fields.command).toMatch(/layout, traverse, network/);
  });
});

describe("every bad-input class, in process", () => {
  it("missing or negative dimensions", () => {
    expect(fieldsOf("layout", { duct: { shape: "round" }, method: "equal-area" })["duct.diameter_mm"]).toMatch(/from 50 to 10000 mm; got nothing/);
    expect(fieldsOf("layout", { duct: { shape: "rectangular", width_mm: -300, height_mm: 400 }, method: "equal-area" })["duct.width_mm"]).toMatch(/got -300/);
    expect(fieldsOf("layout", { duct: { shape: "oval", diameter_mm: 300 }, method: "equal-area" })["duct.shape"]).toMatch(/"round" or "rectangular"; got the text "oval"/);
    expect(fieldsOf("layout", { method: "equal-area" })).toHaveProperty("duct");
  });

  it("wrong reading count", () => {
    expect(fieldsOf("traverse", traverseWith({ readings: [[30, 55, 62, 61, 54, 31], [32, 56, 63, 60, 52]] }))["readings.1"]).toMatch(/has 5 readings; every line needs 6/);
    expect(fieldsOf("traverse", traverseWith({ lines: 3 }))["readings"]).toMatch(/has 2 lines.*3 are needed/);
    expect(fieldsOf("traverse", traverseWith({ readings: [] }))["readings"]).toMatch(/at least one line/);
  });

  it("non-numbers, NaN and Infinity", () => {
    expect(fieldsOf("traverse", traverseWith({ readings: [[30, 55, "62", 61, 54, 31]] }))["readings.0.2"]).toMatch(/got the text "62"/);
    expect(fieldsOf("traverse", traverseWith({ readings: [[30, 55, "NaN", 61, 54, 31]] }))["readings.0.2"]).toMatch(/got the text "NaN"/);
    expect(fieldsOf("traverse", traverseWith({ readings: [[30, Number.NaN, 62, 61, 54, 31]] }))["readings.0.1"]).toMatch(/NaN, which is not a finite number/);
    expect(fieldsOf("traverse", traverseWith({ readings: [[30, 55, 62, Infinity, 54, 31]] }))["readings.0.3"]).toMatch(/Infinity/);
    expect(fieldsOf("traverse", airWith({ dry_bulb_c: Number.NaN }))["air.dry_bulb_c"]).toMatch(/got NaN/);
    expect(fieldsOf("traverse", traverseWith({ readings: [[30, 55, 62, 61, 54, 9000]] }))["readings.0.5"]).toMatch(/from -500 to 5000 Pa.*got 9000/);
  });

  it("humidity outside 0–100 %, absurd temperatures, both or neither of a pair, wet-bulb above dry-bulb", () => {
    expect(fieldsOf("traverse", airWith({ relative_humidity_pct: 120 }))["air.relative_humidity_pct"]).toMatch(/from 0 to 100 %; got 120/);
    expect(fieldsOf("traverse", airWith({ relative_humidity_pct: -1 }))["air.relative_humidity_pct"]).toMatch(/got -1/);
    expect(fieldsOf("traverse", airWith({ dry_bulb_c: 500 }))["air.dry_bulb_c"]).toMatch(/from -40 to 120 °C; got 500/);
    expect(fieldsOf("traverse", airWith({ dry_bulb_c: -273 }))["air.dry_bulb_c"]).toMatch(/got -273/);
    expect(fieldsOf("traverse", airWith({ wet_bulb_c: 15 }))["air.relative_humidity_pct"]).toMatch(/not both/);
    expect(fieldsOf("traverse", airWith({ relative_humidity_pct: undefined }))["air.relative_humidity_pct"]).toMatch(/got neither/);
    expect(fieldsOf("traverse", airWith({ altitude_m: 300 }))["air.barometric_pa"]).toMatch(/not both/);
    expect(fieldsOf("traverse", airWith({ barometric_pa: undefined }))["air.barometric_pa"]).toMatch(/got neither/);
    expect(fieldsOf("traverse", airWith({ relative_humidity_pct: undefined, wet_bulb_c: 25 }))["air.wet_bulb_c"]).toMatch(/at or below the dry-bulb 22 °C; got 25/);
    expect(fieldsOf("traverse", airWith({ static_pa: undefined }))["air.static_pa"]).toMatch(/got nothing/);
    // Air no such state can hold: saturated at 100 °C is 101 kPa of vapour, above 60 kPa total (ASHRAE saturation table).
    expect(fieldsOf("traverse", airWith({ dry_bulb_c: 100, barometric_pa: 60_000, static_pa: 0, relative_humidity_pct: 100 }))).toHaveProperty(["air.relative_humidity_pct"]);
  });

  it("invalid counts for the method", () => {
    // log-linear round: 6, 8 or 10 per diameter (ISO 5802 / ISO 3966); log-Tchebycheff: 5, 6 or 7 per side (ASHRAE).
    expect(fieldsOf("traverse", traverseWith({ readings: [[1, 2, 3, 4, 5, 6, 7]] }))["readings.0"]).toMatch(/7 readings.*6, 8 or 10/);
    expect(fieldsOf("traverse", traverseWith({ points_per_line: 7 }))["points_per_line"]).toMatch(/6, 8 or 10 points per diameter; got 7/);
    expect(fieldsOf("layout", { duct: { shape: "rectangular", width_mm: 800, height_mm: 400 }, method: "log-linear", lines: 4 })["lines"]).toMatch(/5, 6 or 7 lines; got 4/);
    expect(fieldsOf("layout", { duct: { shape: "round", diameter_mm: 400 }, method: "equal-area", points_per_line: 5 })["points_per_line"]).toMatch(/even number/);
    expect(fieldsOf("layout", { duct: { shape: "round", diameter_mm: 400 }, method: "equal-area", points_per_line: 2.5 })["points_per_line"]).toMatch(/whole number/);
    expect(fieldsOf("layout", { duct: { shape: "round", diameter_mm: 400 }, method: "log-Tchebycheff" })["method"]).toMatch(/"equal-area" or "log-linear"/);
  });

  it("misspelt fields, bad probe coefficient, impossible networks, unknown commands", () => {
    expect(fieldsOf("traverse", airWith({ rh: 40 }))["air.rh"]).toMatch(/not a field/);
    expect(fieldsOf("traverse", traverseWith({ probe: { coefficient: 2 } }))["probe.coefficient"]).toMatch(/from 0.5 to 1.2; got 2/);
    const nodes = [
      { id: "fan", parent: null, mass_flow_kg_s: 2 },
      { id: "fan", parent: null, mass_flow_kg_s: 1 },
      { id: "b", parent: "nowhere", mass_flow_kg_s: 1 },
      { id: "c", parent: "fan" },
    ];
    const f = fieldsOf("network", { nodes });
    expect(f["nodes.1.id"]).toMatch(/repeats/);
    expect(f["nodes.2.parent"]).toMatch(/"nowhere"/);
    expect(f["nodes.3.mass_flow_kg_s"]).toMatch(/got neither/);
    const cycle = fieldsOf("network", { nodes: [{ id: "a", parent: "b", mass_flow_kg_s: 1 }, { id: "b", parent: "a", mass_flow_kg_s: 1 }] });
    expect(Object.keys(cycle).length).toBeGreaterThan(0);
    expect(fieldsOf("unknown", {})).toHaveProperty("command");
    expect(fieldsOf("traverse", [1, 2])).toHaveProperty(["(input)"]);
  });
});
