import "server-only";

/** Body size caps (bytes): sign-in and password forms are tiny; JSON documents (a traverse grid, a design schedule) fit well under 1 MiB. */
export const BODY_LIMITS = {
  auth: 16 * 1024,
  /** One resource's fields (an instrument, a conditions record): small forms. */
  form: 32 * 1024,
  json: 1024 * 1024,
} as const;

export type BodyRead =
  | { ok: true; text: string }
  | { ok: false; status: 413; message: string }
  | { ok: false; status: 400; message: string };

function tooLarge(limit: number): { ok: false; status: 413; message: string } {
  return { ok: false, status: 413, message: `The request body is larger than this endpoint accepts (${formatBytes(limit)}).` };
}

function formatBytes(n: number): string {
  return n >= 1024 * 1024 ? `${n / (1024 * 1024)} MiB` : `${n / 1024} KiB`;
}

/**
 * Reads a request body as UTF-8 text, refusing it when the declared Content-Length is over the
 * limit (before reading anything) and again while streaming (a missing or false length cannot
 * smuggle a larger body past the cap: reading stops at limit + 1 byte).
 */
export async function readBodyText(
  req: Request,
  limit: number,
  options: {
    /** What to say when the body is over the limit (default: the limit in bytes). */
    tooLargeMessage?: string;
    /** Refuse bytes that are not UTF-8 with this message (default: decode leniently). */
    invalidUtf8Message?: string;
  } = {},
): Promise<BodyRead> {
  const tooBig = (): BodyRead => (options.tooLargeMessage ? { ok: false, status: 413, message: options.tooLargeMessage } : tooLarge(limit));
  const declared = req.headers.get("content-length");
  if (declared !== null) {
    const n = Number(declared);
    if (!Number.isFinite(n) || n < 0) return { ok: false, status: 400, message: "The Content-Length header is not a byte count." };
    if (n > limit) return tooBig();
  }
  if (!req.body) return { ok: true, text: "" };
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > limit) {
      await reader.cancel().catch(() => undefined);
      return tooBig();
    }
    chunks.push(value);
  }
  const bytes = Buffer.concat(chunks);
  if (!options.invalidUtf8Message) return { ok: true, text: bytes.toString("utf8") };
  try {
    return { ok: true, text: new TextDecoder("utf-8", { fatal: true }).decode(bytes) };
  } catch {
    return { ok: false, status: 400, message: options.invalidUtf8Message };
  }
}

export type JsonRead = { ok: true; value: unknown } | { ok: false; status: 400 | 413 | 415; message: string };

/** True for `application/json`, with or without parameters such as `; charset=utf-8`. */
export function isJsonContentType(req: Request): boolean {
  const type = req.headers.get("content-type");
  return type !== null && type.split(";")[0]!.trim().toLowerCase() === "application/json";
}

/** A JSON body: content type checked (415), size capped (413), then parsed (400 when empty or malformed). */
export async function readJsonBody(req: Request, limit: number = BODY_LIMITS.json): Promise<JsonRead> {
  if (!isJsonContentType(req)) {
    return { ok: false, status: 415, message: "Send the body as JSON with the header Content-Type: application/json." };
  }
  const body = await readBodyText(req, limit);
  if (!body.ok) return body;
  if (body.text.trim() === "") return { ok: false, status: 400, message: "The request body is empty; send a JSON document." };
  try {
    return { ok: true, value: JSON.parse(body.text) };
  } catch {
    return { ok: false, status: 400, message: "The request body is not valid JSON." };
  }
}

const UNSAFE_METHODS = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/**
 * A state-changing request sent by a browser from another site (cross-site request forgery). The
 * browser's `Origin` (or `Sec-Fetch-Site`) must name this host; requests without either come from
 * programs, not from a page in a browser, and carry no ambient cookie risk.
 */
export function foreignOrigin(req: Request): string | null {
  if (!UNSAFE_METHODS.has(req.method)) return null;
  const origin = req.headers.get("origin");
  const site = req.headers.get("sec-fetch-site");
  if (origin === null) return site === "cross-site" || site === "same-site" ? `(Sec-Fetch-Site: ${site})` : null;
  const host = req.headers.get("x-forwarded-host")?.split(",")[0]?.trim() || req.headers.get("host");
  try {
    if (host && new URL(origin).host === host) return null;
  } catch {
    // "null" or garbage: not this site
  }
  return origin;
}

/**
 * The client's address as the nearest hop reports it: the last entry of X-Forwarded-For (each proxy
 * appends the address it received from; Next.js fills it from the socket when no proxy set it).
 * Behind a reverse proxy that overwrites the header, this is the real client.
 */
export function clientAddress(req: Request): string {
  const forwarded = req.headers.get("x-forwarded-for");
  const last = forwarded?.split(",").at(-1)?.trim();
  return last ? last.slice(0, 100) : "unknown";
}
