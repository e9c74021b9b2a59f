/**
 * Geometry of the cross-section drawing: the duct outline, each traverse line with its test port, and
 * every point where the engine's layout puts it, in SVG coordinates (y down). Round ducts: diameters
 * at their angles, the port where each diameter meets the wall on the probe's side (the layout's
 * positions are measured from there). Rectangular ducts: lines across the width, ports on the top
 * face, points down from it. Pure: the drawing component only renders these numbers.
 */

/** The calc `layout` output as the API returns it (camelCase), the parts the drawing needs. */
export interface LayoutForDrawing {
  lineCount: number;
  pointsPerLine: number;
  lines: {
    angleDeg?: number;
    xMm?: number;
    points: { xMm: number; yMm: number; depthMm: number; readPositionMm: number; movedFromWall?: boolean; beyondProbeReach?: boolean }[];
  }[];
}

export type DuctForDrawing = { shape: "round"; diameterMm: number } | { shape: "rectangular"; widthMm: number; heightMm: number };

export interface DrawingPoint {
  line: number;
  point: number;
  x: number;
  y: number;
  beyondReach: boolean;
}

export interface DrawingLine {
  line: number;
  /** "1", "2"…: the port and line number shown. */
  label: string;
  x1: number;
  y1: number;
  x2: number;
  y2: number;
  port: { x: number; y: number };
  /** Where the port's label goes, outside the duct. */
  labelAt: { x: number; y: number };
}

export interface Drawing {
  viewBox: string;
  width: number;
  height: number;
  outline: { kind: "circle"; cx: number; cy: number; r: number } | { kind: "rect"; x: number; y: number; w: number; h: number };
  lines: DrawingLine[];
  points: DrawingPoint[];
  /** SVG units per mm. */
  scale: number;
  /** A radius for point markers that keeps neighbours apart. */
  pointRadius: number;
  /** The smallest distance between two points, SVG units (sizes the map's value markers). */
  minSpacing: number;
}

function minSpacing(points: readonly DrawingPoint[]): number {
  let min = Infinity;
  for (let a = 0; a < points.length; a++)
    for (let b = a + 1; b < points.length; b++) {
      const d = Math.hypot(points[a]!.x - points[b]!.x, points[a]!.y - points[b]!.y);
      if (d > 1e-9 && d < min) min = d;
    }
  return Number.isFinite(min) ? min : DRAWING_SIZE;
}

/** The drawing's longer side, in SVG units. */
export const DRAWING_SIZE = 400;
const MARGIN = 44;

export function crossSectionDrawing(duct: DuctForDrawing, layout: LayoutForDrawing): Drawing {
  const points: DrawingPoint[] = [];
  const lines: DrawingLine[] = [];
  if (duct.shape === "round") {
    const scale = DRAWING_SIZE / duct.diameterMm;
    const r = DRAWING_SIZE / 2;
    layout.lines.forEach((line, k) => {
      const theta = ((line.angleDeg ?? 90) * Math.PI) / 180;
      const px = r * Math.cos(theta);
      const py = -r * Math.sin(theta);
      lines.push({
        line: k,
        label: String(k + 1),
        x1: px,
        y1: py,
        x2: -px,
        y2: -py,
        port: { x: px, y: py },
        labelAt: { x: px * (1 + 26 / r), y: py * (1 + 26 / r) },
      });
      line.points.forEach((p, i) => points.push({ line: k, point: i, x: p.xMm * scale, y: -p.yMm * scale, beyondReach: !!p.beyondProbeReach }));
    });
    const n = Math.max(1, layout.pointsPerLine);
    const pointRadius = Math.max(5, Math.min(13, (DRAWING_SIZE / n) * 0.3));
    const half = r + MARGIN;
    return { viewBox: `${-half} ${-half} ${2 * half} ${2 * half}`, width: 2 * half, height: 2 * half, outline: { kind: "circle", cx: 0, cy: 0, r }, lines, points, scale, pointRadius, minSpacing: minSpacing(points) };
  }
  const scale = DRAWING_SIZE / Math.max(duct.widthMm, duct.heightMm);
  const w = duct.widthMm * scale;
  const h = duct.heightMm * scale;
  layout.lines.forEach((line, k) => {
    const x = (line.xMm ?? line.points[0]?.xMm ?? 0) * scale;
    lines.push({ line: k, label: String(k + 1), x1: x, y1: 0, x2: x, y2: h, port: { x, y: 0 }, labelAt: { x, y: -26 } });
    line.points.forEach((p, i) => points.push({ line: k, point: i, x: p.xMm * scale, y: p.yMm * scale, beyondReach: !!p.beyondProbeReach }));
  });
  const spacing = Math.min(w / Math.max(1, layout.lineCount), h / Math.max(1, layout.pointsPerLine));
  const pointRadius = Math.max(5, Math.min(13, spacing * 0.3));
  return { viewBox: `${-MARGIN} ${-MARGIN} ${w + 2 * MARGIN} ${h + 2 * MARGIN}`, width: w + 2 * MARGIN, height: h + 2 * MARGIN, outline: { kind: "rect", x: 0, y: 0, w, h }, lines, points, scale, pointRadius, minSpacing: minSpacing(points) };
}
