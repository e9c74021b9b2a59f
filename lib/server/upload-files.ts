/**
 * What an upload is, read from its bytes (file-type), never from its name or declared type; and a
 * thumbnail for images (sharp). JPEG, PNG or PDF, at most 10 MB.
 */
import { fileTypeFromBuffer } from "file-type";
import sharp from "sharp";

export const UPLOAD_MAX_BYTES = 10 * 1024 * 1024;
export const UPLOAD_LIMIT_WORDS = "10 MB";

export type UploadType = "image/jpeg" | "image/png" | "application/pdf";
const NAMES: Record<UploadType, string> = { "image/jpeg": "JPEG", "image/png": "PNG", "application/pdf": "PDF" };
export const EXTENSIONS: Record<UploadType, string> = { "image/jpeg": "jpg", "image/png": "png", "application/pdf": "pdf" };

function listWords(types: readonly UploadType[]): string {
  const names = types.map((t) => NAMES[t]);
  return names.length === 1 ? names[0]! : `${names.slice(0, -1).join(", ")} or ${names.at(-1)}`;
}

export async function detectUploadType(
  bytes: Uint8Array,
  allowed: readonly UploadType[],
): Promise<{ ok: true; type: UploadType } | { ok: false; message: string }> {
  if (bytes.byteLength === 0) return { ok: false, message: "The file is empty." };
  const found = await fileTypeFromBuffer(bytes);
  if (found && (allowed as readonly string[]).includes(found.mime)) return { ok: true, type: found.mime as UploadType };
  const what = found ? `a ${found.ext.toUpperCase()} file (${found.mime})` : "not a file type Airtally recognises";
  return { ok: false, message: `Only ${listWords(allowed)} files are accepted here, and this file's contents are ${what}, whatever its name says. Nothing was saved.` };
}

/** Camera photos are large; a bound on decoded pixels keeps a crafted image from exhausting memory (≈ 60 MP). */
const MAX_PIXELS = 60_000_000;
const THUMB_PX = 480;

export interface ImageFacts {
  width: number;
  height: number;
  thumbnail: Buffer;
}

/** Dimensions (as displayed, after the camera's rotation) and a JPEG thumbnail; an unreadable image throws. */
export async function describeImage(bytes: Uint8Array): Promise<ImageFacts> {
  const image = sharp(bytes, { limitInputPixels: MAX_PIXELS, failOn: "error" });
  const meta = await image.metadata();
  if (!meta.width || !meta.height) throw new Error("no dimensions");
  const rotated = (meta.orientation ?? 1) >= 5;
  const thumbnail = await sharp(bytes, { limitInputPixels: MAX_PIXELS })
    .rotate()
    .resize(THUMB_PX, THUMB_PX, { fit: "inside", withoutEnlargement: true })
    .jpeg({ quality: 78, mozjpeg: true })
    .toBuffer();
  return { width: rotated ? meta.height : meta.width, height: rotated ? meta.width : meta.height, thumbnail };
}
