import { NextRequest } from "next/server";

type Handler = (req: NextRequest, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

export interface CallOptions {
  method?: string;
  path?: string;
  params?: Record<string, string>;
  /** A JSON body (sent as application/json). */
  json?: unknown;
  /** The same as `json`. */
  body?: unknown;
  /** A body sent as it is, as `contentType` (default text/csv). */
  text?: string;
  contentType?: string;
  /** A body sent as it is, as application/json unless `headers` say otherwise (for malformed JSON). */
  rawBody?: string;
  /** Bytes sent as they are (a multipart upload), as `contentType`. */
  bytes?: Uint8Array | ReadableStream<Uint8Array>;
  headers?: Record<string, string>;
}

/**
 * Calls a route handler the way Next does: a request and its path parameters. The session is
 * mocked by the test file (tests/support/session-mock.ts), so the handler sees that user.
 */
export async function callRoute(
  handler: Handler,
  { method = "GET", path = "/api/test", params = {}, json, body, text, contentType, rawBody, bytes, headers: extra = {} }: CallOptions = {},
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests read whatever JSON the route answers
): Promise<{ status: number; body: any; text: string; headers: Headers }> {
  const headers: Record<string, string> = {};
  let payload: string | Uint8Array | ReadableStream<Uint8Array> | undefined;
  const value = json ?? body;
  if (value !== undefined) {
    payload = JSON.stringify(value);
    headers["content-type"] = "application/json";
  } else if (text !== undefined) {
    payload = text;
    headers["content-type"] = contentType ?? "text/csv";
  } else if (rawBody !== undefined) {
    payload = rawBody;
    headers["content-type"] = "application/json";
  } else if (bytes !== undefined) {
    payload = bytes;
    if (contentType) headers["content-type"] = contentType;
    if (bytes instanceof Uint8Array) headers["content-length"] = String(bytes.byteLength);
  }
  const init = { method, body: payload as BodyInit | undefined, headers: { ...headers, ...extra }, duplex: "half" };
  const req = new NextRequest(new URL(path, "http://localhost"), init as ConstructorParameters<typeof NextRequest>[1]);
  const res = await handler(req, { params: Promise.resolve(params) });
  const raw = await res.text();
  let parsed: unknown = null;
  try {
    parsed = raw ? JSON.parse(raw) : null;
  } catch {
    parsed = null;
  }
  return { status: res.status, body: parsed, text: raw, headers: res.headers };
}
