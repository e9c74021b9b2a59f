import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { runCalcCommand } from "@/lib/airflow/commands";
import { MAX_NETWORK_NODES } from "@/lib/validation/calc";

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
    expect(fieldsOf("traverse", airWith({ barometric_pa: undefined }))["air.barometric_pa"]).toMatch(/got neither/);
    expect(fieldsOf("traverse", airWith({ relative_humidity_pct: undefined, wet_bulb_c: 25 }))["air.wet_bulb_c"]).toMatch(/at or below the dry-bulb 22 °C; got 25/);
    expect(fieldsOf("traverse", airWith({ static_pa: undefined }))["air.static_pa"]).toMatch(/is needed: give the duct static pressure .* or null if it was not measured.*got nothing/);
    expect(fieldsOf("traverse", airWith({ static_pa: "250" }))["air.static_pa"]).toMatch(/got the text "250"/);
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

/** Loose JSON, for reading a command's output in assertions (the shape is what the tests check). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Json = any;

/** The output of a succeeding command (through JSON, as the CLI and API give it); fails the test if it failed. */
function outputOf(command: string, input: unknown): Json {
  const r = runCalcCommand(command, input);
  if (!r.ok) throw new Error(`expected ${command} to succeed: ${JSON.stringify(r.error)}`);
  return JSON.parse(JSON.stringify(r.value)) as Json;
}

describe("traverse output added in the second pass", () => {
  it("keeps uncertainty_pct and uncertainty_terms_pct and adds the expanded uncertainty per flow with k = 2", () => {
    const out = outputOf("traverse", TRAVERSE);
    expect(out.uncertainty).toEqual(
      expect.objectContaining({ expanded_pct: expect.any(Number), coverage_factor: 2, coverage: "k = 2, about 95 %", combined_standard_pct: expect.any(Number) }),
    );
    expect(out.uncertainty_pct).toBe(out.uncertainty.expanded_pct);
    expect(out.uncertainty.expanded_pct).toBeCloseTo(2 * out.uncertainty.combined_standard_pct, 10);
    expect(out.uncertainty.shown).toMatch(/^± \d+\.\d % \(k = 2, about 95 %\)$/);
    for (const flow of ["actual", "standard", "mass"]) expect(out.uncertainty[flow]).toEqual(expect.objectContaining({ expanded_pct: expect.any(Number), terms_pct: expect.objectContaining({ sampling: expect.any(Number) }) }));
    expect(Object.keys(out.uncertainty_terms_pct).sort()).toEqual(["density", "dimension", "layout", "random", "reading", "sampling"]);
    expect(out.uncertainty.standard.expanded_pct).toBe(out.uncertainty.expanded_pct);
  });

  it("reports the probe, each point's published and read position, and gap filling", () => {
    const out = outputOf("traverse", traverseWith({ readings: [[30, 55, 62, 61, 54, 31], [null, 56, 63, 60, 52, 29]], probe: { head_diameter_mm: 6 } }));
    expect(out.probe).toEqual({ coefficient: 1, head_diameter_mm: 6, reach_mm: 3 });
    expect(out.points[0]).toEqual(expect.objectContaining({ position_mm: 19.2, read_position_mm: 19.2, depth_mm: 19.2 })); // 0.032 × 600 mm (ISO 5802 Table 2)
    expect(out.points[6]).toEqual(expect.objectContaining({ reading: null, filled_from: "mirror", filled_velocity_m_s: out.points[11].velocity_m_s }));
    expect(out.integration_rule).toBe("equal-weight");
    expect(out.filled_points).toBe(1);
  });

  it("accepts a measured barometer with the altitude and warns when they disagree by over 4 kPa", () => {
    const out = outputOf("traverse", airWith({ barometric_pa: 101_325, altitude_m: 1500 }));
    expect(out.air.barometric_source).toBe("measured");
    expect(out.air.altitude_m).toBe(1500);
    expect(out.warnings.join(" ")).toMatch(/sea-level-corrected/);
  });

  it("takes a null static pressure as not measured: 0 Pa assumed and said so", () => {
    const out = outputOf("traverse", airWith({ static_pa: null }));
    expect(out.air.static_pa).toBe(0);
    expect(out.air.static_assumed).toBe(true);
    expect(out.warnings.join(" ")).toMatch(/0 Pa \(ambient\) was assumed/);
  });

  it("refers standard velocities to the anemometer's own reference density", () => {
    const out = outputOf("traverse", traverseWith({ readings_kind: "velocity_standard", readings: [[4, 5, 6, 6, 5, 4]], instrument: { standard_density_kg_m3: 1.2 } }));
    expect(out.instrument_standard_density_kg_m3).toBe(1.2);
    expect(out.mass_flow_kg_s).toBeCloseTo(1.2 * out.area_m2 * 5, 12);
  });

  it("layout: published positions, the probe's reach and the counts it can reach", () => {
    // 150 mm round, log-linear 10 per diameter: 0.019 × 150 = 2.85 mm (ISO 3966) is beyond an 8 mm head (common practice).
    const out = outputOf("layout", { duct: { shape: "round", diameter_mm: 150 }, method: "log-linear", points_per_line: 10, lines: 2 });
    expect(out.probe_head_diameter_mm).toBe(8);
    expect(out.beyond_probe_reach_count).toBe(4);
    expect(out.reachable_counts).toEqual({ lines: 2, points_per_line: 6 });
    expect(out.lines[0].points[0]).toEqual(expect.objectContaining({ read_position_mm: 4, depth_mm: 4, beyond_probe_reach: true }));
    expect(Math.abs(out.lines[0].points[0].position_mm - 2.85)).toBeLessThanOrEqual(0.05 + 1e-9); // to the 0.1 mm printed
    expect(out.wall_minimum_mm).toBe(0);
  });
});

