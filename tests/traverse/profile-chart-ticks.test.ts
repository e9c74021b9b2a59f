import { Ticks } from "chart.js";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { tickLabel } from "@/components/traverse/profile-chart";

// The reference is chart.js's own numeric tick formatter (with the en-US locale): the profile chart's
// axis labels must read exactly as before it stopped using Intl.
function chartJsLabel(value: number, index: number, ticks: { value: number }[]): string {
  const scale = { chart: { options: { locale: "en-US" } }, options: { ticks: { format: {} } } };
  return Ticks.formatters.numeric.call(scale as never, value, index, ticks as never) as string;
}

/** Ticks as a linear axis lays them out: a nice step (1, 2 or 5 × 10^n) from a multiple of it, sometimes with an odd last tick. */
const tickSets = fc
  .record({ power: fc.integer({ min: -3, max: 4 }), mult: fc.constantFrom(1, 2, 2.5, 5), start: fc.integer({ min: -5, max: 20 }), count: fc.integer({ min: 2, max: 12 }), end: fc.option(fc.double({ min: 0.01, max: 0.99, noNaN: true })) })
  .map(({ power, mult, start, count, end }) => {
    const step = mult * 10 ** power;
    const values = Array.from({ length: count }, (_, i) => Number(((start + i) * step).toPrecision(12)));
    if (end !== null) values.push(Number(((start + count - 1 + end) * step).toPrecision(12)));
    return values.map((value) => ({ value }));
  });

describe("the profile chart's tick labels", () => {
  it("read as chart.js's own labels on every linear axis", () => {
    fc.assert(
      fc.property(tickSets, (ticks) => {
        ticks.forEach((t, i) => expect(tickLabel(t.value, i, ticks)).toBe(chartJsLabel(t.value, i, ticks)));
      }),
      { numRuns: 5000 },
    );
  });

  it("read as chart.js's on a velocity axis and a distance axis of the demo's size", () => {
    const velocity = [0, 1, 2, 3, 4, 5, 6, 7].map((value) => ({ value }));
    const distance = [0, 50, 100, 150, 200, 250, 300, 350, 400, 450].map((value) => ({ value }));
    const fine = [0, 0.2, 0.4, 0.6, 0.8, 1, 1.2].map((value) => ({ value }));
    for (const ticks of [velocity, distance, fine]) ticks.forEach((t, i) => expect(tickLabel(t.value, i, ticks)).toBe(chartJsLabel(t.value, i, ticks)));
  });
});
