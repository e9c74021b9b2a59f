/**
 * Vector graphics of the report: the traverse cross-section (the same geometry the traverse screen
 * draws, lib/traverse/drawing.ts), the velocity profile along each traverse line, and the QR code of
 * the verification link, drawn module by module as rectangles so it stays sharp at any zoom. Shapes
 * that recur (the QR code, markers, points) are forms, drawn once per document and placed where needed.
 */
import QRCode from "qrcode";
import { degrees, drawEllipse, drawLine, drawRectangle, drawSvgPath, fill, rectangle, rgb, setFillingRgbColor, type PDFOperator, type PDFPage } from "pdf-lib";
import { crossSectionDrawing } from "@/lib/traverse/drawing";
import { formatQuantity, toDisplay, displayUnit, type UnitSystem } from "@/lib/units";
import type { ReportTraverse } from "./model";
import type { Fonts } from "./fonts";
import { formFor, placeForm } from "./forms";
import { ACCENT, INK, RULE, SOFT } from "./pdf-kit";

/**
 * Draws the QR code of `text` with its top-left corner at (x, yTop), `size` points square (quiet zone
 * included). The code is the same on every page: it is made once per document, as a form
 * (lib/report/forms.ts), since hundreds of copies of its modules would make up most of a long report's
 * drawing operators.
 */
export function drawQr(page: PDFPage, text: string, x: number, yTop: number, size: number): void {
  placeForm(page, formFor(page.doc, `qr ${size} ${text}`, [0, 0, size, size], () => qrOperators(text, size)), x, yTop - size);
}

function qrOperators(text: string, size: number): PDFOperator[] {
  const qr = QRCode.create(text, { errorCorrectionLevel: "M" });
  const n = qr.modules.size;
  // Four modules of quiet zone on every side (ISO/IEC 18004 §5.3.8).
  const cell = size / (n + 8);
  const ops = [setFillingRgbColor(1, 1, 1), rectangle(0, 0, size, size), fill(), setFillingRgbColor(0, 0, 0)];
  for (let r = 0; r < n; r++) {
    let c = 0;
    while (c < n) {
      if (!qr.modules.get(r, c)) {
        c++;
        continue;
      }
      const start = c;
      while (c < n && qr.modules.get(r, c)) c++;
      // A hair of overlap keeps viewers from showing seams between neighbouring modules. Each run is
      // filled on its own, as a plain rectangle, so that viewers snap its edges to the pixel grid.
      ops.push(rectangle((start + 4) * cell, size - (r + 5) * cell, (c - start) * cell + 0.05, cell + 0.05), fill());
    }
  }
  return ops;
}

/** The duct cross-section with its ports, lines and numbered points, fitted into a `box`-point square. */
export function drawCrossSection(page: PDFPage, fonts: Fonts, t: ReportTraverse, x: number, yTop: number, box: number): void {
  const drawing = crossSectionDrawing(t.duct, { lineCount: t.lines, pointsPerLine: t.pointsPerLine, lines: t.layout });
  const [vx, vy, vw, vh] = drawing.viewBox.split(" ").map(Number) as [number, number, number, number];
  const k = box / Math.max(vw, vh);
  const ox = x + (box - vw * k) / 2;
  const oy = yTop - (box - vh * k) / 2;
  const X = (sx: number) => ox + (sx - vx) * k;
  const Y = (sy: number) => oy - (sy - vy) * k;
  const o = drawing.outline;
  if (o.kind === "circle") page.drawCircle({ x: X(o.cx), y: Y(o.cy), size: o.r * k, borderColor: INK, borderWidth: 1.2 });
  else page.drawRectangle({ x: X(o.x), y: Y(o.y + o.h), width: o.w * k, height: o.h * k, borderColor: INK, borderWidth: 1.2 });
  for (const line of drawing.lines) {
    page.drawLine({ start: { x: X(line.x1), y: Y(line.y1) }, end: { x: X(line.x2), y: Y(line.y2) }, thickness: 0.5, color: SOFT, dashArray: [3, 2] });
    page.drawRectangle({ x: X(line.port.x) - 3, y: Y(line.port.y) - 3, width: 6, height: 6, color: ACCENT });
    const label = line.label;
    const w = fonts.bold.width(label, 7.5);
    fonts.bold.draw(page, label, { x: X(line.labelAt.x) - w / 2, y: Y(line.labelAt.y) - 2.7, size: 7.5, color: ACCENT });
  }
  const radius = Math.max(2.2, Math.min(6, drawing.pointRadius * k, (drawing.minSpacing * k) / 2 - 0.5));
  const labelled = radius >= 4;
  for (const p of drawing.points) {
    const cx = X(p.x);
    const cy = Y(p.y);
    // Every point of a traverse is the same circle: one form, placed at each point.
    const point = formFor(page.doc, `point ${radius} ${p.beyondReach}`, [-radius - 1, -radius - 1, radius + 1, radius + 1], () =>
      drawEllipse({ x: 0, y: 0, xScale: radius, yScale: radius, color: rgb(1, 1, 1), borderColor: p.beyondReach ? rgb(0.62, 0.22, 0.1) : INK, borderWidth: 0.7 }),
    );
    placeForm(page, point, cx, cy);
    if (labelled) {
      const label = String(p.point + 1);
      const size = Math.min(6, radius * 1.15);
      const w = fonts.medium.width(label, size);
      fonts.medium.draw(page, label, { x: cx - w / 2, y: cy - size * 0.36, size, color: INK });
    }
  }
}

