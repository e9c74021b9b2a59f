import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { numberText } from "@/lib/units/number-text";

// The reference is the platform's own formatter (ICU's en-US data): numberText must print exactly what
// `Intl.NumberFormat("en-US", …)` prints, so replacing it changes no figure on any screen.
const intl = (min: number, max: number) => new Intl.NumberFormat("en-US", { minimumFractionDigits: min, maximumFractionDigits: max });

describe("numberText", () => {
  it("prints what Intl's en-US formatter prints for fixed decimals, on any double", () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 0, max: 6 }), (v, d) => {
        expect(numberText(v, d)).toBe(intl(d, d).format(v));
      }),
      { numRuns: 20_000 },
    );
  });

  it("prints what Intl's en-US formatter prints for at most n decimals, on values a screen shows", () => {
    fc.assert(
      fc.property(fc.double({ min: -1e7, max: 1e7, noNaN: true }), fc.integer({ min: 0, max: 4 }), fc.integer({ min: 0, max: 4 }), (v, a, b) => {
        const [min, max] = a <= b ? [a, b] : [b, a];
        expect(numberText(v, min, max)).toBe(intl(min, max).format(v));
      }),
      { numRuns: 20_000 },
    );
  });

  it("rounds the shortest decimal half away from zero, as the platform does, where toFixed would not", () => {
    const cases: [number, number][] = [
      [1.005, 2], [-1.005, 2], [2.5, 0], [-2.5, 0], [0.5, 0], [1.45, 1], [8.345, 2], [999.95, 1], [9999.5, 0], [0.000049, 4], [0.00005, 4],
      [-0.04, 1], [-0, 2], [0, 0], [1e21, 0], [1.5e-7, 6], [123456789.125, 2], [4.35, 1], [1.0000000000000002, 6], [Number.MAX_VALUE, 0], [Number.MIN_VALUE, 3],
    ];
    for (const [v, d] of cases) expect(numberText(v, d), `${v} to ${d}`).toBe(intl(d, d).format(v));
  });

  it("leaves NaN and infinities to the platform", () => {
    for (const v of [NaN, Infinity, -Infinity]) expect(numberText(v, 1)).toBe(intl(1, 1).format(v));
  });
});
