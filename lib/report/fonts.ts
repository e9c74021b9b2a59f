/**
 * The report's fonts: Barlow in four weights, embedded as subsets, each wrapped in a `ReportFont` that
 * measures, encodes and draws text and keeps what it has worked out for the document's life.
 */
import fs from "node:fs";
import path from "node:path";
import fontkit from "@pdf-lib/fontkit";
import {
  beginText,
  endText,
  PDFHexString,
  PDFNumber,
  popGraphicsState,
  pushGraphicsState,
  setFillingColor,
  setFontAndSize,
  setTextMatrix,
  showText,
  type PDFDocument,
  type PDFFont,
  type PDFName,
  type PDFOperator,
  type PDFPage,
  type RGB,
} from "pdf-lib";
import { shapesWordByWord } from "./shaping";
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
 * the subset the first time) does not change, so both are kept per text. Where the font shapes word
 * by word (lib/report/shaping.ts), a text with spaces is measured and encoded from its words, so each
 * distinct word is shaped once rather than each distinct line.
 */
export class ReportFont {
  private readonly unitWidths = new Map<string, number>();
  /** Total advance of a space-free text in font units (1/1000 em), shaped on its own. */
  private readonly wordUnits = new Map<string, number>();
  private readonly encodings = new Map<string, PDFHexString>();
  /**
   * The name each page's resources know this font by (one entry per page, however often it is used),
   * and its font-and-size operators.
   */
  private readonly pages = new WeakMap<PDFPage, { key: PDFName; sizes: Map<number, PDFOperator> }>();
  private characters: Set<number> | undefined;

  /** `wordByWord`: the font shapes a text as its words shaped apart (see lib/report/shaping.ts). */
  constructor(
    readonly embedded: PDFFont,
    readonly wordByWord = false,
  ) {}

  /** Width of `text` in points at `size`. */
  width(text: string, size: number): number {
    let unit = this.unitWidths.get(text);
    if (unit === undefined) {
      const units = this.wordByWord ? this.unitsOfWords(text) : null;
      // pdf-lib's width at size s is its total of glyph advances in font units times s / 1000.
      unit = units === null ? this.embedded.widthOfTextAtSize(text, 1) : units * (1 / 1000);
      this.unitWidths.set(text, unit);
    }
    return unit * size;
  }

  /**
   * A text's total of glyph advances in font units (1/1000 em), from its words' and spaces' totals; null
   * when a total of several words is not a whole number (then the sum could round differently from
   * pdf-lib's own addition: advances are whole units when the font's em is 1000 units, as Barlow's is).
   */
  private unitsOfWords(text: string): number | null {
    const words = text.split(" ");
    if (words.length === 1) return this.unitsOf(text);
    let total = this.unitsOf(" ") * (words.length - 1);
    if (!Number.isInteger(total)) return null;
    for (const word of words) {
      const units = this.unitsOf(word);
      if (!Number.isInteger(units)) return null;
      total += units;
    }
    return total;
  }

  /** pdf-lib's total of glyph advances for a text shaped on its own: its width at size 1000. */
  private unitsOf(word: string): number {
    let units = this.wordUnits.get(word);
    if (units === undefined) {
      units = this.embedded.widthOfTextAtSize(word, 1000);
      this.wordUnits.set(word, units);
    }
    return units;
  }

  /** The text as glyph ids of the embedded subset. */
  encode(text: string): PDFHexString {
    let hex = this.encodings.get(text);
    if (hex === undefined) {
      hex = this.wordByWord && text !== " " && text.includes(" ") ? this.encodeWords(text) : this.embedded.encodeText(text);
      this.encodings.set(text, hex);
    }
    return hex;
  }

  /** Word by word in reading order, so that glyphs join the subset in the order the whole text would add them. */
  private encodeWords(text: string): PDFHexString {
    let hex = "";
    text.split(" ").forEach((word, i) => {
      if (i > 0) hex += this.encode(" ").asString();
      if (word) hex += this.encode(word).asString();
    });
    return PDFHexString.of(hex);
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

  /**
   * Draws one line of text with its baseline starting at (x, y): the operators pdf-lib's own drawText
   * writes for an unturned line, with the colour and the font-and-size operator made once and reused,
   * so that only the position is new for each line.
   */
  draw(page: PDFPage, text: string, options: DrawTextOptions): void {
    let onPage = this.pages.get(page);
    if (onPage === undefined) {
      onPage = { key: page.node.newFontDictionary(this.embedded.name, this.embedded.ref), sizes: new Map() };
      this.pages.set(page, onPage);
    }
    let fontAndSize = onPage.sizes.get(options.size);
    if (fontAndSize === undefined) {
      fontAndSize = setFontAndSize(onPage.key, options.size);
      onPage.sizes.set(options.size, fontAndSize);
    }
    page.pushOperators(
      PUSH,
      BEGIN_TEXT,
      fillColour(options.color),
      fontAndSize,
      setTextMatrix(ONE, ZERO, ZERO, ONE, options.x, options.y),
      showText(this.encode(text)),
      END_TEXT,
      POP,
    );
  }
}

const PUSH = pushGraphicsState();
const POP = popGraphicsState();
const BEGIN_TEXT = beginText();
const END_TEXT = endText();
const ZERO = PDFNumber.of(0);
const ONE = PDFNumber.of(1);
const fillColours = new WeakMap<RGB, PDFOperator>();
function fillColour(colour: RGB): PDFOperator {
  let op = fillColours.get(colour);
  if (op === undefined) {
    op = setFillingColor(colour);
    fillColours.set(colour, op);
  }
  return op;
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

/**
 * Each weight's font unpacked from its .woff, and whether it shapes word by word: worked out once per
 * process (fontkit and pdf-lib only read the bytes).
 */
const prepared = new Map<Weight, { bytes: Uint8Array; wordByWord: boolean }>();
function preparedFont(weight: Weight): { bytes: Uint8Array; wordByWord: boolean } {
  let font = prepared.get(weight);
  if (font === undefined) {
    const bytes = sfntFromWoff(fontFile(weight));
    font = { bytes, wordByWord: shapesWordByWord(fontkit.create(bytes)) };
    prepared.set(weight, font);
  }
  return font;
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
    (["regular", "medium", "semibold", "bold"] as const).map(async (w) => {
      const { bytes, wordByWord } = preparedFont(w);
      return new ReportFont(await doc.embedFont(bytes, { subset: true, features: UNUSED_POSITIONING }), wordByWord);
    }),
  );
  return { regular: regular!, medium: medium!, semibold: semibold!, bold: bold! };
}