describe("readings that cannot be a traverse", () => {
  it("mostly negative readings: exit 2 naming readings, suggesting swapped connections", () => {
    const r = cli("traverse", JSON.stringify(traverseWith({ readings: TRAVERSE.readings.map((row) => row.map((v) => -v)) })));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    const err = JSON.parse(r.stderr).error;
    expect(err.fields.readings).toMatch(/12 of 12 readings are negative.*reversed/);
  });
});

describe("size limits (counts are checked before values)", () => {
  it("a 10 000 × 10 000 grid is refused at once, naming readings", () => {
    const row = new Array<number>(10_000).fill(50);
    const grid = new Array<number[]>(10_000).fill(row); // one shared row: cheap to build
    const f = fieldsOf("traverse", traverseWith({ readings: grid }));
    expect(Object.keys(f)).toEqual(["readings"]);
    expect(f.readings).toMatch(/10,000 lines of readings; a traverse has at most 100 lines/);
  });

  it("a line of over 100 points is refused, naming it", () => {
    const f = fieldsOf("traverse", traverseWith({ method: "equal-area", readings: [Array(8).fill(50), Array(101).fill(50)] }));
    expect(f["readings.1"]).toMatch(/101 readings; a line holds at most 100 points/);
  });

  it("over 5 000 sections is refused at once, naming nodes", () => {
    const node = { id: "x", parent: null, mass_flow_kg_s: 1 };
    const f = fieldsOf("network", { nodes: new Array(100_000).fill(node) });
    expect(Object.keys(f)).toEqual(["nodes"]);
    expect(f.nodes).toMatch(/100,000 sections; at most 5,000/);
    expect(MAX_NETWORK_NODES).toBe(5_000);
  });

  it("the CLI refuses 6 000 sections with exit 2", () => {
    const nodes = Array.from({ length: 6_000 }, (_, i) => ({ id: `s${i}`, parent: i === 0 ? null : "s0", mass_flow_kg_s: 1 }));
    const r = cli("network", JSON.stringify({ nodes }));
    expect(r.status).toBe(2);
    expect(JSON.parse(r.stderr).error.fields.nodes).toMatch(/6,000 sections/);
  });

  it("a 5 000-section loop gives one short error; many bad sections give 50 errors and a count", () => {
    const loop = Array.from({ length: 5_000 }, (_, i) => ({ id: `s${i}`, parent: `s${(i + 1) % 5_000}`, mass_flow_kg_s: 1 }));
    const r = runCalcCommand("network", { nodes: loop });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(Object.keys(r.error.fields ?? {})).toHaveLength(1);
      expect(JSON.stringify(r.error).length).toBeLessThan(1000);
    }
    const bad = Array.from({ length: 3_000 }, (_, i) => ({ id: `s${i}`, parent: null, mass_flow_kg_s: -1 }));
    const f = fieldsOf("network", { nodes: bad });
    expect(Object.keys(f)).toHaveLength(51);
    expect(f["(more)"]).toMatch(/^2,950 more fields have problems/);
  });

  it("ids are at most 200 characters, and flows too small to be real are refused", () => {
    expect(fieldsOf("network", { nodes: [{ id: "x".repeat(201), parent: null, mass_flow_kg_s: 1 }] })["nodes.0.id"]).toMatch(/at most 200 characters; got 201/);
    expect(fieldsOf("network", { nodes: [{ id: "a", parent: "y".repeat(300), mass_flow_kg_s: 1 }] })["nodes.0.parent"]).toMatch(/at most 200 characters/);
    const tiny = fieldsOf("network", { nodes: [{ id: "p", parent: null, mass_flow_kg_s: 1e-300 }, { id: "c", parent: "p", mass_flow_kg_s: 1 }] });
    expect(tiny["nodes.0.mass_flow_kg_s"]).toMatch(/must be 0 \(no flow\) or from 0\.000001 to 10000 kg\/s; got 1e-300/);
  });

  it("network takes standard_density_kg_m3 for the standard-volume imbalance", () => {
    const nodes = [{ id: "p", parent: null, mass_flow_kg_s: 1.2 }, { id: "c", parent: "p", mass_flow_kg_s: 1.08 }];
    const out = outputOf("network", { nodes, standard_density_kg_m3: 1.2 });
    expect(out.standard_density_kg_m3).toBe(1.2);
    expect(out.junctions[0].imbalance_standard_m3_s).toBeCloseTo(0.12 / 1.2, 12);
  });
});

