import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  MACH_LIMIT_ISO_3966,
  actualVelocityFromStandardMS,
  exceedsMachLimit,
  machNumber,
  speedOfSoundMS,
  standardVelocityFromActualMS,
  velocityFromPressureIncompressibleMS,
  velocityFromPressureMS,
  velocityPressureFromVelocityPa,
} from "@/lib/airflow/velocity";

const KAPPA = 1.4;
// Standard air: dry, 20 °C, 101 325 Pa → 1.204 kg/m³ (ASHRAE SI, common practice).
const RHO = 1.204;
const P = 101_325;

/** Closed form: Pv = ½ρV²(1 + M²/4 + M⁴/40), the isentropic stagnation rise expanded in M (κ = 1.4), M² = ρV²/(κp). */
function seriesVelocityPressurePa(v: number, rho: number, p: number): number {
  const m2 = (rho * v * v) / (KAPPA * p);
  return 0.5 * rho * v * v * (1 + m2 / 4 + (m2 * m2) / 40);
}

// Validated ranges (contract): Pv −500…5 000 Pa, coefficient 0.5…1.2; densities and absolute pressures
// span what −40…120 °C, 50…110 kPa barometric and ±10 kPa static can produce.
const pv = fc.double({ min: -500, max: 5000, noNaN: true });
const rho = fc.double({ min: 0.3, max: 2, noNaN: true });
const pAbs = fc.double({ min: 40_000, max: 120_000, noNaN: true });
const coefficient = fc.double({ min: 0.5, max: 1.2, noNaN: true });

describe("velocityFromPressureMS (compressible)", () => {
  it.each([5, 10, 20, 30, 50, 80])("inverts the series Pv = ½ρV²(1 + M²/4 + M⁴/40) at %s m/s to 1 ppm", (v) => {
    // The first neglected series term is O(M⁶) ≈ 1e-7 relative even at 80 m/s (M ≈ 0.23).
    const got = velocityFromPressureMS(seriesVelocityPressurePa(v, RHO, P), RHO, P);
    expect(Math.abs(got / v - 1)).toBeLessThan(1e-6);
  });

  it.each([
    // Over-read of the incompressible form ≈ Pv/(4κp), closed form; printed as +0.011 % at 10 m/s and
    // +0.27 % at 50 m/s for 20 °C, 101.325 kPa (airflow-methods reference, derived there).
    [10, 0.011, 0.0005],
    [25, 0.066, 0.0005],
    [50, 0.27, 0.005],
  ])("is below the incompressible form by ≈ Pv/(4κp): %s m/s → +%s %%", (v, printedPct, tol) => {
    const pvPa = seriesVelocityPressurePa(v, RHO, P);
    const overReadPct = 100 * (velocityFromPressureIncompressibleMS(pvPa, RHO) / velocityFromPressureMS(pvPa, RHO, P) - 1);
    expect(Math.abs(overReadPct - printedPct)).toBeLessThan(tol);
    expect(Math.abs(overReadPct / ((100 * pvPa) / (4 * KAPPA * P)) - 1)).toBeLessThan(0.01);
  });

  it("gives zero for zero or negative velocity pressure (never a root of a negative)", () => {
    expect(velocityFromPressureMS(0, RHO, P)).toBe(0);
    expect(velocityFromPressureMS(-3, RHO, P)).toBe(0);
    expect(velocityFromPressureIncompressibleMS(-3, RHO)).toBe(0);
  });

  it("scales linearly with the probe coefficient", () => {
    expect(velocityFromPressureMS(100, RHO, P, 0.84) / velocityFromPressureMS(100, RHO, P)).toBeCloseTo(0.84, 12);
  });

  it("is strictly increasing in Pv and never above the incompressible value", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 5000, noNaN: true }), fc.double({ min: 1.001, max: 10, noNaN: true }), rho, pAbs, (a, k, r, p) => {
        const lower = velocityFromPressureMS(a, r, p);
        const higher = velocityFromPressureMS(Math.min(a * k, 5000 + a), r, p);
        expect(higher).toBeGreaterThan(lower);
        expect(lower).toBeLessThanOrEqual(velocityFromPressureIncompressibleMS(a, r));
      }),
    );
  });

  it("round-trips through velocityPressureFromVelocityPa", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 90, noNaN: true }), rho, pAbs, coefficient, (v, r, p, c) => {
        const back = velocityFromPressureMS(velocityPressureFromVelocityPa(v, r, p, c), r, p, c);
        expect(Math.abs(back / v - 1)).toBeLessThan(1e-9);
      }),
    );
  });

  it("never returns NaN, infinity or a negative for any validated input", () => {
    fc.assert(
      fc.property(pv, rho, pAbs, coefficient, (a, r, p, c) => {
        for (const v of [velocityFromPressureMS(a, r, p, c), velocityFromPressureIncompressibleMS(a, r, c)]) {
          expect(Number.isFinite(v)).toBe(true);
          expect(v).toBeGreaterThanOrEqual(0);
        }
      }),
      { numRuns: 1000 },
    );
  });
});

