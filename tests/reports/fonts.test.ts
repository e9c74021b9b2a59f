import fs from "node:fs";
import path from "node:path";
import fontkit from "@pdf-lib/fontkit";
import fc from "fast-check";
import { PDFDocument, type PDFFont } from "pdf-lib";
import { beforeAll, describe, expect, it } from "vitest";
import { embedFonts, type Fonts, type Weight } from "@/lib/report/fonts";
import { shapesWordByWord, type ShapedFont } from "@/lib/report/shaping";

const WEIGHTS: [Weight, string][] = [
  ["regular", "400"],
  ["medium", "500"],
  ["semibold", "600"],
  ["bold", "700"],
];

// Words that shaping changes (ligatures fi, fl, ffi, ffl, IJ, ij, gj and "--"; i and j before a combining
// accent; a soft hyphen, which fontkit draws as a space glyph), and the report's kind of words and numbers.
const VOCABULARY = ["office", "fluff", "affluent", "IJssel", "bijou", "fjord", "--", "a--b", "i\u0301", "j\u0308x", "co\u00ADop", "1,412", "0.121", "(101", "%)", "±10 %", "—", "L/s", "in.", "w.c.", "½", "Tchebycheff", "Traverse", "AHU-1", "S1.1", "’quoted’", "fi", "f", "i"];

/**
 * The report's fonts against pdf-lib reading the same .woff files the way it did before the report
 * learnt any shortcut: whole texts shaped by fontkit with its default features.
 */
let report: Fonts;
const reference = {} as Record<Weight, PDFFont>;
let charset: string[];

beforeAll(async () => {
  report = await embedFonts(await PDFDocument.create());
  const doc = await PDFDocument.create();
  doc.registerFontkit(fontkit);
  for (const [weight, file] of WEIGHTS) reference[weight] = await doc.embedFont(fs.readFileSync(path.join(process.cwd(), "fonts", `barlow-latin-${file}-normal.woff`)), { subset: true });
  charset = reference.regular.getCharacterSet().map((cp) => String.fromCodePoint(cp));
});

describe("the report's fonts", () => {
  it("shape word by word, every weight (the shortcut is in use)", () => {
    for (const [weight] of WEIGHTS) expect(report[weight].wordByWord, weight).toBe(true);
  });

  it("measure and encode every text exactly as pdf-lib does, glyph for glyph and in the same subset order", () => {
    const word = fc.oneof(fc.constantFrom(...VOCABULARY), fc.array(fc.constantFrom(...charset), { minLength: 1, maxLength: 7 }).map((cs) => cs.join("")));
    const text = fc
      .tuple(fc.constantFrom("", " "), fc.array(fc.tuple(word, fc.constantFrom(" ", "  ")), { minLength: 1, maxLength: 12 }), fc.constantFrom("", " "))
      .map(([lead, parts, trail]) => lead + parts.map(([w, gap]) => w + gap).join("").trimEnd() + trail);
    fc.assert(
      fc.property(text, (t) => {
        for (const [weight] of WEIGHTS) {
          // At size 1: a size scales the size-1 width, as it always has.
          expect(report[weight].width(t, 1), `${weight} width of ${JSON.stringify(t)}`).toBe(reference[weight].widthOfTextAtSize(t, 1));
          expect(report[weight].encode(t).asString(), `${weight} glyphs of ${JSON.stringify(t)}`).toBe(reference[weight].encodeText(t).asString());
        }
      }),
      { numRuns: 400 },
    );
  });
});

