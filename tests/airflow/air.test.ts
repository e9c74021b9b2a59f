import fc from "fast-check";
import psychrolib from "psychrolib";
import { describe, expect, it } from "vitest";
import {
  AirStateError,
  airConditionErrors,
  airState,
  barometricPressureFromAltitudePa,
  dynamicViscosityPaS,
  humidityRatioFromRelativeHumidity,
  humidityRatioFromWetBulb,
  moistAirDensityKgM3,
  saturationPressurePa,
} from "@/lib/airflow/air";

psychrolib.SetUnitSystem(psychrolib.SI);

/** Relative difference, for checks stated in ppm or %. */
const rel = (actual: number, expected: number) => Math.abs(actual / expected - 1);

// psychrolib switches from the ice to the water formula at the triple point (0.01 °C), we at 0 °C;
// property checks stay clear of that 0.01 K band.
const notInTriplePointBand = (t: number) => t < 0 || t > 0.01;

describe("saturationPressurePa", () => {
  it.each([
    // ASHRAE Handbook Fundamentals ch. 1, table 3 (thermodynamic properties of water at saturation)
    [5, 872.6],
    [25, 3169.7],
    [50, 12_351],
  ])("at %s °C is within 300 ppm of the ASHRAE table value %s Pa", (tempC, tablePa) => {
    // 300 ppm: the accuracy the Hyland–Wexler formulas claim against the table (ASHRAE Fundamentals ch. 1).
    expect(rel(saturationPressurePa(tempC), tablePa)).toBeLessThan(300e-6);
  });

  it("matches psychrolib GetSatVapPres over ice (−40…0 °C) and over water (0.01…120 °C)", () => {
    fc.assert(
      fc.property(fc.double({ min: -40, max: 120, noNaN: true }).filter(notInTriplePointBand), (t) => {
        expect(rel(saturationPressurePa(t), psychrolib.GetSatVapPres(t))).toBeLessThan(1e-9);
      }),
      { numRuns: 500 },
    );
  });

  it("is continuous to within 0.02 % across 0 °C, where ice and water vapour pressures meet at the triple point", () => {
    // Physics: p_ws over ice and over water are equal at the triple point (611.657 Pa, IAPWS, from memory).
    expect(rel(saturationPressurePa(-1e-9), saturationPressurePa(0))).toBeLessThan(2e-4);
    expect(rel(saturationPressurePa(0), 611.657)).toBeLessThan(1e-3);
  });
});

describe("barometricPressureFromAltitudePa", () => {
  it.each([
    // ASHRAE Handbook Fundamentals ch. 1, table 1 (standard atmospheric data)
    [0, 101_325],
    [500, 95_461],
    [1000, 89_875],
  ])("at %s m is the standard-atmosphere table value %s Pa (±1 Pa rounding)", (z, tablePa) => {
    expect(Math.abs(barometricPressureFromAltitudePa(z) - tablePa)).toBeLessThanOrEqual(1);
  });

  it("matches psychrolib GetStandardAtmPressure from −500 to 5 000 m", () => {
    fc.assert(
      fc.property(fc.double({ min: -500, max: 5000, noNaN: true }), (z) => {
        expect(rel(barometricPressureFromAltitudePa(z), psychrolib.GetStandardAtmPressure(z))).toBeLessThan(1e-12);
      }),
    );
  });
});