describe("no library default message reaches a user", () => {
  // zod's own phrasing, e.g. "Invalid input: expected object, received array".
  const LIBRARY = /^Invalid|expected \w+, received|^Too (big|small)|^Unrecognized key|^Required$/;
  const WRONG = [null, 42, "text", true, [], {}, [1, "a"], { x: 1 }];

  /** Every dotted path of a JSON value, to put a wrong value at each level. */
  function paths(value: unknown, at: (string | number)[] = []): (string | number)[][] {
    if (Array.isArray(value)) return [at, ...value.flatMap((v, i) => paths(v, [...at, i]))];
    if (value && typeof value === "object") return [at, ...Object.entries(value).flatMap(([k, v]) => paths(v, [...at, k]))];
    return [at];
  }
  function withValue(base: unknown, path: (string | number)[], value: unknown): unknown {
    if (path.length === 0) return value;
    const copy = (Array.isArray(base) ? [...base] : { ...(base as object) }) as Record<string | number, unknown>;
    const [head = "", ...rest] = path;
    copy[head] = withValue(copy[head], rest, value);
    return copy;
  }

  const BASES: Record<string, unknown> = {
    layout: { duct: { shape: "rectangular", width_mm: 800, height_mm: 400 }, method: "log-linear", lines: 5, points_per_line: 5, probe: { head_diameter_mm: 8 }, straight_upstream_mm: 4000, port_offset_mm: 30 },
    traverse: {
      ...TRAVERSE,
      air: { ...AIR, altitude_m: 100 },
      probe: { coefficient: 1, head_diameter_mm: 8 },
      instrument: { pressure_accuracy_pct: 1, dimension_accuracy_mm: 3, standard_density_kg_m3: 1.2 },
      standard_density_kg_m3: 1.2,
      readings_kind: "velocity_pressure",
    },
    network: { nodes: [{ id: "fan", parent: null, mass_flow_kg_s: 2 }, { id: "b", parent: "fan", flow_m3_s: 1, density_kg_m3: 1.2 }], tolerance_pct: 10, standard_density_kg_m3: 1.2 },
  };

  it.each(Object.keys(BASES))("%s: a wrong type at every level gets our own words", (command) => {
    const base = BASES[command];
    let checked = 0;
    for (const path of paths(base)) {
      for (const value of WRONG) {
        const r = runCalcCommand(command, withValue(base, path, value));
        if (r.ok) continue;
        checked++;
        expect(r.error.message).not.toMatch(LIBRARY);
        for (const [field, message] of Object.entries(r.error.fields ?? {})) {
          expect(message, `${command} ${field} with ${JSON.stringify(value)} at ${path.join(".")}`).not.toMatch(LIBRARY);
          expect(message.length).toBeGreaterThan(10);
        }
      }
    }
    expect(checked).toBeGreaterThan(50);
  });
});
