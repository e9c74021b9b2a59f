/**
 * Small zod building blocks for resource JSON (camelCase, SI): every message names the value received
 * and what is allowed, as the calc schemas do.
 */
import "./zod-browser";
import { z } from "zod";
import { describeValue } from "./calc";

/** A number from min to max in `unit`, or null (not stated). */
export function nullableNumber(min: number, max: number, unit: string, opts: { integer?: boolean } = {}) {
  const allowed = `${opts.integer ? "a whole number" : "a number"} from ${min} to ${max}${unit ? ` ${unit}` : ""}, or null`;
  const message = (iss: { input?: unknown }) => `must be ${allowed}; got ${describeValue(iss.input)}`;
  let base = z.number({ error: message }).min(min, { error: message }).max(max, { error: message });
  if (opts.integer) base = base.int({ error: message });
  return base.nullable();
}

/** Trimmed text of at most `max` characters; `min` 1 makes it required. */
export function boundedText(max: number, opts: { min?: number; what?: string } = {}) {
  const min = opts.min ?? 0;
  return z
    .string({ error: (iss) => `must be text${opts.what ? ` (${opts.what})` : ""}; got ${describeValue(iss.input)}` })
    .trim()
    .min(min, { error: min === 1 ? `must not be empty${opts.what ? `: give ${opts.what}` : ""}` : `must be at least ${min} characters` })
    .max(max, { error: (iss) => `must be at most ${max} characters; got ${typeof iss.input === "string" ? iss.input.length : "more"}` });
}

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

export function isCalendarDate(value: string): boolean {
  if (!ISO_DATE.test(value)) return false;
  const [y, m, d] = value.split("-").map(Number) as [number, number, number];
  const date = new Date(Date.UTC(y, m - 1, d));
  return date.getUTCFullYear() === y && date.getUTCMonth() === m - 1 && date.getUTCDate() === d && y >= 1970 && y <= 2200;
}

/** A calendar date as YYYY-MM-DD, or null. */
export function nullableDate() {
  return z
    .string({ error: (iss) => `must be a date as YYYY-MM-DD, or null; got ${describeValue(iss.input)}` })
    .refine(isCalendarDate, { error: (iss) => `must be a real date as YYYY-MM-DD (e.g. 2027-03-10); got ${describeValue(iss.input)}` })
    .nullable();
}

/** A client-chosen id (UUID), so a retried create is recognised instead of stored twice. */
export const clientId = z
  .string({ error: (iss) => `must be a UUID chosen by the client; got ${describeValue(iss.input)}` })
  .regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i, { error: (iss) => `must be a UUID such as 3f2c…-…; got ${describeValue(iss.input)}` })
  .transform((s) => s.toLowerCase());

export function enumOf<const T extends readonly [string, ...string[]]>(values: T, what: string) {
  return z.enum(values, { error: (iss) => `must be one of ${values.map((v) => `"${v}"`).join(", ")} (${what}); got ${describeValue(iss.input)}` });
}

export { parseDecimal } from "./decimal";