describe("humidity ratio", () => {
  const pressure = fc.double({ min: 40_000, max: 120_000, noNaN: true });

  it("from RH matches psychrolib GetHumRatioFromRelHum wherever the air can exist", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -40, max: 120, noNaN: true }).filter(notInTriplePointBand),
        fc.double({ min: 0, max: 100, noNaN: true }),
        pressure,
        (t, rh, p) => {
          fc.pre((rh / 100) * psychrolib.GetSatVapPres(t) < 0.95 * p);
          const expected = psychrolib.GetHumRatioFromRelHum(t, rh / 100, p);
          fc.pre(expected > 1e-6); // psychrolib floors W at 1e-7
          expect(rel(humidityRatioFromRelativeHumidity(t, rh, p), expected)).toBeLessThan(1e-9);
        },
      ),
      { numRuns: 500 },
    );
  });

  it("from wet-bulb matches psychrolib GetHumRatioFromTWetBulb, wetted (eq. 33) and iced (eq. 35) wick", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -40, max: 120, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        pressure,
        (t, f, p) => {
          // Clamp: rounding can put -40 + 1·(t + 40) an ulp above t, a wet-bulb above the dry-bulb.
          const wb = Math.min(t, -40 + f * (t + 40));
          fc.pre(notInTriplePointBand(wb) && psychrolib.GetSatVapPres(wb) < 0.95 * p);
          const expected = psychrolib.GetHumRatioFromTWetBulb(t, wb, p);
          fc.pre(expected > 1e-6);
          expect(rel(humidityRatioFromWetBulb(t, wb, p), expected)).toBeLessThan(1e-9);
        },
      ),
      { numRuns: 500 },
    );
  });

  it("equals the saturation humidity ratio when the wet-bulb equals the dry-bulb (saturated air)", () => {
    // ASHRAE Fundamentals ch. 1 eq. 33 with t* = t reduces to W = Ws*; eq. 20: Ws = 0.621945·pws/(p − pws).
    const pws = psychrolib.GetSatVapPres(20);
    expect(rel(humidityRatioFromWetBulb(20, 20, 101_325), (0.621945 * pws) / (101_325 - pws))).toBeLessThan(1e-12);
  });
});

describe("moistAirDensityKgM3", () => {
  it("gives 1.204 kg/m³ for dry air at 20 °C and 101 325 Pa (standard air, ASHRAE SI, common practice)", () => {
    expect(moistAirDensityKgM3(20, 0, 101_325)).toBeCloseTo(1.204, 3);
  });

  it("gives 1.084120 kg/m³ at 30 °C, W = 0.02, 95 461 Pa (psychrolib GetMoistAirDensity)", () => {
    expect(moistAirDensityKgM3(30, 0.02, 95_461)).toBeCloseTo(1.08412, 6);
  });

  it("matches psychrolib GetMoistAirDensity over the validated range", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -40, max: 120, noNaN: true }),
        fc.double({ min: 1e-6, max: 0.5, noNaN: true }),
        fc.double({ min: 40_000, max: 120_000, noNaN: true }),
        (t, w, p) => {
          expect(rel(moistAirDensityKgM3(t, w, p), psychrolib.GetMoistAirDensity(t, w, p))).toBeLessThan(1e-12);
        },
      ),
    );
  });
});

describe("dynamicViscosityPaS", () => {
  it.each([
    // Air at 1 atm, Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, table A.4 (from memory)
    [250, 159.6e-7],
    [300, 184.6e-7],
    [350, 208.2e-7],
  ])("at %s K is within 1 %% of the tabulated %s Pa·s", (tK, tablePaS) => {
    expect(rel(dynamicViscosityPaS(tK - 273.15), tablePaS)).toBeLessThan(0.01);
  });
});

