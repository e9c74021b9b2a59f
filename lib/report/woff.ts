/**
 * WOFF 1.0 to plain SFNT (TrueType/OpenType) bytes, after the W3C Recommendation "WOFF File Format 1.0"
 * (2012): a 44-byte header, a 20-byte directory entry per table, each table zlib-compressed when that
 * made it smaller. fontkit reads a .woff too, but it inflates a table again each time it reads from it,
 * and the glyph table is read once for every glyph measured or subset: the report's fonts are unpacked
 * once per process instead.
 */
import zlib from "node:zlib";

const WOFF_SIGNATURE = 0x774f4646; // "wOFF"
const HEADER_BYTES = 44;
const WOFF_ENTRY_BYTES = 20;
const SFNT_ENTRY_BYTES = 16;

const padded = (n: number) => (n + 3) & ~3;

/** The SFNT font inside a WOFF 1.0 file; throws on anything else or on a damaged file. */
export function sfntFromWoff(woff: Uint8Array): Uint8Array {
  const src = Buffer.from(woff.buffer, woff.byteOffset, woff.byteLength);
  if (src.length < HEADER_BYTES || src.readUInt32BE(0) !== WOFF_SIGNATURE) throw new Error("not a WOFF 1.0 file");
  const flavor = src.readUInt32BE(4);
  const numTables = src.readUInt16BE(12);
  if (src.length < HEADER_BYTES + numTables * WOFF_ENTRY_BYTES) throw new Error("WOFF table directory cut short");
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = HEADER_BYTES + i * WOFF_ENTRY_BYTES;
    const tag = src.readUInt32BE(at);
    const offset = src.readUInt32BE(at + 4);
    const compLength = src.readUInt32BE(at + 8);
    const origLength = src.readUInt32BE(at + 12);
    const checksum = src.readUInt32BE(at + 16);
    if (offset + compLength > src.length || compLength > origLength) throw new Error("WOFF table outside the file");
    const stored = src.subarray(offset, offset + compLength);
    const data = compLength < origLength ? zlib.inflateSync(stored) : stored;
    if (data.length !== origLength) throw new Error("WOFF table does not unpack to its stated length");
    return { tag, checksum, data };
  });
  // The directory is sorted by tag in both formats; the SFNT's binary-search fields follow from the count.
  const power = 2 ** Math.floor(Math.log2(Math.max(1, numTables)));
  const dirBytes = 12 + numTables * SFNT_ENTRY_BYTES;
  const out = Buffer.alloc(tables.reduce((n, t) => n + padded(t.data.length), dirBytes));
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(power * 16, 6);
  out.writeUInt16BE(Math.log2(power), 8);
  out.writeUInt16BE(numTables * 16 - power * 16, 10);
  let offset = dirBytes;
  tables.forEach((t, i) => {
    const at = 12 + i * SFNT_ENTRY_BYTES;
    out.writeUInt32BE(t.tag, at);
    out.writeUInt32BE(t.checksum, at + 4);
    out.writeUInt32BE(offset, at + 8);
    out.writeUInt32BE(t.data.length, at + 12);
    t.data.copy(out, offset);
    offset += padded(t.data.length);
  });
  return new Uint8Array(out.buffer, out.byteOffset, out.byteLength);
}
