import { describe, expect, it } from "vitest";
import { buildLayout, equalAreaRoundFractions, layoutCountProblem, recommendLayout, type Duct, type Layout } from "@/lib/airflow/layout";

// A duct large enough that no tabulated point falls inside the wall minimum (1 % of 10 m = 100 mm).
const BIG_ROUND: Duct = { shape: "round", diameterM: 10 };
const BIG_RECT: Duct = { shape: "rectangular", widthM: 10, heightM: 10 };

/** Positions along line 0 as fractions of the span, in layout order. */
function fractionsOf(layout: Layout, spanM: number): number[] {
  return (layout.lines[0]?.points ?? []).map((p) => p.positionM / spanM);
}

describe("equal-area round positions", () => {
  // US EPA Method 1, 40 CFR 60 App. A-1, Table 1-2: traverse points as % of diameter from the inside wall.
  const EPA_TABLE_1_2: Record<number, number[]> = {
    4: [6.7, 25.0, 75.0, 93.3],
    6: [4.4, 14.6, 29.6, 70.4, 85.4, 95.6],
    8: [3.2, 10.5, 19.4, 32.3, 67.7, 80.6, 89.5, 96.8],
    10: [2.6, 8.2, 14.6, 22.6, 34.2, 65.8, 77.4, 85.4, 91.8, 97.4],
    12: [2.1, 6.7, 11.8, 17.7, 25.0, 35.6, 64.4, 75.0, 82.3, 88.2, 93.3, 97.9],
  };
  it.each(Object.entries(EPA_TABLE_1_2))("%s points per diameter match EPA Method 1 Table 1-2 to its printed 0.1 %", (n, table) => {
    const layout = buildLayout({ duct: BIG_ROUND, method: "equal-area", pointsPerLine: Number(n), lines: 2 });
    const got = fractionsOf(layout, 10).map((f) => f * 100);
    expect(got).toHaveLength(table.length);
    got.forEach((g, i) => expect(Math.abs(g - (table[i] ?? NaN))).toBeLessThanOrEqual(0.05 + 1e-9));
  });

  it("each point sits at the area centroid of its annulus: r²/R² = (2j−1)/n (closed form)", () => {
    const n = 8;
    const radii = equalAreaRoundFractions(n).slice(0, n / 2).map((f) => 1 - 2 * f).sort((a, b) => a - b);
    radii.forEach((r, j) => expect(r * r).toBeCloseTo((2 * j + 1) / n, 12));
  });
});

describe("log-linear round positions", () => {
  // ISO 5802:2001 Tables 2–3 (6 and 8 points); ISO 3966 / ASHRAE Handbook figure (10 points). y/D from the wall.
  const ISO_LOG_LINEAR: Record<number, number[]> = {
    6: [0.032, 0.135, 0.321, 0.679, 0.865, 0.968],
    8: [0.021, 0.117, 0.184, 0.345, 0.655, 0.816, 0.883, 0.979],
    10: [0.019, 0.076, 0.153, 0.217, 0.361, 0.639, 0.783, 0.847, 0.924, 0.981],
  };
  it.each(Object.entries(ISO_LOG_LINEAR))("%s points per diameter match the ISO table", (n, table) => {
    const layout = buildLayout({ duct: BIG_ROUND, method: "log-linear", pointsPerLine: Number(n), lines: 2 });
    fractionsOf(layout, 10).forEach((f, i) => expect(f).toBeCloseTo(table[i] ?? NaN, 9));
  });

  it.each([6, 8, 10])("%s points: the engine's positions integrate the log law exactly, an independent check of the table (derived)", (n) => {
    // The log-linear rule places points so that equal weights integrate u = a + b·ln(y/R) over the disc without
    // error. Exact area mean of ln(y/R), y = R − r: ∫₀¹ ln(1 − ρ)·2ρ dρ = −3/2 (closed form). The printed
    // positions carry three decimals, which moves the sum by at most ±0.005 here (Σ 0.0005·D/y over the points).
    const layout = buildLayout({ duct: BIG_ROUND, method: "log-linear", pointsPerLine: n, lines: 2 });
    const ys = fractionsOf(layout, 10).map((f) => 2 * Math.min(f, 1 - f)); // y/R from the nearer wall
    const mean = ys.reduce((a, y) => a + Math.log(y), 0) / ys.length;
    expect(Math.abs(mean - -1.5)).toBeLessThanOrEqual(0.005);
    // The equal-area positions, placed by area and not by the log law, miss it by far more.
    const ea = equalAreaRoundFractions(n).map((f) => 2 * Math.min(f, 1 - f));
    expect(Math.abs(ea.reduce((a, y) => a + Math.log(y), 0) / ea.length - -1.5)).toBeGreaterThan(0.02);
  });
});

