/**
 * Reads a small JSON body for a public route, refusing more than `maxBytes` while it streams (413)
 * and anything that is not JSON (400/415). Signed-in routes get this from defineRoute.
 */
export async function readBoundedJson(req: Request, maxBytes: number): Promise<{ ok: true; value: unknown } | { ok: false; status: 400 | 413 | 415; message: string }> {
  const type = req.headers.get("content-type") ?? "";
  if (!/^application\/json\b/i.test(type)) return { ok: false, status: 415, message: "Send the body as application/json." };
  const declared = Number(req.headers.get("content-length") ?? "NaN");
  const tooLarge = { ok: false as const, status: 413 as const, message: `The body is larger than ${maxBytes} bytes.` };
  if (Number.isFinite(declared) && declared > maxBytes) return tooLarge;
  if (!req.body) return { ok: false, status: 400, message: "The request body is empty; send a JSON document." };
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > maxBytes) {
      await reader.cancel().catch(() => undefined);
      return tooLarge;
    }
    chunks.push(value);
  }
  const text = Buffer.concat(chunks).toString("utf8");
  if (text.trim() === "") return { ok: false, status: 400, message: "The request body is empty; send a JSON document." };
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch {
    return { ok: false, status: 400, message: "The request body is not valid JSON." };
  }
}
