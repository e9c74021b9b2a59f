/**
 * Sends one queued value to the server and says what happened, in the four ways the queue cares about:
 * saved, a version conflict (409 with the current resource), refused (fix or retry by hand), or try
 * again later (no network, server trouble, rate limit).
 */
import type { SyncError, SyncRequest } from "./types";

export type SendOutcome =
  | { kind: "saved"; status: number; resource: unknown; version: number | null }
  | { kind: "conflict"; status: 409; resource: unknown; version: number | null; message: string }
  | { kind: "rejected"; error: SyncError }
  | { kind: "retry"; error: SyncError; retryAfterMs?: number };

/** A hung request counts as a failed one after this long (our choice: longer than any save should take on a poor line). */
export const SEND_TIMEOUT_MS = 20_000;

const RETRY_STATUSES = new Set([408, 425, 429]);

export type FetchLike = (input: string, init: RequestInit) => Promise<Response>;

function versionOf(resource: unknown): number | null {
  const v = (resource as { version?: unknown } | null)?.version;
  return typeof v === "number" && Number.isFinite(v) ? v : null;
}

function retryAfter(res: Response): number | undefined {
  const h = res.headers.get("retry-after");
  if (!h) return undefined;
  const seconds = Number(h);
  if (Number.isFinite(seconds)) return Math.max(0, seconds * 1000);
  const at = Date.parse(h);
  return Number.isNaN(at) ? undefined : Math.max(0, at - Date.now());
}

/** The request as sent: the body with the version the value builds on, when the resource is versioned. */
export function requestBody(request: SyncRequest, version: number | null): Record<string, unknown> {
  return request.versionField ? { ...request.body, [request.versionField]: version } : request.body;
}

export async function sendRequest(request: SyncRequest, version: number | null, fetchImpl: FetchLike = (i, init) => fetch(i, init), timeoutMs = SEND_TIMEOUT_MS): Promise<SendOutcome> {
  const controller = new AbortController();
  const timer = setTimeout(() => controller.abort(), timeoutMs);
  let res: Response;
  try {
    res = await fetchImpl(request.url, {
      method: request.method,
      headers: { "content-type": "application/json", accept: "application/json" },
      body: JSON.stringify(requestBody(request, version)),
      credentials: "same-origin",
      signal: controller.signal,
    });
  } catch {
    return { kind: "retry", error: { status: 0, message: controller.signal.aborted ? "The server did not answer in time." : "No connection to the server." } };
  } finally {
    clearTimeout(timer);
  }
  const body = (await res.json().catch(() => null)) as Record<string, unknown> | null;
  const error = body?.error as { message?: unknown; fields?: unknown } | undefined;
  const message = typeof error?.message === "string" ? error.message : `The server answered ${res.status}.`;
  const fields = error?.fields && typeof error.fields === "object" ? (error.fields as Record<string, string>) : undefined;

  if (res.ok) {
    const resource = body?.[request.resourceField] ?? null;
    return { kind: "saved", status: res.status, resource, version: versionOf(resource) };
  }
  if (res.status === 409 && body && request.resourceField in body) {
    const resource = body[request.resourceField];
    return { kind: "conflict", status: 409, resource, version: versionOf(resource), message };
  }
  if (RETRY_STATUSES.has(res.status) || res.status >= 500) return { kind: "retry", error: { status: res.status, message }, retryAfterMs: retryAfter(res) };
  if (res.status === 401) return { kind: "rejected", error: { status: 401, message: "You are signed out. Sign in again: what you typed stays on this device and is sent then." } };
  return { kind: "rejected", error: { status: res.status, message, ...(fields ? { fields } : {}) } };
}
