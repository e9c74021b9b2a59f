import { describe, expect, it } from "vitest";
import { readMeterCsv } from "@/lib/traverse/meter-csv";

const opts = { lines: 2, pointsPerLine: 3, kind: "pressure" as const, chosenUnit: "Pa" as const };
const ok = (r: ReturnType<typeof readMeterCsv>) => {
  if (!r.ok) throw new Error(r.message);
  return r.value;
};

describe("a meter's CSV placed on a traverse grid", () => {
  it("reads one value per row in traverse order, with or without a header", () => {
    const bare = ok(readMeterCsv("12.1\n15.4\n13.0\n11.8\n16.2\n12.9\n", opts));
    expect(bare).toMatchObject({ layout: "sequence", unit: "Pa", unitFrom: "chosen", placed: 6, valuesInFile: 6, points: 6, problems: [] });
    expect(bare.grid).toEqual([
      [12.1, 15.4, 13.0],
      [11.8, 16.2, 12.9],
    ]);
    // A meter's export with an index and a time before the value; the value column named in the header.
    const withHeader = ok(readMeterCsv("Index,Time,Pv (Pa)\n1,09:40:01,12.1\n2,09:40:09,15.4\n3,09:40:17,13\n4,09:41:02,11.8\n5,09:41:10,16.2\n6,09:41:18,12.9\n", opts));
    expect(withHeader.grid).toEqual(bare.grid);
    expect(withHeader.unitFrom).toBe("header");
  });

  it("reads line, point and value columns (counted from 1) in any order, semicolons and decimal commas too", () => {
    const r = ok(readMeterCsv("point;line;value\n3;2;12,9\n1;1;12,1\n2;1;15,4\n3;1;13\n1;2;11,8\n2;2;16,2\n", opts));
    expect(r.layout).toBe("line-point");
    expect(r.grid).toEqual([
      [12.1, 15.4, 13.0],
      [11.8, 16.2, 12.9],
    ]);
  });

  it("converts inches of water and fpm exactly (1 in. w.c. = 249.088 91 Pa, NIST SP 811 B.8; 1 fpm = 0.005 08 m/s exactly)", () => {
    const inches = ok(readMeterCsv("Velocity pressure (in. w.c.)\n0.1\n0.05\n", { ...opts, lines: 1, pointsPerLine: 2 }));
    expect(inches.unit).toBe("inH2O");
    expect(inches.grid[0]![0]).toBeCloseTo(24.908891, 9);
    expect(inches.grid[0]![1]).toBeCloseTo(12.4544455, 9);
    const chosen = ok(readMeterCsv("0.1\n", { ...opts, lines: 1, pointsPerLine: 2, chosenUnit: "inH2O" }));
    expect(chosen.grid[0]![0]).toBeCloseTo(24.908891, 9);
    const fpm = ok(readMeterCsv("Velocity (fpm)\n1000\n500\n", { lines: 1, pointsPerLine: 2, kind: "velocity", chosenUnit: "m/s" }));
    expect(fpm.grid[0]).toEqual([expect.closeTo(5.08, 12), expect.closeTo(2.54, 12)]);
  });

  it("calls out count mismatches and rows it cannot use, and refuses a unit of the wrong kind", () => {
    const few = ok(readMeterCsv("1\n2\n3\n4\n", opts));
    expect(few.problems[0]).toBe("The file has 4 values; this traverse has 6 points (2 × 3). The last 2 stay empty.");
    expect(few.grid[1]).toEqual([4, null, null]);
    const many = ok(readMeterCsv("1\n2\n3\n4\n5\n6\n7\n8\n", opts));
    expect(many.problems[0]).toBe("The file has 8 values; this traverse has 6 points (2 × 3). The last 2 are left out.");
    expect(many.placed).toBe(6);
    const junk = ok(readMeterCsv("1\nERR\n3\n", opts));
    expect(junk.problems).toContain('row 2: "ERR" is not a number; skipped.');
    const off = ok(readMeterCsv("line,point,value\n1,1,5\n3,1,6\n1,1,7\n", opts));
    expect(off.problems).toEqual([
      "The file gives 1 of the 6 points; the others stay empty.",
      "row 3: line 3 point 1 is not on this 2 × 3 traverse.",
      "row 4: line 1 point 1 appears again; the later value is used.",
    ]);
    expect(off.grid[0]![0]).toBe(7);
    const wrongKind = readMeterCsv("Velocity (m/s)\n5\n", opts);
    expect(wrongKind.ok).toBe(false);
    expect(readMeterCsv("", opts).ok).toBe(false);
  });
});