/** A font whose substitution tables are made up for the check: one lookup under the features of each script. */
function madeUpFont(options: { lookup?: object; scripts?: { tag: string; lookups: number[] }[]; spaceClass?: number; morx?: boolean } = {}): ShapedFont {
  const SPACE = 3;
  const lookup = options.lookup ?? { lookupType: 4, flags: { flags: { ignoreBaseGlyphs: false } }, subTables: [ligature([10, 11], [[12]])] };
  const scripts = options.scripts ?? [
    { tag: "DFLT", lookups: [0] },
    { tag: "latn", lookups: [0] },
  ];
  return {
    glyphForCodePoint: (cp: number) => ({ id: cp === 0x20 ? SPACE : cp }),
    ...(options.morx ? { morx: {} } : {}),
    GDEF: { glyphClassDef: { version: 2, classRangeRecord: [{ start: SPACE, end: SPACE, class: options.spaceClass ?? 1 }] } },
    GSUB: {
      scriptList: scripts.map((s, i) => ({ tag: s.tag, script: { defaultLangSys: { reqFeatureIndex: 0xffff, featureIndexes: [i] } } })),
      featureList: scripts.map((s) => ({ tag: "liga", feature: { lookupListIndexes: s.lookups } })),
      lookupList: [lookup, { lookupType: 1, flags: { flags: { ignoreBaseGlyphs: false } }, subTables: [{ version: 1, coverage: { version: 1, glyphs: [40] }, deltaGlyphID: 1 }] }],
    },
  } as unknown as ShapedFont;
}
function ligature(first: number[], rest: number[][]) {
  return { substFormat: 1, coverage: { version: 1, glyphs: first }, ligatureSets: first.map(() => rest.map((components) => ({ glyph: 99, components }))) };
}
const plain = (subTables: object[], lookupType = 4, ignoreBaseGlyphs = false) => ({ lookupType, flags: { flags: { ignoreBaseGlyphs } }, subTables });

describe("telling whether a font shapes word by word", () => {
  it("says yes for substitutions that never touch the space", () => {
    expect(shapesWordByWord(madeUpFont())).toBe(true);
    expect(shapesWordByWord(madeUpFont({ lookup: plain([{ version: 3, backtrackCoverage: [], inputCoverage: [{ version: 2, rangeRecords: [{ start: 10, end: 20 }] }], lookaheadCoverage: [{ version: 1, glyphs: [30] }] }], 6) }))).toBe(true);
  });

  it("says no when a substitution starts at, reads or matches the space, or could step over it", () => {
    expect(shapesWordByWord(madeUpFont({ lookup: plain([ligature([3], [[10]])]) }))).toBe(false);
    expect(shapesWordByWord(madeUpFont({ lookup: plain([ligature([10], [[3, 11]])]) }))).toBe(false);
    expect(shapesWordByWord(madeUpFont({ lookup: plain([{ version: 3, backtrackCoverage: [], inputCoverage: [{ version: 1, glyphs: [10] }], lookaheadCoverage: [{ version: 2, rangeRecords: [{ start: 1, end: 5 }] }] }], 6) }))).toBe(false);
    expect(shapesWordByWord(madeUpFont({ lookup: plain([{ version: 1, coverage: { version: 1, glyphs: [3] }, deltaGlyphID: 1 }], 1) }))).toBe(false);
    // Class-based contexts are not read: no.
    expect(shapesWordByWord(madeUpFont({ lookup: plain([{ version: 2, coverage: { version: 1, glyphs: [10] } }], 6) }))).toBe(false);
    expect(shapesWordByWord(madeUpFont({ lookup: plain([ligature([10], [[11]])], 4, true) }))).toBe(false);
    expect(shapesWordByWord(madeUpFont({ spaceClass: 3 }))).toBe(false);
  });

  it("says no when scripts shape differently, for a script it does not know, and for AAT fonts", () => {
    expect(shapesWordByWord(madeUpFont({ scripts: [{ tag: "DFLT", lookups: [0] }, { tag: "latn", lookups: [0, 1] }] }))).toBe(false);
    expect(shapesWordByWord(madeUpFont({ scripts: [{ tag: "latn", lookups: [0] }, { tag: "grek", lookups: [0] }] }))).toBe(false);
    expect(shapesWordByWord(madeUpFont({ morx: true }))).toBe(false);
  });
});