function niceStep(range: number, ticks: number): number {
  const raw = range / Math.max(1, ticks);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const f = raw / mag;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 2.5 ? 2.5 : f <= 5 ? 5 : 10) * mag;
}

const MARKERS = ["circle", "square", "triangle", "diamond", "cross"] as const;
const DASHES: (number[] | undefined)[] = [undefined, [4, 2], [1.5, 1.5], [6, 2, 1.5, 2], [3, 3]];

/** A marker of `kind` and half-size `s` centred on (x, y): each kind and size is one form, placed at every point. */
function marker(page: PDFPage, kind: (typeof MARKERS)[number], x: number, y: number, s: number) {
  const reach = 2 * s + 1;
  placeForm(page, formFor(page.doc, `marker ${kind} ${s}`, [-reach, -reach, reach, reach], () => markerOperators(kind, s)), x, y);
}

function markerOperators(kind: (typeof MARKERS)[number], s: number): PDFOperator[] {
  const none = degrees(0);
  switch (kind) {
    case "circle":
      return drawEllipse({ x: 0, y: 0, xScale: s, yScale: s, color: INK, borderColor: undefined, borderWidth: 0 });
    case "square":
      return drawRectangle({ x: -s, y: -s, width: 2 * s, height: 2 * s, color: INK, borderColor: undefined, borderWidth: 0, rotate: none, xSkew: none, ySkew: none });
    case "triangle":
      return drawSvgPath(`M 0 ${-s * 1.2} L ${s * 1.1} ${s * 0.8} L ${-s * 1.1} ${s * 0.8} Z`, { x: 0, y: 0, scale: undefined, rotate: none, color: INK, borderColor: undefined, borderWidth: 0 });
    case "diamond":
      return drawSvgPath(`M 0 ${-s * 1.3} L ${s * 1.1} 0 L 0 ${s * 1.3} L ${-s * 1.1} 0 Z`, { x: 0, y: 0, scale: undefined, rotate: none, color: INK, borderColor: undefined, borderWidth: 0 });
    case "cross":
      return [
        ...drawLine({ start: { x: -s, y: -s }, end: { x: s, y: s }, thickness: 1, color: INK }),
        ...drawLine({ start: { x: -s, y: s }, end: { x: s, y: -s }, thickness: 1, color: INK }),
      ];
  }
}

/**
 * Velocity along each traverse line (position from the port wall across, velocity up), one line per
 * traverse line told apart by marker shape and dash, never colour alone; the mean as a dashed rule.
 */
