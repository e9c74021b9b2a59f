import fs from "node:fs";
import path from "node:path";
import fontkit from "@pdf-lib/fontkit";
import { describe, expect, it } from "vitest";
import { sfntFromWoff } from "@/lib/report/woff";

const FILES = ["400", "500", "600", "700"].map((w) => path.join(process.cwd(), "fonts", `barlow-latin-${w}-normal.woff`));

/** OpenType table checksum: the sum of the big-endian uint32s, the last one padded with zeros (OpenType spec, "Calculating checksums"). */
function checksum(bytes: Buffer): number {
  const padded = Buffer.concat([bytes, Buffer.alloc((4 - (bytes.length % 4)) % 4)]);
  let sum = 0;
  for (let i = 0; i < padded.length; i += 4) sum = (sum + padded.readUInt32BE(i)) >>> 0;
  return sum;
}

function tableDirectory(sfnt: Buffer) {
  return Array.from({ length: sfnt.readUInt16BE(4) }, (_, i) => {
    const at = 12 + 16 * i;
    return { tag: sfnt.toString("latin1", at, at + 4), checksum: sfnt.readUInt32BE(at + 4), offset: sfnt.readUInt32BE(at + 8), length: sfnt.readUInt32BE(at + 12) };
  });
}

describe.each(FILES)("unpacking %s", (file) => {
  const woff = fs.readFileSync(file);
  const sfnt = Buffer.from(sfntFromWoff(woff));

  it("gives the font the WOFF was made from: its stated size and every table's checksum", () => {
    // WOFF 1.0 §4: totalSfntSize is the size of the uncompressed font, header, directory and padding included.
    expect(sfnt.length).toBe(woff.readUInt32BE(16));
    const tables = tableDirectory(sfnt);
    expect(tables.map((t) => t.tag)).toEqual([...tables.map((t) => t.tag)].sort());
    // The binary-search fields of the offset table (OpenType spec, "Table directory").
    const n = tables.length;
    const power = 2 ** Math.floor(Math.log2(n));
    expect([sfnt.readUInt16BE(6), sfnt.readUInt16BE(8), sfnt.readUInt16BE(10)]).toEqual([power * 16, Math.log2(power), n * 16 - power * 16]);
    for (const t of tables) {
      const data = Buffer.from(sfnt.subarray(t.offset, t.offset + t.length));
      // The head table's checksum is taken with its checkSumAdjustment (at byte 8) as zero.
      if (t.tag === "head") data.writeUInt32BE(0, 8);
      expect(checksum(data), t.tag).toBe(t.checksum);
    }
  });

  it("reads in fontkit exactly as the WOFF does: glyphs, advances and shaped text", () => {
    const a = fontkit.create(woff);
    const b = fontkit.create(sfnt);
    expect(b.numGlyphs).toBe(a.numGlyphs);
    expect(b.characterSet).toEqual(a.characterSet);
    for (const cp of a.characterSet) {
      const ga = a.glyphForCodePoint(cp);
      const gb = b.glyphForCodePoint(cp);
      expect([gb.id, gb.advanceWidth, gb.path.toSVG()]).toEqual([ga.id, ga.advanceWidth, ga.path.toSVG()]);
    }
    const text = "Office fluff: 1,412 L/s ±10 % — “Traverse AVA-1”, ½ in.";
    expect(b.layout(text).glyphs.map((g) => g.id)).toEqual(a.layout(text).glyphs.map((g) => g.id));
  });
});

describe("a file that is not a WOFF", () => {
  it("is refused, as is a WOFF cut short", () => {
    const woff = fs.readFileSync(FILES[0]!);
    expect(() => sfntFromWoff(new Uint8Array(100))).toThrow(/not a WOFF/);
    expect(() => sfntFromWoff(woff.subarray(0, 60))).toThrow(/cut short/);
    expect(() => sfntFromWoff(woff.subarray(0, woff.length - 200))).toThrow(/outside the file/);
  });
});