describe("log-Tchebycheff rectangular positions", () => {
  // ASHRAE Handbook Fundamentals, measurement chapter: fractions of the side.
  const ASHRAE_LOG_T: Record<number, number[]> = {
    5: [0.074, 0.288, 0.5, 0.712, 0.926],
    6: [0.061, 0.235, 0.437, 0.563, 0.765, 0.939],
    7: [0.053, 0.203, 0.366, 0.5, 0.634, 0.797, 0.947],
  };
  it.each(Object.entries(ASHRAE_LOG_T))("%s per side: points down each line and lines across the width match", (n, table) => {
    const layout = buildLayout({ duct: BIG_RECT, method: "log-linear", pointsPerLine: Number(n), lines: Number(n) });
    fractionsOf(layout, 10).forEach((f, i) => expect(f).toBeCloseTo(table[i] ?? NaN, 9));
    layout.lines.forEach((line, i) => expect((line.lineXM ?? NaN) / 10).toBeCloseTo(table[i] ?? NaN, 9));
  });

  it("the tabulated positions follow the generating rule: wall strip (1/n)/e, interior equal-weight Chebyshev nodes (derived; ±0.0005)", () => {
    // Chebyshev (equal-weight) quadrature nodes on [−1, 1], from the moment conditions Σx^2j = (k/2)∫x^2j dx:
    // k = 3: {0, ±1/√2}; k = 4: x² roots of t² − (2/3)t + 1/45; k = 5: {0} ∪ x² roots of t² − (5/6)t + 7/72.
    const quadRoots = (b: number, c: number) => [(b - Math.sqrt(b * b - 4 * c)) / 2, (b + Math.sqrt(b * b - 4 * c)) / 2].map(Math.sqrt);
    const nodes: Record<number, number[]> = {
      3: [-Math.SQRT1_2, 0, Math.SQRT1_2],
      4: ((r) => [-(r[1] ?? 0), -(r[0] ?? 0), r[0] ?? 0, r[1] ?? 0])(quadRoots(2 / 3, 1 / 45)),
      5: ((r) => [-(r[1] ?? 0), -(r[0] ?? 0), 0, r[0] ?? 0, r[1] ?? 0])(quadRoots(5 / 6, 7 / 72)),
    };
    for (const n of [5, 6, 7]) {
      const a = 1 / n;
      const interior = (nodes[n - 2] ?? []).map((x) => 0.5 + x * (0.5 - a));
      const expected = [a / Math.E, ...interior, 1 - a / Math.E];
      const layout = buildLayout({ duct: BIG_RECT, method: "log-linear", pointsPerLine: n, lines: 5 });
      const got = fractionsOf(layout, 10);
      expect(got).toHaveLength(expected.length);
      got.forEach((f, i) => expect(Math.abs(f - (expected[i] ?? NaN))).toBeLessThanOrEqual(0.0005 + 1e-12));
    }
  });
});

describe("equal-area rectangular positions", () => {
  it("are the centres of equal strips, (2i−1)/(2n) (closed form)", () => {
    const layout = buildLayout({ duct: BIG_RECT, method: "equal-area", pointsPerLine: 4, lines: 3 });
    expect(fractionsOf(layout, 10)).toEqual([0.125, 0.375, 0.625, 0.875].map((f) => expect.closeTo(f, 12)));
    expect(layout.lines.map((l) => (l.lineXM ?? NaN) / 10)).toEqual([1 / 6, 0.5, 5 / 6].map((f) => expect.closeTo(f, 12)));
  });
});

