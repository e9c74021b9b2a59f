/**
 * A small page-flow layer over pdf-lib for the closeout report, in its fonts (lib/report/fonts.ts):
 * wrapped text, paginating tables whose header repeats, and a cursor that starts a new page before
 * anything would cross the bottom margin. Every wrapped string goes through the font's `fit`, so a
 * character the embedded font lacks is written in plain letters instead of an empty box.
 */
import zlib from "node:zlib";
import { PDFArray, PDFContentStream, PDFName, PDFRawStream, PDFRef, rgb, type PDFDocument, type PDFPage, type RGB } from "pdf-lib";
import type { Fonts, ReportFont, Weight } from "./fonts";

export const INK = rgb(0.11, 0.14, 0.19);
export const SOFT = rgb(0.36, 0.4, 0.45);
export const RULE = rgb(0.78, 0.8, 0.83);
export const FAINT = rgb(0.95, 0.96, 0.97);
/** The one accent, for headings and the marks that matter. */
export const ACCENT = rgb(0.05, 0.38, 0.4);
export const WARN = rgb(0.62, 0.22, 0.1);

/**
 * Compresses every page's drawing operators with Node's zlib instead of leaving them to pdf-lib, whose
 * JavaScript deflate was most of the time a long report took to save. The same Flate compression at the
 * same (default) level: the pages draw exactly as before. Call it once all drawing is done, just before saving.
 */
export function deflatePageContents(doc: PDFDocument): void {
  const { context } = doc;
  for (const page of doc.getPages()) {
    const contents = page.node.Contents();
    const refs = contents instanceof PDFArray ? contents.asArray() : [];
    for (const ref of refs) {
      if (!(ref instanceof PDFRef)) continue;
      const stream = context.lookup(ref);
      if (!(stream instanceof PDFContentStream)) continue;
      const deflated = zlib.deflateSync(stream.getUnencodedContents());
      context.assign(ref, PDFRawStream.of(context.obj({ Filter: PDFName.of("FlateDecode") }), new Uint8Array(deflated.buffer, deflated.byteOffset, deflated.byteLength)));
    }
  }
}

/** Breaks text into lines no wider than `width` (long words are cut where they must be). */
export function wrap(font: ReportFont, size: number, text: string, width: number): string[] {
  const lines: string[] = [];
  for (const para of text.split(/\n/)) {
    const words = font.fit(para).split(/ +/).filter((w) => w !== "");
    let line = "";
    for (let word of words) {
      const candidate = line ? `${line} ${word}` : word;
      if (font.width(candidate, size) <= width) {
        line = candidate;
        continue;
      }
      if (line) lines.push(line);
      line = "";
      while (font.width(word, size) > width && word.length > 1) {
        let cut = word.length - 1;
        while (cut > 1 && font.width(word.slice(0, cut), size) > width) cut--;
        lines.push(word.slice(0, cut));
        word = word.slice(cut);
      }
      line = word;
    }
    lines.push(line);
  }
  return lines.length > 0 ? lines : [""];
}

export interface PageGeometry {
  width: number;
  height: number;
  left: number;
  right: number;
  /** The content area runs from `top` down to `bottom` (PDF y grows upwards). */
  top: number;
  bottom: number;
}

export function geometryFor(units: "SI" | "IP"): PageGeometry {
  // ISO A4 for metric projects, US Letter for inch-pound ones: the paper the owner files them on.
  const [width, height] = units === "IP" ? [612, 792] : [595.28, 841.89];
  return { width, height, left: 50, right: width - 50, top: height - 74, bottom: 84 };
}

export interface TextOptions {
  size?: number;
  weight?: Weight;
  color?: RGB;
  /** Wrap width; default: to the right margin. */
  width?: number;
  x?: number;
  lineGap?: number;
  align?: "left" | "right" | "center";
}

export interface TableColumn {
  header: string;
  /** Share of the table width. */
  width: number;
  align?: "left" | "right" | "center";
}

export type Cell = string | { text: string; weight?: Weight; color?: RGB };

/** The page flow: pages are added as content needs them, and `pages` keeps them in order. */
export class Flow {
  page!: PDFPage;
  y = 0;
  readonly pages: PDFPage[] = [];

  constructor(
    readonly doc: PDFDocument,
    readonly fonts: Fonts,
    readonly geo: PageGeometry,
  ) {}

  get contentWidth(): number {
    return this.geo.right - this.geo.left;
  }

