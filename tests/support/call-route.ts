/**
 * Calls an App Router route handler in-process, as Next would: a NextRequest and a params promise.
 * The signed-in user is whatever the test's mocked session holds (see tests/server/*.test.ts).
 */
import { NextRequest } from "next/server";

type Handler = (req: NextRequest, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

export interface Called {
  status: number;
  body: any; // eslint-disable-line @typescript-eslint/no-explicit-any -- a JSON answer under test
}

export async function callRoute(handler: Handler, { method = "GET", path = "/", params = {}, body, rawBody, headers = {} }: { method?: string; path?: string; params?: Record<string, string>; body?: unknown; rawBody?: string; headers?: Record<string, string> } = {}): Promise<Called> {
  const init: { method: string; headers: Record<string, string>; body?: string } = { method, headers: { "content-type": "application/json", ...headers } };
  if (rawBody !== undefined) init.body = rawBody;
  else if (body !== undefined) init.body = JSON.stringify(body);
  const res = await handler(new NextRequest(new URL(path, "http://airtally.test"), init), { params: Promise.resolve(params) });
  const text = await res.text();
  return { status: res.status, body: text === "" ? null : JSON.parse(text) };
}
