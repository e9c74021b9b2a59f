/**
 * Reads one file (and a few short text fields) from a multipart/form-data request while it streams,
 * with hard bounds: a declared Content-Length over the cap is refused before a byte is read, and a
 * body that grows past it is cut off at the cap. Nothing is kept from a body that fails or stops
 * half-way: the caller stores only what this returns as complete.
 */
import { Readable } from "node:stream";
import type { ReadableStream as NodeWebStream } from "node:stream/web";
import Busboy from "busboy";

export interface ReceivedFile {
  bytes: Buffer;
  /** The name the client gave; shown to people, never trusted for the type. */
  fileName: string;
}

export type MultipartResult =
  | { ok: true; file: ReceivedFile | null; fields: Record<string, string> }
  | { ok: false; status: 400 | 408 | 413 | 415; message: string; field?: string };

/** Room for the multipart boundaries, part headers and the short fields around the file. */
const ENVELOPE_BYTES = 64 * 1024;

export interface MultipartOptions {
  maxFileBytes: number;
  /** What the limit is called in messages, e.g. "10 MB". */
  limitWords: string;
  fileField?: string;
  /** Text fields accepted besides the file; others are ignored. */
  fieldNames?: readonly string[];
  maxFieldChars?: number;
  /** How long the whole body may take to arrive (default 5 minutes: 10 MB over a weak site connection). */
  timeoutMs?: number;
}

export async function readMultipartFile(req: Request, options: MultipartOptions): Promise<MultipartResult> {
  const { maxFileBytes, limitWords, fileField = "file", fieldNames = [], maxFieldChars = 2000, timeoutMs = 300_000 } = options;
  const tooLarge = { ok: false as const, status: 413 as const, message: `The file is larger than ${limitWords}; nothing was saved. Choose a smaller file (or a lower camera resolution).`, field: fileField };
  const contentType = req.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data;/i.test(contentType)) {
    return { ok: false, status: 415, message: `Send the file as multipart/form-data, in the field "${fileField}".` };
  }
  const declared = Number(req.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > maxFileBytes + ENVELOPE_BYTES) return tooLarge;
  if (!req.body) return { ok: false, status: 400, message: `The request has no body: attach a file in the field "${fileField}".`, field: fileField };

  const source = Readable.fromWeb(req.body as unknown as NodeWebStream<Uint8Array>);
  return new Promise<MultipartResult>((resolve) => {
    let settled = false;
    const timer = setTimeout(() => finish({ ok: false, status: 408, message: "The upload took too long to arrive and was stopped; nothing was saved. Try again with a better connection." }), timeoutMs);
    const finish = (result: MultipartResult) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      source.unpipe();
      if (!result.ok) source.destroy();
      resolve(result);
    };
    let busboy: Busboy.Busboy;
    try {
      busboy = Busboy({
        headers: { "content-type": contentType },
        limits: { files: 1, fileSize: maxFileBytes, fields: fieldNames.length, fieldSize: maxFieldChars * 4, parts: fieldNames.length + 2, fieldNameSize: 100 },
      });
    } catch {
      resolve({ ok: false, status: 400, message: "The multipart body has no boundary; send it as a browser form would." });
      return;
    }
    const fields: Record<string, string> = {};
    const chunks: Buffer[] = [];
    let file: ReceivedFile | null = null;
    let fileDone = false;
    let total = 0;

    source.on("data", (chunk: Buffer) => {
      total += chunk.length;
      if (total > maxFileBytes + ENVELOPE_BYTES) finish(tooLarge);
    });
    source.on("error", () => finish({ ok: false, status: 400, message: "The upload was cut off before it finished; nothing was saved. Try again." }));
    busboy.on("file", (name, stream, info) => {
      if (name !== fileField || file) {
        stream.resume();
        return;
      }
      file = { bytes: Buffer.alloc(0), fileName: (info.filename ?? "").slice(0, 200) };
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("limit", () => finish(tooLarge));
      stream.on("error", () => finish({ ok: false, status: 400, message: "The upload was cut off before it finished; nothing was saved. Try again." }));
      stream.on("end", () => {
        fileDone = true;
      });
    });
    busboy.on("field", (name, value, info) => {
      if (!fieldNames.includes(name)) return;
      if (info.valueTruncated || value.length > maxFieldChars) {
        finish({ ok: false, status: 400, message: `"${name}" is at most ${maxFieldChars} characters.`, field: name });
        return;
      }
      fields[name] = value;
    });
    busboy.on("partsLimit", () => finish({ ok: false, status: 400, message: `Send one file in "${fileField}"${fieldNames.length ? ` and at most these fields: ${fieldNames.join(", ")}` : ""}.` }));
    busboy.on("filesLimit", () => finish({ ok: false, status: 400, message: `Send one file at a time, in "${fileField}".`, field: fileField }));
    busboy.on("error", () => finish({ ok: false, status: 400, message: "The upload was cut off or malformed before it finished; nothing was saved. Try again." }));
    busboy.on("close", () => {
      if (file && !fileDone) {
        finish({ ok: false, status: 400, message: "The upload was cut off before it finished; nothing was saved. Try again." });
        return;
      }
      if (file) file.bytes = Buffer.concat(chunks);
      finish({ ok: true, file, fields });
    });
    source.pipe(busboy);
  });
}
