import { NextRequest } from "next/server";

type Handler = (req: NextRequest, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

/**
 * Calls a route handler the way Next does: a request and its path parameters. The session is
 * mocked by the test file (vi.mock of @/lib/auth/session), so the handler sees that user.
 */
export async function callRoute(
  handler: Handler,
  { method = "GET", path = "/api/test", params = {}, json, text, contentType }: { method?: string; path?: string; params?: Record<string, string>; json?: unknown; text?: string; contentType?: string },
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests read whatever JSON the route answers
): Promise<{ status: number; body: any; text: string; headers: Headers }> {
  const headers: Record<string, string> = {};
  let body: string | undefined;
  if (json !== undefined) {
    body = JSON.stringify(json);
    headers["content-type"] = "application/json";
  } else if (text !== undefined) {
    body = text;
    headers["content-type"] = contentType ?? "text/csv";
  }
  const req = new NextRequest(new URL(path, "http://localhost"), { method, body, headers });
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
