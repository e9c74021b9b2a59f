import "server-only";
import { NextResponse } from "next/server";
import type { ZodType } from "zod";
import { failFromZod } from "@/lib/validation/result";
import { jsonError } from "./route";

/** Resource bodies are small forms; anything larger is refused before it is parsed (our bound). */
export const RESOURCE_BODY_MAX_BYTES = 32 * 1024;

/**
 * Reads and validates a JSON body inside a handler, after the route has checked who may call it, so a
 * refused caller learns nothing about the body's rules and no body is parsed for them. Over the size
 * cap → 413, not JSON → 400 naming `(body)`, invalid → 400 naming each field.
 */
export async function parseBody<T>(req: Request, schema: ZodType<T>, maxBytes = RESOURCE_BODY_MAX_BYTES): Promise<{ ok: true; value: T } | { ok: false; response: Response }> {
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (Number.isFinite(declared) && declared > maxBytes) return { ok: false, response: tooLarge(maxBytes) };
  const text = await readBounded(req, maxBytes);
  if (text === null) return { ok: false, response: tooLarge(maxBytes) };
  const raw = parseJson(text);
  if (!raw.ok) return { ok: false, response: jsonError(400, raw.message, { "(body)": raw.message }) };
  const parsed = schema.safeParse(raw.value);
  if (!parsed.success) return { ok: false, response: NextResponse.json({ error: failFromZod(parsed.error).error }, { status: 400 }) };
  return { ok: true, value: parsed.data };
}

function tooLarge(maxBytes: number): Response {
  return jsonError(413, `The request body is larger than the ${Math.round(maxBytes / 1024)} KiB this route accepts.`);
}

/** The body as text, or null once it passes `maxBytes` (reading stops there: a chunked upload cannot fill memory). */
async function readBounded(req: Request, maxBytes: number): Promise<string | null> {
  if (!req.body) return "";
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > maxBytes) {
      await reader.cancel().catch(() => undefined);
      return null;
    }
    chunks.push(value);
  }
  return new TextDecoder().decode(Buffer.concat(chunks));
}

function parseJson(text: string): { ok: true; value: unknown } | { ok: false; message: string } {
  if (text.trim() === "") return { ok: false, message: "The request body is empty; send a JSON document." };
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch {
    return { ok: false, message: "The request body is not valid JSON." };
  }
}
