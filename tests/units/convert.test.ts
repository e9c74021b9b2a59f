import fc from "fast-check";
import { create, createUnitDependencies, unitDependencies } from "mathjs";
import { describe, expect, it } from "vitest";
import { DISPLAY_UNITS, UNITS, UnitError, convert, formatQuantity, fromDisplay, fromSi, toDisplay, toSi, type Quantity, type UnitId } from "@/lib/units";

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe("conversion factors (NIST SP 811, appendix B.8)", () => {
  it.each<[number, UnitId, UnitId, number, number]>([
    // [value, from, to, NIST value, half a unit in its last printed digit]
    [1, "fpm", "m/s", 0.00508, 1e-18], // 1 ft/min = 5.08 E-03 m/s, exact
    [1, "cfm", "m3/s", 4.719474e-4, 5e-11], // 1 ft³/min = 4.719 474 E-04 m³/s
    [1, "lb/ft3", "kg/m3", 16.018463, 5e-7], // 1 lb/ft³ = 1.601 846 3 E+01 kg/m³
    [1, "inHg", "Pa", 3386.389, 5e-4], // inch of mercury, conventional (32 °F) = 3.386 389 E+03 Pa
    [1, "inH2O", "Pa", 249.0889, 5e-5], // inch of water, conventional (≈ 4 °C) = 2.490 889 E+02 Pa
    [1, "ft", "m", 0.3048, 1e-15], // exact
    [1, "in", "mm", 25.4, 1e-13], // exact
    [1, "lb/min", "kg/s", 0.45359237 / 60, 1e-17], // 1 lb = 0.453 592 37 kg, exact
    [1, "lb/h", "kg/s", 0.45359237 / 3600, 1e-18],
    [1000, "L/s", "m3/s", 1, 1e-15], // litre = 1 E-03 m³, exact
    [3600, "m3/h", "m3/s", 1, 1e-15],
    [101.325, "kPa", "Pa", 101_325, 1e-10],
  ])("%s %s = %s %s", (value, from, to, expected, tol) => {
    expect(Math.abs(convert(value, from, to) - expected)).toBeLessThanOrEqual(tol);
  });

  it.each<[number, number]>([
    // t/°C = (t/°F − 32)/1.8 (NIST SP 811 B.9), exact
    [32, 0],
    [212, 100],
    [-40, -40],
    [68, 20],
  ])("%s °F = %s °C", (f, c) => {
    expect(convert(f, "degF", "degC")).toBeCloseTo(c, 12);
    expect(convert(c, "degC", "degF")).toBeCloseTo(f, 12);
  });

  it("gives 2 118.88 cfm per m³/s (1/4.719 474 E-04, NIST SP 811)", () => {
    expect(convert(1, "m3/s", "cfm")).toBeCloseTo(1 / 4.719474e-4, 2);
  });
});

describe("every pair agrees with mathjs's unit algebra (a general-purpose reference library)", () => {
  const math = create({ ...unitDependencies, ...createUnitDependencies });
  // The units mathjs lacks, from the same NIST SP 811 B.8 definitions as the table.
  math.createUnit("inH2O", "249.08891 Pa");
  math.createUnit("inHg", "3386.388640341 Pa");
  const ids = Object.keys(UNITS) as UnitId[];
  const pairs = ids.flatMap((a) => ids.filter((b) => UNITS[a].kind === UNITS[b].kind).map((b) => [a, b] as const));

  it.each(pairs)("%s → %s at 0, 1 and 1234.5", (a, b) => {
    for (const x of [0, 1, 1234.5]) {
      const expected = math.unit(x, UNITS[a].math).toNumber(UNITS[b].math);
      expect(Math.abs(convert(x, a, b) - expected)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(expected)));
    }
  });
});

describe("round trips", () => {
  const pairs: [UnitId, UnitId][] = [];
  const ids = Object.keys(UNITS) as UnitId[];
  for (const a of ids) for (const b of ids) if (UNITS[a].kind === UNITS[b].kind) pairs.push([a, b]);

  it("convert(convert(x, a, b), b, a) = x for every pair of compatible units", () => {
    fc.assert(
      fc.property(fc.constantFrom(...pairs), fc.double({ min: -1e6, max: 1e6, noNaN: true }), ([a, b], x) => {
        const back = convert(convert(x, a, b), b, a);
        expect(Math.abs(back - x)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(x)));
      }),
      { numRuns: 2000 },
    );
  });

  it("is linear (no offset) for every quantity but temperature", () => {
    fc.assert(
      fc.property(fc.constantFrom(...pairs.filter(([a]) => UNITS[a].kind !== "temperature")), fc.double({ min: 1e-3, max: 1e6, noNaN: true }), ([a, b], x) => {
        expect(convert(0, a, b)).toBe(0);
        expect(rel(convert(2 * x, a, b), 2 * convert(x, a, b))).toBeLessThan(1e-12);
      }),
    );
  });

  it("toDisplay ∘ fromDisplay is the identity in both systems", () => {
    const quantities = Object.keys(DISPLAY_UNITS.SI) as Quantity[];
    fc.assert(
      fc.property(fc.constantFrom<"IP" | "SI">("IP", "SI"), fc.constantFrom(...quantities), fc.double({ min: -1e5, max: 1e5, noNaN: true }), (sys, q, x) => {
        expect(Math.abs(toDisplay(sys, q, fromDisplay(sys, q, x)) - x)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(x)));
      }),
    );
  });
});

describe("toSi / fromSi and display", () => {
  it("expresses values in the engine unit of each quantity", () => {
    expect(toSi("dimension", 24, "in")).toBeCloseTo(609.6, 12); // 24 × 25.4 mm
    expect(toSi("barometric", 29.92, "inHg")).toBeCloseTo(29.92 * 3386.388640341, 6);
    expect(fromSi("temperature", 20, "degF")).toBeCloseTo(68, 12);
  });

  it("refuses a unit that does not fit the quantity or does not exist", () => {
    expect(() => toSi("velocity", 1, "cfm")).toThrow(UnitError);
    expect(() => convert(1, "Pa", "m/s")).toThrow(/Cannot convert Pa \(pressure\) to m\/s \(velocity\)/);
    expect(() => convert(1, "furlong" as UnitId, "m")).toThrow(/Unit "furlong" is not known/);
  });

  it("formats for display with the table's unit and decimals", () => {
    expect(formatQuantity("IP", "flow", 1000 * 4.719474e-4)).toBe("1,000 cfm");
    expect(formatQuantity("SI", "flow", 0.4719)).toBe("472 L/s");
    expect(formatQuantity("IP", "pressure", 249.0889 * 0.25)).toBe("0.250 in. w.c.");
    expect(formatQuantity("IP", "temperature", 20)).toBe("68.0 °F");
    expect(formatQuantity("IP", "velocity", 5.08, { withUnit: false })).toBe("1,000");
    expect(formatQuantity("SI", "pressure", -0.01)).toBe("0.0 Pa");
    expect(formatQuantity("SI", "barometric", 101_325, { decimals: 3 })).toBe("101.325 kPa");
  });
});