  newPage(): PDFPage {
    this.page = this.doc.addPage([this.geo.width, this.geo.height]);
    this.pages.push(this.page);
    this.y = this.geo.top;
    return this.page;
  }

  /** 1-based number of the current page. */
  get pageNumber(): number {
    return this.pages.length;
  }

  /** Starts a new page unless `height` still fits above the bottom margin. */
  ensure(height: number): void {
    if (this.y - height < this.geo.bottom) this.newPage();
  }

  space(height: number): void {
    this.y -= height;
    if (this.y < this.geo.bottom) this.newPage();
  }

  lineHeight(size: number, gap = 0.32): number {
    return size * (1 + gap);
  }

  /** Wrapped text at the cursor; breaks across pages line by line. Returns the height used. */
  text(text: string, options: TextOptions = {}): number {
    const size = options.size ?? 9.5;
    const font = this.fonts[options.weight ?? "regular"];
    const x = options.x ?? this.geo.left;
    const width = options.width ?? this.geo.right - x;
    const lh = this.lineHeight(size, options.lineGap);
    let used = 0;
    for (const line of wrap(font, size, text, width)) {
      this.ensure(lh);
      const w = font.width(line, size);
      const dx = options.align === "right" ? width - w : options.align === "center" ? (width - w) / 2 : 0;
      font.draw(this.page, line, { x: x + dx, y: this.y - size, size, color: options.color ?? INK });
      this.y -= lh;
      used += lh;
    }
    return used;
  }

  /** A heading kept with at least `keep` points of what follows it. */
  heading(text: string, level: 1 | 2 | 3 = 1, keep = 60): void {
    const size = level === 1 ? 17 : level === 2 ? 12.5 : 10.5;
    const before = level === 1 ? 0 : level === 2 ? 12 : 8;
    if (this.y < this.geo.top - 1) this.y -= before;
    this.ensure(size * 1.4 + keep);
    this.text(text, { size, weight: level === 3 ? "semibold" : "bold", color: level === 1 ? ACCENT : INK });
    if (level === 1) {
      this.page.drawLine({ start: { x: this.geo.left, y: this.y + 2 }, end: { x: this.geo.right, y: this.y + 2 }, thickness: 0.8, color: ACCENT });
      this.y -= 10;
    } else this.y -= 3;
  }

  /** Label / value pairs in `columns` columns, each value wrapped in its cell. */
  facts(pairs: readonly [string, string][], columns = 2, size = 9): void {
    const gap = 14;
    const colWidth = (this.contentWidth - gap * (columns - 1)) / columns;
    const labelWidth = Math.min(120, colWidth * 0.42);
    const lh = this.lineHeight(size);
    for (let i = 0; i < pairs.length; i += columns) {
      const row = pairs.slice(i, i + columns);
      const heights = row.map(([label, value]) =>
        Math.max(wrap(this.fonts.medium, size, label, labelWidth - 4).length, wrap(this.fonts.regular, size, value, colWidth - labelWidth).length),
      );
      const h = Math.max(...heights) * lh + 3;
      this.ensure(h);
      row.forEach(([label, value], c) => {
        const x = this.geo.left + c * (colWidth + gap);
        wrap(this.fonts.medium, size, label, labelWidth - 4).forEach((line, k) =>
          this.fonts.medium.draw(this.page, line, { x, y: this.y - size - k * lh, size, color: SOFT }),
        );
        wrap(this.fonts.regular, size, value, colWidth - labelWidth).forEach((line, k) =>
          this.fonts.regular.draw(this.page, line, { x: x + labelWidth, y: this.y - size - k * lh, size, color: INK }),
        );
      });
      this.y -= h;
    }
  }

