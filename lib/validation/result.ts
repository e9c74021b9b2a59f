import type { ZodError } from "zod";

/** The one error shape every API route, server action and CLI returns for expected failures. */
export interface ErrorBody {
  error: { message: string; fields?: Record<string, string> };
}

export type Result<T> = { ok: true; value: T } | ({ ok: false } & ErrorBody);

export function ok<T>(value: T): Result<T> {
  return { ok: true, value };
}

export function fail(message: string, fields?: Record<string, string>): { ok: false } & ErrorBody {
  return fields && Object.keys(fields).length > 0
    ? { ok: false, error: { message, fields } }
    : { ok: false, error: { message } };
}

/** Dotted path of a zod issue, e.g. `readings.2.5` or `air.dry_bulb_c`; the root is `(input)`. */
export function issuePath(path: readonly PropertyKey[]): string {
  return path.length === 0 ? "(input)" : path.map(String).join(".");
}

/** Turns a zod error into `{ "<dotted.path>": "message" }`, keeping the first message per field. */
export function zodFieldErrors(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issuePath(issue.path);
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}

/** A failed Result built from a zod error, with a summary naming the fields at fault. */
export function failFromZod(error: ZodError, what = "Input"): { ok: false } & ErrorBody {
  const fields = zodFieldErrors(error);
  const names = Object.keys(fields);
  const shown = names.slice(0, 3).join(", ") + (names.length > 3 ? ` and ${names.length - 3} more` : "");
  return fail(`${what} is not valid: check ${shown}.`, fields);
}