describe("airState", () => {
  it("combines altitude, static, RH into the same density psychrolib gives", () => {
    const state = airState({ dryBulbC: 24, altitudeM: 1000, staticPa: -400, relativeHumidityPct: 45 });
    const p = psychrolib.GetStandardAtmPressure(1000) - 400;
    const w = psychrolib.GetHumRatioFromRelHum(24, 0.45, p);
    expect(state.barometricSource).toBe("altitude");
    expect(state.absolutePressurePa).toBeCloseTo(p, 6);
    expect(rel(state.humidityRatio, w)).toBeLessThan(1e-9);
    expect(rel(state.densityKgM3, psychrolib.GetMoistAirDensity(24, w, p))).toBeLessThan(1e-9);
    expect(state.relativeHumidityPct).toBeCloseTo(45, 9);
    expect(state.warnings).toEqual([]);
  });

  it("uses a measured barometric pressure over altitude, and flags one far from the standard atmosphere", () => {
    const state = airState({ dryBulbC: 20, barometricPa: 101_325, altitudeM: 1000, staticPa: 0, wetBulbC: 14 });
    expect(state.barometricPa).toBe(101_325);
    expect(state.barometricSource).toBe("measured");
    expect(state.warnings.join(" ")).toMatch(/sea-level-corrected/);
  });

  it("flags a static pressure beyond ±2 500 Pa, RH 100 % below 0 °C, and density outside 0.7–1.5 kg/m³", () => {
    expect(airState({ dryBulbC: 20, barometricPa: 100_000, staticPa: -3000, relativeHumidityPct: 50 }).warnings.join(" ")).toMatch(/±2,500 Pa/);
    expect(airState({ dryBulbC: -5, barometricPa: 100_000, staticPa: 0, relativeHumidityPct: 100 }).warnings.join(" ")).toMatch(/iced or wetted sensor/);
    const hot = airState({ dryBulbC: 120, barometricPa: 60_000, staticPa: 0, relativeHumidityPct: 5 });
    expect(hot.densityKgM3).toBeLessThan(0.7);
    expect(hot.warnings.join(" ")).toMatch(/outside 0.7–1.5 kg\/m³/);
  });

  it("flags a wet-bulb below what dry air could read and assumes dry air instead of a negative humidity", () => {
    // ASHRAE eq. 33 solved for W = 0 at 40 °C, 101 325 Pa gives a wet-bulb near 14.6 °C (worked by hand): 5 °C is impossible.
    expect(humidityRatioFromWetBulb(40, 5, 101_325)).toBeLessThan(0);
    const state = airState({ dryBulbC: 40, barometricPa: 101_325, staticPa: 0, wetBulbC: 5 });
    expect(state.humidityRatio).toBe(0);
    expect(state.warnings.join(" ")).toMatch(/Dry air was assumed/);
  });

  it("rejects conditions that cannot exist, naming the field, the value and what is allowed", () => {
    // 100 °C at 90 % RH needs ~91 kPa of vapour (ASHRAE table 3: 101.4 kPa at 100 °C); the plane is at 60 kPa.
    const impossible = { dryBulbC: 100, barometricPa: 60_000, staticPa: 0, relativeHumidityPct: 90 };
    expect(Object.keys(airConditionErrors(impossible))).toEqual(["air.relative_humidity_pct"]);
    expect(() => airState(impossible)).toThrow(AirStateError);
    try {
      airState(impossible);
    } catch (e) {
      expect((e as AirStateError).fields["air.relative_humidity_pct"]).toMatch(/90 % RH.*60,000 Pa absolute/);
    }
    expect(airConditionErrors({ dryBulbC: 20, staticPa: 0, relativeHumidityPct: 50 })).toHaveProperty(["air.barometric_pa"]);
    expect(airConditionErrors({ dryBulbC: 20, altitudeM: 0, staticPa: 0, relativeHumidityPct: 50, wetBulbC: 15 }, "x")).toHaveProperty(["x.relative_humidity_pct"]);
    expect(airConditionErrors({ dryBulbC: 20, altitudeM: 0, staticPa: 0, wetBulbC: 21 })["air.wet_bulb_c"]).toMatch(/21 °C is above the dry-bulb 20 °C/);
  });

  it("never returns NaN or infinity for any validated input that airConditionErrors accepts", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -40, max: 120, noNaN: true }),
        fc.oneof(fc.record({ barometricPa: fc.double({ min: 50_000, max: 110_000, noNaN: true }) }), fc.record({ altitudeM: fc.double({ min: -500, max: 5000, noNaN: true }) })),
        fc.double({ min: -10_000, max: 10_000, noNaN: true }),
        fc.oneof(fc.record({ rh: fc.double({ min: 0, max: 100, noNaN: true }) }), fc.record({ wbFraction: fc.double({ min: 0, max: 1, noNaN: true }) })),
        (dryBulbC, pressure, staticPa, humidity) => {
          const conditions = {
            dryBulbC,
            staticPa,
            ...pressure,
            ...("rh" in humidity ? { relativeHumidityPct: humidity.rh } : { wetBulbC: -40 + humidity.wbFraction * (dryBulbC + 40) }),
          };
          fc.pre(Object.keys(airConditionErrors(conditions)).length === 0);
          const s = airState(conditions);
          for (const v of [s.absolutePressurePa, s.humidityRatio, s.vapourPressurePa, s.densityKgM3, s.viscosityPaS, s.relativeHumidityPct]) {
            expect(Number.isFinite(v)).toBe(true);
          }
          expect(s.densityKgM3).toBeGreaterThan(0);
        },
      ),
      { numRuns: 1000 },
    );
  });
});
