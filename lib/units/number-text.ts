/**
 * A number as en-US text with thousands separators ("1,234.5"), built by hand: the same text as
 * `new Intl.NumberFormat("en-US", { minimumFractionDigits, maximumFractionDigits }).format(value)`
 * (tests/units/number-text.test.ts checks it against that formatter), without the formatter. A
 * browser's first Intl number formatter loads its locale data in one go: a tenth of a second or
 * more of a slow tablet's main thread while a page with numbers is starting.
 *
 * Like the platform's formatter, it rounds the shortest decimal that reads back as the same double
 * (what `String(value)` prints), half away from zero: 1.005 to two decimals is "1.01", where
 * `toFixed` (which rounds the binary value 1.00499999…) gives "1.00".
 */

let platform: Map<string, Intl.NumberFormat> | null = null;

/** Not finite (NaN, ±∞): rare enough to leave to the platform. */
function platformText(value: number, minDecimals: number, maxDecimals: number): string {
  platform ??= new Map();
  const key = `${minDecimals}:${maxDecimals}`;
  let f = platform.get(key);
  if (!f) platform.set(key, (f = new Intl.NumberFormat("en-US", { minimumFractionDigits: minDecimals, maximumFractionDigits: maxDecimals })));
  return f.format(value);
}

/** The digits of |value|'s shortest decimal form and where its decimal point falls (digits before it). */
function decimalDigits(abs: number): { digits: number[]; point: number } {
  const [mantissa, exponent] = String(abs).split("e") as [string, string | undefined];
  const [whole, fraction = ""] = mantissa.split(".") as [string, string | undefined];
  const digits = [...(whole + fraction)].map(Number);
  return { digits, point: whole.length + (exponent ? Number(exponent) : 0) };
}

/**
 * `value` with at least `minDecimals` and at most `maxDecimals` decimals (0–20), grouped by thousands,
 * "-" before a negative value (negative zero included, as the platform does).
 */
export function numberText(value: number, minDecimals: number, maxDecimals: number = minDecimals): string {
  if (!Number.isFinite(value)) return platformText(value, minDecimals, maxDecimals);
  const negative = value < 0 || Object.is(value, -0);
  const { digits, point } = decimalDigits(Math.abs(value));
  // Keep the digits up to maxDecimals after the point; round half away from zero on the first one dropped.
  const keep = point + maxDecimals;
  let kept: number[];
  let at = point;
  if (keep < 0) {
    kept = [];
  } else if (keep >= digits.length) {
    kept = digits.slice();
  } else {
    kept = digits.slice(0, keep);
    if (digits[keep]! >= 5) {
      let i = kept.length - 1;
      while (i >= 0 && kept[i] === 9) kept[i--] = 0;
      if (i >= 0) kept[i]! += 1;
      else {
        kept.unshift(1);
        at += 1;
      }
    }
  }
  // Whole part and fraction as digit strings, padded with zeros where the shortest form had none.
  const whole = at <= 0 ? "0" : kept.slice(0, at).join("").padEnd(at, "0").replace(/^0+(?=\d)/, "");
  let fraction = at >= 0 ? kept.slice(at).join("") : "0".repeat(Math.min(-at, maxDecimals)) + kept.join("");
  fraction = fraction.slice(0, maxDecimals).padEnd(minDecimals, "0");
  while (fraction.length > minDecimals && fraction.endsWith("0")) fraction = fraction.slice(0, -1);
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return `${negative ? "-" : ""}${grouped}${fraction ? `.${fraction}` : ""}`;
}
