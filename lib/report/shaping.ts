/**
 * Whether a font shapes a text as its words shaped apart and joined by spaces. pdf-lib writes and
 * measures a text as the glyphs fontkit's substitutions (GSUB: ligatures, contextual forms) give, at
 * their nominal advances. When no substitution can read, match across or replace the space glyph,
 * each word comes out of shaping the same inside a line as alone; and when every script of the font
 * uses the same lookups, a word of digits alone (which fontkit shapes under the default script) comes
 * out as it does in a sentence of Latin words. Then a line is its words' glyphs and spaces, and its
 * width their sum: the report shapes each distinct word once instead of each distinct line.
 *
 * Conservative: a table form not checked here, a lookup that skips base glyphs (which could step over
 * a space), a space classed as a mark or ligature, or anything unexpected in the parsed tables all
 * answer no, and the text is then shaped whole.
 */

interface Coverage {
  version: number;
  glyphs?: ArrayLike<number>;
  rangeRecords?: ArrayLike<{ start: number; end: number }>;
}

interface ClassDef {
  version: number;
  startGlyph?: number;
  classValueArray?: ArrayLike<number>;
  classRangeRecord?: ArrayLike<{ start: number; end: number; class: number }>;
}

interface SubTable {
  version?: number;
  coverage?: Coverage;
  ligatureSets?: unknown;
  backtrackCoverage?: unknown;
  inputCoverage?: unknown;
  lookaheadCoverage?: unknown;
  coverages?: unknown;
  lookupType?: number;
  extension?: SubTable;
}

interface Lookup {
  lookupType: number;
  flags: { flags: { ignoreBaseGlyphs: boolean } };
  subTables: unknown;
}

interface LangSys {
  reqFeatureIndex: number;
  featureIndexes: ArrayLike<number>;
}

interface LayoutTables {
  morx?: unknown;
  GDEF?: { glyphClassDef?: ClassDef };
  GSUB?: {
    scriptList: ArrayLike<{ tag: string; script: { defaultLangSys?: LangSys } }>;
    featureList: ArrayLike<{ tag: string; feature: { lookupListIndexes: ArrayLike<number> } }>;
    lookupList: unknown;
  };
}

export interface ShapedFont {
  glyphForCodePoint(codePoint: number): { id: number };
}

/** A parsed array (plain or lazy) as a plain one; null when it is neither. */
function list<T>(value: unknown): T[] | null {
  if (Array.isArray(value)) return value as T[];
  if (value && typeof (value as { toArray?: unknown }).toArray === "function") return (value as { toArray(): T[] }).toArray();
  return null;
}

function covers(coverage: Coverage | undefined, glyph: number): boolean | null {
  if (coverage?.version === 1 && coverage.glyphs) return Array.from(coverage.glyphs).includes(glyph);
  if (coverage?.version === 2 && coverage.rangeRecords) return Array.from(coverage.rangeRecords).some((r) => r.start <= glyph && glyph <= r.end);
  return null;
}

function classOf(def: ClassDef | undefined, glyph: number): number | null {
  if (!def) return 0;
  if (def.version === 1 && def.classValueArray && def.startGlyph !== undefined) return def.classValueArray[glyph - def.startGlyph] ?? 0;
  if (def.version === 2 && def.classRangeRecord) return Array.from(def.classRangeRecord).find((r) => r.start <= glyph && glyph <= r.end)?.class ?? 0;
  return null;
}

/** Whether the subtable leaves the glyph alone wherever it stands (null: a form not checked here). */
function ignores(type: number, sub: SubTable, glyph: number): boolean | null {
  const none = (coverages: (Coverage | undefined)[] | null) => {
    if (coverages === null) return null;
    for (const c of coverages) {
      const hit = covers(c, glyph);
      if (hit !== false) return hit === null ? null : false;
    }
    return true;
  };
  switch (type) {
    case 1: // single, multiple and alternate substitutions change only the glyph they cover
    case 2:
    case 3:
      return none([sub.coverage]);
    case 4: {
      // ligatures: the glyph may neither start one nor be one of its later components
      const first = none([sub.coverage]);
      if (first !== true) return first;
      const sets = list<unknown>(sub.ligatureSets);
      if (sets === null) return null;
      for (const set of sets) {
        const ligatures = list<{ components: unknown }>(set);
        if (ligatures === null) return null;
        for (const ligature of ligatures) {
          const components = list<number>(ligature.components);
          if (components === null) return null;
          if (components.includes(glyph)) return false;
        }
      }
      return true;
    }
    case 5: // contexts: only the coverage-based form (3) is checked; the others answer no
      return sub.version === 3 ? none(list<Coverage>(sub.coverages)) : null;
    case 6: {
      if (sub.version !== 3) return null;
      const parts = [list<Coverage>(sub.backtrackCoverage), list<Coverage>(sub.inputCoverage), list<Coverage>(sub.lookaheadCoverage)];
      return parts.some((p) => p === null) ? null : none(parts.flat() as Coverage[]);
    }
    case 7:
      return sub.extension && sub.lookupType !== undefined ? ignores(sub.lookupType, sub.extension, glyph) : null;
    case 8: {
      const parts = [[sub.coverage], list<Coverage>(sub.backtrackCoverage), list<Coverage>(sub.lookaheadCoverage)];
      return parts.some((p) => p === null) ? null : none(parts.flat() as Coverage[]);
    }
    default:
      return null;
  }
}

/** The features and lookups a script's default language system turns on, as one comparable text. */
function languageSystemText(gsub: NonNullable<LayoutTables["GSUB"]>, langSys: LangSys | undefined): string {
  if (!langSys) return "none";
  const features = Array.from(gsub.featureList);
  const indexes = [...Array.from(langSys.featureIndexes), ...(langSys.reqFeatureIndex === 0xffff ? [] : [langSys.reqFeatureIndex])];
  return indexes
    .map((i) => `${features[i]?.tag}:${Array.from(features[i]?.feature.lookupListIndexes ?? []).join(",")}`)
    .sort()
    .join(" ");
}

/** See the module comment. `font` is a fontkit font. */
export function shapesWordByWord(font: ShapedFont): boolean {
  try {
    const tables = font as unknown as LayoutTables;
    if (tables.morx) return false; // AAT shaping: not checked here
    const gsub = tables.GSUB;
    if (!gsub) return true; // no substitutions: every character is its own glyph
    const space = font.glyphForCodePoint(0x20).id;
    if (space === 0) return false;
    const spaceClass = classOf(tables.GDEF?.glyphClassDef, space);
    if (spaceClass !== 0 && spaceClass !== 1) return false; // only unclassed or base: never skipped as a mark or ligature
    // Scripts: the default one and Latin only (both shaped by fontkit's default shaper), with the same lookups.
    const scripts = Array.from(gsub.scriptList);
    if (!scripts.every((s) => s.tag === "DFLT" || s.tag === "latn")) return false;
    if (new Set(scripts.map((s) => languageSystemText(gsub, s.script.defaultLangSys))).size > 1) return false;
    const lookups = list<Lookup>(gsub.lookupList);
    if (lookups === null) return false;
    for (const lookup of lookups) {
      if (lookup.flags.flags.ignoreBaseGlyphs) return false;
      const subTables = list<SubTable>(lookup.subTables);
      if (subTables === null) return false;
      for (const sub of subTables) if (ignores(lookup.lookupType, sub, space) !== true) return false;
    }
    return true;
  } catch {
    return false;
  }
}