describe("coordinates and depth", () => {
  it("round: lines are diameters at equal angles, x/y from the centre, depth from the port wall plus the offset", () => {
    const layout = buildLayout({ duct: { shape: "round", diameterM: 0.6 }, method: "log-linear", pointsPerLine: 6, lines: 3, portOffsetM: 0.05 });
    expect(layout.lines.map((l) => l.angleDeg)).toEqual([90, 150, 210]);
    for (const line of layout.lines) {
      const angle = ((line.angleDeg ?? NaN) * Math.PI) / 180;
      for (const p of line.points) {
        expect(p.depthM - p.positionM).toBeCloseTo(0.05, 12);
        // The point lies on the diameter through the port, at distance R − position from the centre, port side positive.
        expect(p.xM).toBeCloseTo((0.3 - p.positionM) * Math.cos(angle), 12);
        expect(p.yM).toBeCloseTo((0.3 - p.positionM) * Math.sin(angle), 12);
      }
      const depths = line.points.map((p) => p.depthM);
      expect([...depths].sort((a, b) => a - b)).toEqual(depths);
    }
  });

  it("rectangular: x from the left wall per line, y (and depth) from the top wall", () => {
    const layout = buildLayout({ duct: { shape: "rectangular", widthM: 1.2, heightM: 0.6 }, method: "log-linear", pointsPerLine: 5, lines: 7 });
    const p = layout.lines[0]?.points[0];
    expect(p?.xM).toBeCloseTo(0.053 * 1.2, 12); // ASHRAE log-T 7 per side, first position 0.053
    expect(p?.yM).toBeCloseTo(0.074 * 0.6, 12); // ASHRAE log-T 5 per side, first position 0.074
    expect(p?.depthM).toBeCloseTo(p?.yM ?? NaN, 12);
  });
});

describe("wall minimum (US EPA Method 1: 13 mm when D ≤ 0.61 m, 25 mm above)", () => {
  it("moves points nearer than 13 mm out to 13 mm on a 300 mm duct and warns", () => {
    // Equal-area 10 points: first at 2.6 % of 300 mm = 7.8 mm (EPA Table 1-2) → moved to 13 mm.
    const layout = buildLayout({ duct: { shape: "round", diameterM: 0.3 }, method: "equal-area", pointsPerLine: 10, lines: 2 });
    const first = layout.lines[0]?.points[0];
    const last = layout.lines[0]?.points.at(-1);
    expect(first?.positionM).toBeCloseTo(0.013, 12);
    expect(first?.moved).toBe(true);
    expect(last?.positionM).toBeCloseTo(0.3 - 0.013, 12);
    expect(layout.lines[0]?.points[1]?.moved).toBe(false);
    expect(layout.warnings.join(" ")).toMatch(/moved out/);
  });

  it("leaves log-linear positions where the rule puts them: 900 mm, 8 points, wall point at 0.021 D = 18.9 mm (ISO 5802 Table 3), not 25 mm", () => {
    const layout = buildLayout({ duct: { shape: "round", diameterM: 0.9 }, method: "log-linear", pointsPerLine: 8, lines: 2 });
    const line = layout.lines[0]?.points ?? [];
    expect(line[0]?.positionM).toBeCloseTo(0.021 * 0.9, 12);
    expect(line[0]?.depthM).toBeCloseTo(0.0189, 12);
    expect(line.at(-1)?.positionM).toBeCloseTo(0.979 * 0.9, 12);
    expect(line.some((p) => p.moved || p.beyondProbeReach)).toBe(false);
    expect(layout.wallMinimumM).toBe(0);
    expect(layout.warnings.join(" ")).not.toMatch(/moved out/);
  });

  it("leaves log-Tchebycheff positions where the rule puts them on a small duct: 0.074 × 150 mm = 11.1 mm (ASHRAE)", () => {
    const layout = buildLayout({ duct: { shape: "rectangular", widthM: 0.15, heightM: 0.15 }, method: "log-linear", pointsPerLine: 5, lines: 5 });
    expect(layout.lines[0]?.points[0]?.positionM).toBeCloseTo(0.0111, 12);
    expect(layout.lines[0]?.lineXM).toBeCloseTo(0.0111, 12);
  });

  it("uses 25 mm on a duct over 0.61 m", () => {
    // Equal-area 12 points: first at 2.1 % of 1000 mm = 21 mm (EPA Table 1-2) → moved to 25 mm.
    const layout = buildLayout({ duct: { shape: "round", diameterM: 1 }, method: "equal-area", pointsPerLine: 12, lines: 2 });
    expect(layout.lines[0]?.points[0]?.positionM).toBeCloseTo(0.025, 12);
    expect(layout.wallMinimumM).toBe(0.025);
  });
});