export function drawProfileChart(page: PDFPage, fonts: Fonts, t: ReportTraverse, units: UnitSystem, x: number, yTop: number, width: number, height: number): void {
  const vUnit = displayUnit(units, "velocity");
  const dUnit = displayUnit(units, "dimension");
  const plotLeft = x + 34;
  const plotRight = x + width - 6;
  const plotTop = yTop - 16;
  const plotBottom = yTop - height + 40;
  const pts = t.points.filter((p) => (p.velocityMS ?? p.filledVelocityMS) !== null);
  const v = (p: (typeof pts)[number]) => toDisplay(units, "velocity", (p.velocityMS ?? p.filledVelocityMS)!);
  const pos = (p: (typeof pts)[number]) => toDisplay(units, "dimension", p.readPositionMm);
  const span = toDisplay(units, "dimension", t.duct.shape === "round" ? t.duct.diameterMm : t.duct.heightMm);
  const vmax = Math.max(toDisplay(units, "velocity", t.meanVelocityMS), ...pts.map(v), 0.1);
  const vmin = Math.min(0, ...pts.map(v));
  const yStep = niceStep(vmax - vmin, 5);
  const yLo = Math.floor(vmin / yStep) * yStep;
  const yHi = Math.ceil((vmax * 1.05) / yStep) * yStep;
  const xStep = niceStep(span, 5);
  const X = (d: number) => plotLeft + (d / span) * (plotRight - plotLeft);
  const Y = (val: number) => plotBottom + ((val - yLo) / (yHi - yLo)) * (plotTop - plotBottom);

  fonts.semibold.draw(page, fonts.semibold.fit(`Velocity, ${vUnit.symbol}`), { x, y: yTop - 8, size: 7, color: SOFT });
  for (let val = yLo; val <= yHi + 1e-9; val += yStep) {
    page.drawLine({ start: { x: plotLeft, y: Y(val) }, end: { x: plotRight, y: Y(val) }, thickness: 0.3, color: RULE });
    const label = fonts.regular.fit(new Intl.NumberFormat("en-US", { maximumFractionDigits: yStep < 1 ? 1 : 0 }).format(val));
    fonts.regular.draw(page, label, { x: plotLeft - 4 - fonts.regular.width(label, 6.5), y: Y(val) - 2.2, size: 6.5, color: SOFT });
  }
  for (let d = 0; d <= span + 1e-9; d += xStep) {
    page.drawLine({ start: { x: X(d), y: plotBottom }, end: { x: X(d), y: plotBottom - 3 }, thickness: 0.5, color: INK });
    const label = new Intl.NumberFormat("en-US", { maximumFractionDigits: xStep < 1 ? 1 : 0 }).format(d);
    fonts.regular.draw(page, label, { x: X(d) - fonts.regular.width(label, 6.5) / 2, y: plotBottom - 11, size: 6.5, color: SOFT });
  }
  page.drawLine({ start: { x: plotLeft, y: plotBottom }, end: { x: plotRight, y: plotBottom }, thickness: 0.8, color: INK });
  page.drawLine({ start: { x: plotLeft, y: plotBottom }, end: { x: plotLeft, y: plotTop }, thickness: 0.8, color: INK });
  const xTitle = fonts.semibold.fit(`Distance from the port wall, ${dUnit.symbol}`);
  fonts.semibold.draw(page, xTitle, { x: (plotLeft + plotRight) / 2 - fonts.semibold.width(xTitle, 7) / 2, y: plotBottom - 21, size: 7, color: SOFT });

  const mean = Y(toDisplay(units, "velocity", t.meanVelocityMS));
  page.drawLine({ start: { x: plotLeft, y: mean }, end: { x: plotRight, y: mean }, thickness: 0.8, color: ACCENT, dashArray: [5, 3] });
  // The mean's label goes in the legend, where no reading can sit under it.
  const meanLabel = fonts.medium.fit(`Mean ${formatQuantity(units, "velocity", t.meanVelocityMS)}`);

  const legend: { label: string; kind: (typeof MARKERS)[number]; dash?: number[] }[] = [];
  for (let line = 0; line < t.lines; line++) {
    const own = pts.filter((p) => p.line === line).sort((a, b) => a.readPositionMm - b.readPositionMm);
    const kind = MARKERS[line % MARKERS.length]!;
    const dash = DASHES[Math.floor(line / MARKERS.length) % DASHES.length] ?? DASHES[line % DASHES.length];
    for (let i = 1; i < own.length; i++)
      page.drawLine({ start: { x: X(pos(own[i - 1]!)), y: Y(v(own[i - 1]!)) }, end: { x: X(pos(own[i]!)), y: Y(v(own[i]!)) }, thickness: 0.7, color: INK, dashArray: dash });
    for (const p of own) marker(page, kind, X(pos(p)), Y(v(p)), p.velocityMS === null ? 1.2 : 1.8);
    legend.push({ label: `Line ${line + 1}`, kind, dash });
  }
  let lx = plotLeft;
  let ly = plotBottom - 32;
  let rows = 1;
  page.drawLine({ start: { x: lx, y: ly + 2 }, end: { x: lx + 14, y: ly + 2 }, thickness: 0.8, color: ACCENT, dashArray: [5, 3] });
  fonts.medium.draw(page, meanLabel, { x: lx + 18, y: ly, size: 6.5, color: ACCENT });
  lx += 24 + fonts.medium.width(meanLabel, 6.5);
  for (const [i, item] of legend.entries()) {
    const w = 26 + fonts.regular.width(item.label, 6.5);
    if (lx + w > plotRight) {
      // Two legend rows at most: shapes repeat every five lines, so more rows add nothing to read.
      if (rows === 2) {
        fonts.regular.draw(page, `and ${legend.length - i} more lines`, { x: lx, y: ly, size: 6.5, color: SOFT });
        break;
      }
      rows++;
      lx = plotLeft;
      ly -= 9;
    }
    page.drawLine({ start: { x: lx, y: ly + 2 }, end: { x: lx + 14, y: ly + 2 }, thickness: 0.7, color: INK, dashArray: item.dash });
    marker(page, item.kind, lx + 7, ly + 2, 1.8);
    fonts.regular.draw(page, item.label, { x: lx + 18, y: ly, size: 6.5, color: INK });
    lx += w + 6;
  }
}
