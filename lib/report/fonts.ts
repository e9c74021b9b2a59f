/**
 * The report's fonts: Barlow in four weights, embedded as subsets, each wrapped in a `ReportFont` that
 * measures, encodes and draws text and keeps what it has worked out for the document's life.
 */
import fs from "node:fs";
import path from "node:path";
import fontkit from "@pdf-lib/fontkit";
import { degrees, drawText, type PDFDocument, type PDFFont, type PDFHexString, type PDFName, type PDFPage, type RGB } from "pdf-lib";
import { sfntFromWoff } from "./woff";

// Characters outside the font's latin subset, spelled with ones it has.
const SUBSTITUTES: Record<string, string> = {
  "≤": "<=",
  "≥": ">=",
  "→": "->",
  "←": "<-",
  "≈": "~",
  "√": "sqrt",
  "✓": "yes",
  "✗": "no",
  "Δ": "delta ",
  "ρ": "rho",
  "•": "·",
  "\t": " ",
};

export interface DrawTextOptions {
  x: number;
  y: number;
  size: number;
  color: RGB;
}

/**
 * One embedded font and its memo. Each width measurement and each drawn string would otherwise shape
 * the text with fontkit (substitutions, ligatures), which is most of a report's build time: wrapping
 * measures the same words and lines again and again, and headers, labels and units repeat on every
 * page. A text's width is its width at size 1 times the size, and its encoding (the glyphs, added to
 * the subset the first time) does not change, so both are kept per text.
 */
export class ReportFont {
  private readonly unitWidths = new Map<string, number>();
  private readonly encodings = new Map<string, PDFHexString>();
  /** The name each page's resources know this font by: one entry per page, however often it is used. */
  private readonly pageKeys = new WeakMap<PDFPage, PDFName>();
  private characters: Set<number> | undefined;

  constructor(readonly embedded: PDFFont) {}

  /** Width of `text` in points at `size`. */
  width(text: string, size: number): number {
    let unit = this.unitWidths.get(text);
    if (unit === undefined) {
      unit = this.embedded.widthOfTextAtSize(text, 1);
      this.unitWidths.set(text, unit);
    }
    return unit * size;
  }

  /** The text as glyph ids of the embedded subset. */
  encode(text: string): PDFHexString {
    let hex = this.encodings.get(text);
    if (hex === undefined) {
      hex = this.embedded.encodeText(text);
      this.encodings.set(text, hex);
    }
    return hex;
  }

  /** The text with every character the font cannot draw replaced (substitute, else "?"); line breaks become spaces. */
  fit(text: string): string {
    this.characters ??= new Set(this.embedded.getCharacterSet());
    let out = "";
    for (const ch of text.replace(/[\r\n]+/g, " ")) {
      if (this.characters.has(ch.codePointAt(0)!)) out += ch;
      else if (SUBSTITUTES[ch] !== undefined) out += SUBSTITUTES[ch];
      else out += "?";
    }
    return out;
  }

  /** Draws one line of text with its baseline starting at (x, y). */
  draw(page: PDFPage, text: string, options: DrawTextOptions): void {
    let key = this.pageKeys.get(page);
    if (key === undefined) {
      key = page.node.newFontDictionary(this.embedded.name, this.embedded.ref);
      this.pageKeys.set(page, key);
    }
    const none = degrees(0);
    page.pushOperators(...drawText(this.encode(text), { ...options, font: key, rotate: none, xSkew: none, ySkew: none }));
  }
}

export interface Fonts {
  regular: ReportFont;
  medium: ReportFont;
  semibold: ReportFont;
  bold: ReportFont;
}
export type Weight = keyof Fonts;

// Fontsource's latin .woff files embed and subset cleanly through fontkit (their .woff2 do not).
// Literal path segments keep the bundler from tracing the whole folder.
function fontFile(weight: Weight): Buffer {
  const dir = path.join(process.cwd(), "fonts");
  switch (weight) {
    case "regular":
      return fs.readFileSync(path.join(dir, "barlow-latin-400-normal.woff"));
    case "medium":
      return fs.readFileSync(path.join(dir, "barlow-latin-500-normal.woff"));
    case "semibold":
      return fs.readFileSync(path.join(dir, "barlow-latin-600-normal.woff"));
    case "bold":
      return fs.readFileSync(path.join(dir, "barlow-latin-700-normal.woff"));
  }
}

/** Each weight's font unpacked from its .woff, read once per process (fontkit and pdf-lib only read it). */
const unpacked = new Map<Weight, Uint8Array>();
function fontBytes(weight: Weight): Uint8Array {
  let bytes = unpacked.get(weight);
  if (bytes === undefined) {
    bytes = sfntFromWoff(fontFile(weight));
    unpacked.set(weight, bytes);
  }
  return bytes;
}

/**
 * pdf-lib writes each text as its glyphs with their nominal advances and measures it the same way: it
 * uses the substitutions of shaping (ligatures) but never the glyph positions (kerning, mark placement).
 * Switching the positioning features off spares fontkit that half of the work and changes no glyph,
 * width or byte of the report.
 */
const UNUSED_POSITIONING = { kern: false, mark: false, mkmk: false };

export async function embedFonts(doc: PDFDocument): Promise<Fonts> {
  doc.registerFontkit(fontkit);
  const [regular, medium, semibold, bold] = await Promise.all(
    (["regular", "medium", "semibold", "bold"] as const).map(
      async (w) => new ReportFont(await doc.embedFont(fontBytes(w), { subset: true, features: UNUSED_POSITIONING })),
    ),
  );
  return { regular: regular!, medium: medium!, semibold: semibold!, bold: bold! };
}