describe("probe reach (a point nearer a wall than half the probe head is flagged, read where the head reaches)", () => {
  it("150 mm round, log-linear 10 points, 8 mm head (common practice): the wall points at 0.019 D = 2.85 mm are read at 4 mm; 6 points suggested", () => {
    const layout = buildLayout({ duct: { shape: "round", diameterM: 0.15 }, method: "log-linear", pointsPerLine: 10, lines: 2, portOffsetM: 0.02 });
    const first = layout.lines[0]?.points[0];
    const last = layout.lines[0]?.points.at(-1);
    expect(first?.positionM).toBeCloseTo(0.019 * 0.15, 12); // published position kept
    expect(first?.beyondProbeReach).toBe(true);
    expect(first?.readPositionM).toBeCloseTo(0.004, 12);
    expect(first?.depthM).toBeCloseTo(0.024, 12); // read position + port offset
    expect(last?.readPositionM).toBeCloseTo(0.15 - 0.004, 12);
    expect(layout.beyondReachCount).toBe(4);
    expect(layout.probeHeadDiameterM).toBe(0.008);
    // 8 points: 0.021 × 150 = 3.15 mm, still out of reach; 6 points: 0.032 × 150 = 4.8 mm (ISO 5802 Table 2).
    expect(layout.reachableCounts).toEqual({ lines: 2, pointsPerLine: 6 });
    expect(layout.warnings.join(" ")).toMatch(/4 points lie closer to a wall than the 8 mm probe head can reach \(4 mm\).*2 diameters × 6 points per line/);
  });

  it("takes the head size as an input and says when no count of the method is reachable", () => {
    const layout = buildLayout({ duct: { shape: "round", diameterM: 0.3 }, method: "log-linear", pointsPerLine: 6, lines: 2, probeHeadDiameterM: 0.02 });
    expect(layout.beyondReachCount).toBe(4); // 0.032 × 300 = 9.6 mm < 10 mm on both walls of both diameters
    expect(layout.reachableCounts).toBeNull();
    expect(layout.warnings.join(" ")).toMatch(/smaller head or the equal-area method/);
    expect(buildLayout({ duct: { shape: "round", diameterM: 0.3 }, method: "log-linear", pointsPerLine: 6, lines: 2, probeHeadDiameterM: 0.006 }).beyondReachCount).toBe(0);
  });

  it("rectangular: a line too near a side wall is flagged too", () => {
    // log-T 7 per side on 60 mm: 0.053 × 60 = 3.2 mm from the walls.
    const layout = buildLayout({ duct: { shape: "rectangular", widthM: 0.06, heightM: 0.3 }, method: "log-linear", pointsPerLine: 5, lines: 7 });
    expect(layout.lines[0]?.points.every((p) => p.beyondProbeReach)).toBe(true);
    expect(layout.lines[0]?.points[0]?.readXM).toBeCloseTo(0.004, 12);
    expect(layout.lines[1]?.points.some((p) => p.beyondProbeReach)).toBe(false);
    expect(layout.reachableCounts).toEqual({ lines: 5, pointsPerLine: 5 }); // 0.074 × 60 = 4.4 mm
  });
});

