/**
 * Reading a number typed on a form or in a grid cell. Kept apart from the zod building blocks in
 * fields.ts, so screens that only read numbers (the traverse grid) do not load zod with them.
 */

/** "1,5" is read as 1.5 (a decimal comma), "" as not stated; anything else that is not a number is an error. */
export function parseDecimal(text: string): number | null | "invalid" {
  const t = text.trim().replace(/\s/g, "");
  if (t === "") return null;
  const normal = /^-?\d+,\d+$/.test(t) ? t.replace(",", ".") : t;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)$/.test(normal)) return "invalid";
  const n = Number(normal);
  return Number.isFinite(n) ? n : "invalid";
}