  /**
   * A table across the content width. Rows wrap inside their cells; a row that would cross the bottom
   * margin moves to a new page under a repeated header. A row taller than a page is cut into parts.
   */
  table(columns: readonly TableColumn[], rows: readonly Cell[][], options: { size?: number; x?: number; width?: number; zebra?: boolean } = {}): void {
    const size = options.size ?? 8.2;
    const x0 = options.x ?? this.geo.left;
    const total = options.width ?? this.geo.right - x0;
    const share = columns.reduce((a, c) => a + c.width, 0);
    const widths = columns.map((c) => (c.width / share) * total);
    const pad = 3;
    const lh = this.lineHeight(size, 0.25);
    const cellLines = (cells: readonly Cell[], weight: Weight) =>
      cells.map((cell, i) => {
        const t = typeof cell === "string" ? cell : cell.text;
        const w = typeof cell === "string" ? weight : (cell.weight ?? weight);
        return wrap(this.fonts[w], size, t, widths[i]! - 2 * pad);
      });
    const drawRow = (cells: readonly Cell[], lines: string[][], weight: Weight, fill: RGB | null, from = 0, count = Infinity) => {
      const n = Math.min(count, Math.max(...lines.map((l) => l.length)) - from);
      const h = n * lh + 2 * pad;
      if (fill) this.page.drawRectangle({ x: x0, y: this.y - h, width: total, height: h, color: fill });
      let x = x0;
      cells.forEach((cell, i) => {
        const font = this.fonts[typeof cell === "string" ? weight : (cell.weight ?? weight)];
        const color = typeof cell === "string" ? INK : (cell.color ?? INK);
        const align = columns[i]!.align ?? "left";
        lines[i]!.slice(from, from + n).forEach((line, k) => {
          const w = font.width(line, size);
          const dx = align === "right" ? widths[i]! - pad - w : align === "center" ? (widths[i]! - w) / 2 : pad;
          font.draw(this.page, line, { x: x + dx, y: this.y - pad - size * 0.92 - k * lh, size, color });
        });
        x += widths[i]!;
      });
      this.y -= h;
      return n;
    };
    const header = columns.map((c) => c.header);
    const headerLines = cellLines(header, "semibold");
    const headerHeight = Math.max(...headerLines.map((l) => l.length)) * lh + 2 * pad;
    const drawHeader = () => {
      drawRow(header, headerLines, "semibold", FAINT);
      this.page.drawLine({ start: { x: x0, y: this.y }, end: { x: x0 + total, y: this.y }, thickness: 0.7, color: INK });
    };
    this.ensure(headerHeight + lh + 2 * pad);
    drawHeader();
    rows.forEach((row, r) => {
      const lines = cellLines(row, "regular");
      const rowLines = Math.max(...lines.map((l) => l.length));
      let from = 0;
      while (from < rowLines) {
        const room = Math.floor((this.y - this.geo.bottom - 2 * pad) / lh);
        const remaining = rowLines - from;
        const pageRoom = Math.floor((this.geo.top - this.geo.bottom - headerHeight - 2 * pad) / lh);
        // Move the row to a fresh page when it fits there whole; cut it only when it is longer than a page.
        if (remaining > room && (room < 1 || remaining <= pageRoom)) {
          this.newPage();
          drawHeader();
          continue;
        }
        from += drawRow(row, lines, "regular", options.zebra !== false && r % 2 === 1 ? FAINT : null, from, Math.min(remaining, room));
        this.page.drawLine({ start: { x: x0, y: this.y }, end: { x: x0 + total, y: this.y }, thickness: 0.3, color: RULE });
      }
    });
    this.y -= 6;
  }

  /** A framed note (cautions, statements), wrapped; moves whole to the next page when it fits there. */
  box(title: string, paragraphs: readonly string[], options: { color?: RGB; size?: number } = {}): void {
    const size = options.size ?? 9.2;
    const inner = this.contentWidth - 20;
    const lh = this.lineHeight(size);
    const titleLines = title ? wrap(this.fonts.bold, size + 1, title, inner) : [];
    const bodyLines = paragraphs.map((p) => wrap(this.fonts.regular, size, p, inner));
    const height = titleLines.length * lh * 1.1 + bodyLines.reduce((a, l) => a + l.length * lh + 4, 0) + 16;
    if (height <= this.geo.top - this.geo.bottom) this.ensure(height);
    const color = options.color ?? ACCENT;
    if (this.y - height >= this.geo.bottom) {
      this.page.drawRectangle({ x: this.geo.left, y: this.y - height, width: this.contentWidth, height, borderColor: color, borderWidth: 1, color: FAINT });
      this.page.drawRectangle({ x: this.geo.left, y: this.y - height, width: 4, height, color });
    }
    this.y -= 8;
    for (const line of titleLines) {
      this.ensure(lh);
      this.fonts.bold.draw(this.page, line, { x: this.geo.left + 12, y: this.y - size - 1, size: size + 1, color });
      this.y -= lh * 1.1;
    }
    for (const lines of bodyLines) {
      for (const line of lines) {
        this.ensure(lh);
        this.fonts.regular.draw(this.page, line, { x: this.geo.left + 12, y: this.y - size, size, color: INK });
        this.y -= lh;
      }
      this.y -= 4;
    }
    this.y -= 12;
  }
}