describe("recommended counts", () => {
  it.each([
    // Round: 6 points per diameter up to 250 mm, 8 or 10 above (ASHRAE Handbook rule; 10 above 600 mm is our pick); 2 diameters.
    [0.2, 6, 2],
    [0.25, 6, 2],
    [0.4, 8, 2],
    [0.9, 10, 2],
    [1.5, 10, 3],
  ])("round %s m → %s points × %s diameters", (d, points, lines) => {
    const rec = recommendLayout({ duct: { shape: "round", diameterM: d }, method: "log-linear" });
    expect([rec.pointsPerLine, rec.lines]).toEqual([points, lines]);
  });

  it.each([
    // ASHRAE log-Tchebycheff: side < 762 mm → 5, 762–914 mm → 6, > 914 mm → 7.
    [0.6, 0.4, 5, 5],
    [0.8, 0.761, 6, 5],
    [1.2, 0.9, 7, 6],
  ])("log-T %s × %s m → %s lines × %s points", (w, h, lines, points) => {
    const rec = recommendLayout({ duct: { shape: "rectangular", widthM: w, heightM: h }, method: "log-linear" });
    expect([rec.lines, rec.pointsPerLine]).toEqual([lines, points]);
  });

  it("equal-area rectangular: spacing ≤ 150 mm and ≥ 25 points (TAB practice)", () => {
    const big = recommendLayout({ duct: { shape: "rectangular", widthM: 1.5, heightM: 0.9 }, method: "equal-area" });
    expect(1.5 / big.lines).toBeLessThanOrEqual(0.15);
    expect(0.9 / big.pointsPerLine).toBeLessThanOrEqual(0.15);
    const small = recommendLayout({ duct: { shape: "rectangular", widthM: 0.3, heightM: 0.2 }, method: "equal-area" });
    expect(small.lines * small.pointsPerLine).toBeGreaterThanOrEqual(25);
  });

  it("a short straight run adds points and lines and warns; under 2 D upstream the plane is called unsuitable", () => {
    const base = recommendLayout({ duct: { shape: "round", diameterM: 0.4 }, method: "equal-area" });
    // 7.5 D upstream / 2 D downstream wanted (common practice); 2 D / 0.5 D minimum (US EPA Method 1).
    const short = recommendLayout({ duct: { shape: "round", diameterM: 0.4 }, method: "equal-area", straightUpstreamM: 1.6, straightDownstreamM: 1 });
    expect(short.pointsPerLine).toBeGreaterThan(base.pointsPerLine);
    expect(short.lines).toBe(3);
    expect(short.warnings.join(" ")).toMatch(/4\.0 diameters of straight duct upstream/);
    const bad = recommendLayout({ duct: { shape: "round", diameterM: 0.4 }, method: "equal-area", straightUpstreamM: 0.6, straightDownstreamM: 0.1 });
    expect(bad.warnings.filter((w) => /unsuitable/.test(w))).toHaveLength(2);
    const good = recommendLayout({ duct: { shape: "round", diameterM: 0.4 }, method: "equal-area", straightUpstreamM: 4, straightDownstreamM: 1 });
    expect(good.warnings).toEqual([]);
  });

  it("fewer lines or points than recommended is a warning, not an error", () => {
    const layout = buildLayout({ duct: { shape: "round", diameterM: 0.9 }, method: "log-linear", pointsPerLine: 6, lines: 1 });
    expect(layout.pointsPerLine).toBe(6);
    expect(layout.warnings.join(" ")).toMatch(/1 diameter is fewer than the 2/);
    expect(layout.warnings.join(" ")).toMatch(/6 points per line is fewer than the 10/);
  });
});

describe("counts the method does not define", () => {
  it.each([
    ["round", "log-linear", { pointsPerLine: 7 }, "points_per_line"],
    ["round", "equal-area", { pointsPerLine: 5 }, "points_per_line"],
    ["round", "equal-area", { lines: 0 }, "lines"],
    ["rectangular", "log-linear", { lines: 4 }, "lines"],
    ["rectangular", "log-linear", { pointsPerLine: 8 }, "points_per_line"],
    ["rectangular", "equal-area", { pointsPerLine: 1 }, "points_per_line"],
  ] as const)("%s %s %o → error on %s", (shape, method, counts, field) => {
    expect(layoutCountProblem(shape, method, counts)?.field).toBe(field);
  });

  it("accepts the defined ones", () => {
    expect(layoutCountProblem("round", "log-linear", { pointsPerLine: 8, lines: 3 })).toBeNull();
    expect(layoutCountProblem("round", "equal-area", { pointsPerLine: 14 })).toBeNull();
    expect(layoutCountProblem("rectangular", "log-linear", { pointsPerLine: 6, lines: 7 })).toBeNull();
    expect(() => buildLayout({ duct: BIG_ROUND, method: "log-linear", pointsPerLine: 7 })).toThrow(RangeError);
  });
});
