import { describe, expect, it } from "vitest";
import { runCalcCommand } from "@/lib/airflow/commands";
import { camelKeys } from "@/lib/traverse/engine-input";
import { crossSectionDrawing, DRAWING_SIZE, type LayoutForDrawing } from "@/lib/traverse/drawing";

const layout = (input: object) => {
  const r = runCalcCommand("layout", input);
  if (!r.ok) throw new Error(r.error.message);
  return camelKeys(r.value) as LayoutForDrawing;
};

describe("the cross-section drawing", () => {
  it("puts round-duct diameters at their angles with the port where each meets the wall, points on them", () => {
    const l = layout({ duct: { shape: "round", diameter_mm: 500 }, method: "log-linear", lines: 2, points_per_line: 8 });
    const d = crossSectionDrawing({ shape: "round", diameterMm: 500 }, l);
    const r = DRAWING_SIZE / 2;
    expect(d.outline).toEqual({ kind: "circle", cx: 0, cy: 0, r });
    // Line 1 at 90°: its port at the top of the circle; line 2 at 180°: on the left (SVG y points down).
    expect(d.lines[0]!.port.x).toBeCloseTo(0, 9);
    expect(d.lines[0]!.port.y).toBeCloseTo(-r, 9);
    expect(d.lines[1]!.port.x).toBeCloseTo(-r, 9);
    expect(d.lines[1]!.port.y).toBeCloseTo(0, 9);
    expect(d.points).toHaveLength(16);
    // Log-linear 8 points, first at 0.021 D from the port wall (ISO 5802 table): 0.021 × 400 = 8.4 units below the top.
    expect(d.points[0]!.x).toBeCloseTo(0, 9);
    expect(d.points[0]!.y).toBeCloseTo(-r + 0.021 * DRAWING_SIZE, 6);
    for (const p of d.points) expect(Math.hypot(p.x, p.y)).toBeLessThan(r);
    // Points on a diameter lie on the line from its port through the centre.
    for (const p of d.points.filter((q) => q.line === 1)) expect(p.y).toBeCloseTo(0, 9);
  });

  it("draws rectangular lines from ports on the top face with points down from it, and flags points the probe cannot reach", () => {
    const l = layout({ duct: { shape: "rectangular", width_mm: 1200, height_mm: 600 }, method: "log-linear", probe: { head_diameter_mm: 40 } });
    const d = crossSectionDrawing({ shape: "rectangular", widthMm: 1200, heightMm: 600 }, l);
    expect(d.outline).toEqual({ kind: "rect", x: 0, y: 0, w: 400, h: 200 });
    expect(d.lines).toHaveLength(7);
    // Log-Tchebycheff 7 lines: first at 0.053 of the width (ASHRAE Handbook table).
    expect(d.lines[0]!.port).toEqual({ x: expect.closeTo(0.053 * 400, 6), y: 0 });
    for (const p of d.points) {
      expect(p.x).toBeGreaterThan(0);
      expect(p.x).toBeLessThan(400);
      expect(p.y).toBeGreaterThan(0);
      expect(p.y).toBeLessThan(200);
    }
    // A 40 mm head reaches 20 mm from a wall; 0.074 × 600 = 44 mm is reachable, 0.053 × 1200 = 64 mm too: none flagged.
    expect(d.points.some((p) => p.beyondReach)).toBe(false);
    const tight = crossSectionDrawing({ shape: "round", diameterMm: 300 }, layout({ duct: { shape: "round", diameter_mm: 300 }, method: "log-linear", points_per_line: 10, probe: { head_diameter_mm: 12 } }));
    // 0.019 × 300 = 5.7 mm from the wall, inside the 6 mm a 12 mm head can reach.
    expect(tight.points.filter((p) => p.beyondReach).map((p) => p.point)).toEqual([0, 9, 0, 9]);
  });
});