describe("velocityFromPressureIncompressibleMS", () => {
  it("gives √(2·Pv/ρ): 60 Pa in standard air → 9.983 m/s (closed form)", () => {
    expect(velocityFromPressureIncompressibleMS(60, RHO)).toBeCloseTo(Math.sqrt(120 / 1.204), 12);
  });

  it("scales velocity by √k when Pv is scaled by k", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 5000, noNaN: true }), fc.double({ min: 0.01, max: 100, noNaN: true }), rho, (a, k, r) => {
        const ratio = velocityFromPressureIncompressibleMS(a * k, r) / velocityFromPressureIncompressibleMS(a, r);
        expect(Math.abs(ratio / Math.sqrt(k) - 1)).toBeLessThan(1e-12);
      }),
    );
  });

  it("and the compressible form does too in the low-Mach limit (Pv ≤ 5 Pa: within 1e-5)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 5, noNaN: true }), fc.double({ min: 0.1, max: 1, noNaN: true }), (a, k) => {
        const ratio = velocityFromPressureMS(a * k, RHO, P) / velocityFromPressureMS(a, RHO, P);
        expect(Math.abs(ratio / Math.sqrt(k) - 1)).toBeLessThan(1e-5);
      }),
    );
  });
});

describe("Mach number", () => {
  it("uses a speed of sound of 343.2 m/s in dry air at 20 °C (handbook value, from memory)", () => {
    expect(speedOfSoundMS(20)).toBeCloseTo(343.2, 0);
    expect(machNumber(343.2, 20)).toBeCloseTo(1, 3);
  });

  it("flags only Mach numbers beyond the ISO 3966 limit of 0.25", () => {
    expect(MACH_LIMIT_ISO_3966).toBe(0.25);
    expect(exceedsMachLimit(0.25)).toBe(false);
    expect(exceedsMachLimit(0.2501)).toBe(true);
    expect(exceedsMachLimit(machNumber(90, 20))).toBe(true); // 90/343 ≈ 0.262
    expect(exceedsMachLimit(machNumber(80, 20))).toBe(false); // 80/343 ≈ 0.233
  });
});

describe("thermal anemometer standard ↔ actual velocity", () => {
  it("converts by the mass-flux identity ρ·V = ρ_std·V_std (closed form)", () => {
    // 5 m/s standard at ρ = 1.0 kg/m³ is 5 × 1.204 / 1.0 = 6.02 m/s actual.
    expect(actualVelocityFromStandardMS(5, 1.0)).toBeCloseTo(6.02, 12);
    expect(actualVelocityFromStandardMS(5, 1.0, 1.2)).toBeCloseTo(6.0, 12);
  });

  it("round-trips", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 100, noNaN: true }), rho, fc.double({ min: 1.1, max: 1.3, noNaN: true }), (v, r, rs) => {
        expect(standardVelocityFromActualMS(actualVelocityFromStandardMS(v, r, rs), r, rs)).toBeCloseTo(v, 9);
      }),
    );
  });
});
