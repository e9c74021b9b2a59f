"use client";

import type { ErrorBody } from "@/lib/validation/result";
import type { PreferencesInput } from "@/lib/validation/auth";

/** An API error with the server's message and field errors, for display beside the fields. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fields: Record<string, string> = {},
  ) {
    super(message);
  }
}

/** A JSON call to our API; throws ApiError with the server's message and field errors. */
export async function call<T>(path: string, init?: RequestInit): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, { ...init, headers: { "content-type": "application/json", ...init?.headers } });
  } catch {
    throw new ApiError(0, "The server cannot be reached. Check the connection; nothing was changed.");
  }
  if (res.status === 204) return undefined as T;
  const body = (await res.json().catch(() => null)) as (T & Partial<ErrorBody>) | null;
  if (!res.ok) throw new ApiError(res.status, body?.error?.message ?? `The server answered ${res.status}.`, body?.error?.fields);
  return body as T;
}

export interface Me {
  user: { id: string; email: string; name: string; isAdmin: boolean; unitSystem: "IP" | "SI" | null };
}

export const api = {
  updatePreferences: (input: PreferencesInput) => call<Me>("/api/v1/me", { method: "PATCH", body: JSON.stringify(input) }),
};
