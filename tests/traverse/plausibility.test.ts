import { describe, expect, it } from "vitest";
import { plausibilityFlags } from "@/lib/traverse/plausibility";

describe("implausible readings are flagged in words, never dropped", () => {
  it("flags a negative reading, one far from its neighbours and one beyond the instrument's range", () => {
    const grid = [
      [20, 25, 26, 24, 19],
      [21, 26, -3, 25, 20],
      [19, 24, 250, 23, 18],
    ];
    const flags = plausibilityFlags(grid, { kind: "pressure", rangeMin: 0, rangeMax: 200, format: (v) => `${v} Pa` });
    expect(flags.get("1:2")?.map((f) => f.kind)).toEqual(["negative"]);
    // √250 = 15.81 against the mean of √24 and √23 (the negative neighbour is left out) = 4.85: 3.3 × (velocity ∝ √Pv).
    expect(flags.get("2:2")?.map((f) => f.kind)).toEqual(["beyond-range", "far-from-neighbours"]);
    expect(flags.get("2:2")?.[1]?.message).toContain("3.3 × above the points beside it");
    expect(flags.has("0:0")).toBe(false);
    expect([...flags.keys()].sort()).toEqual(["1:2", "2:2"]);
  });

  it("leaves an even profile and empty points alone, and compares anemometer velocities directly", () => {
    expect(plausibilityFlags([[5.1, 5.6, null, 5.4, 4.9]], { kind: "velocity" }).size).toBe(0);
    const low = plausibilityFlags([[5.1, 5.6, 1.5, 5.4, 4.9]], { kind: "velocity", format: (v) => `${v} m/s` });
    expect(low.get("0:2")?.[0]?.short).toBe("Much lower than beside it");
  });
});
