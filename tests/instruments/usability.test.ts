import { describe, expect, it } from "vitest";
import { engineAccuracy } from "@/lib/instruments/accuracy";
import { instrumentName } from "@/lib/instruments/kinds";
import { calendarDate, calibrationProblems, daysBetween, formatCalendarDate, instrumentUsability, MIN_REASON_LENGTH } from "@/lib/instruments/usability";
import { instrumentCreateSchema, instrumentRecordProblems } from "@/lib/validation/instruments";

const meter = { serial: "MM-30418", calibrationDueOn: "2027-03-10", retiredAt: null };

describe("instrumentUsability", () => {
  it("counts calendar days across month ends and leap years", () => {
    // Calendar arithmetic (proleptic Gregorian): 2028 is a leap year, so 1 Feb → 1 Mar is 29 days.
    expect(daysBetween("2028-02-01", "2028-03-01")).toBe(29);
    expect(daysBetween("2027-02-01", "2027-03-01")).toBe(28);
    expect(daysBetween("2026-12-31", "2027-01-01")).toBe(1);
    expect(formatCalendarDate("2026-10-03")).toBe("3 Oct 2026");
    expect(() => calendarDate("2027-02-30")).toThrow(RangeError);
  });

  it("is in calibration through the due date, due soon within 30 days, and past due from the day after", () => {
    expect(instrumentUsability(meter, "2026-12-02")).toMatchObject({ status: "ok", ok: true, reasonRequired: false, daysUntilDue: 98, message: "Calibration due in 98 days" });
    expect(instrumentUsability(meter, "2027-02-26")).toMatchObject({ status: "due-soon", ok: true, message: "Calibration due in 12 days" });
    expect(instrumentUsability(meter, "2027-03-09")).toMatchObject({ status: "due-soon", message: "Calibration due in 1 day" });
    expect(instrumentUsability(meter, "2027-03-10")).toMatchObject({ status: "due-soon", ok: true, daysUntilDue: 0, message: "Calibration due today" });
    expect(instrumentUsability(meter, "2027-03-11")).toMatchObject({
      status: "overdue",
      ok: false,
      reasonRequired: true,
      usable: true,
      daysUntilDue: -1,
      message: "Calibration past due since 11 Mar 2027 (1 day)",
    });
  });

  it("asks for a reason when no due date is on record, and refuses a retired instrument for later readings only", () => {
    expect(instrumentUsability({ ...meter, calibrationDueOn: null }, "2026-12-02")).toMatchObject({ status: "no-due-date", ok: false, reasonRequired: true });
    const retired = { ...meter, retiredAt: "2026-11-30T15:00:00Z" };
    expect(instrumentUsability(retired, "2026-12-02")).toMatchObject({ status: "retired", usable: false, reasonRequired: false });
    // Readings taken before it was retired keep it.
    expect(instrumentUsability(retired, "2026-11-24")).toMatchObject({ status: "ok", usable: true });
  });

  it("takes a Date in the runtime's time zone", () => {
    const noonLocal = new Date(2027, 2, 11, 12, 0, 0);
    expect(instrumentUsability(meter, noonLocal).status).toBe("overdue");
  });
});

describe("calibrationProblems: the check on submission", () => {
  const overdue = { serial: "VA-7702", calibrationDueOn: "2026-10-01", retiredAt: null };
  it("passes instruments in calibration without a reason", () => {
    expect(calibrationProblems([{ field: "instrumentId", instrument: meter }], "2026-11-24", "")).toBeNull();
  });
  it("names the reason field and the overdue instrument until a reason is given", () => {
    const fields = calibrationProblems([{ field: "instrumentId", instrument: overdue }, { field: "airInstrumentId", instrument: meter }], "2026-11-24", "ok");
    expect(Object.keys(fields!)).toEqual(["overdueReason"]);
    expect(fields!.overdueReason).toContain("VA-7702 (calibration past due since 2 Oct 2026 (54 days))");
    expect(fields!.overdueReason).toContain(`at least ${MIN_REASON_LENGTH} characters`);
    expect(calibrationProblems([{ field: "instrumentId", instrument: overdue }], "2026-11-24", "Only vane on site; cross-checked against the hood at SD-101 within 3 %.")).toBeNull();
  });
  it("refuses a retired instrument on its own field, whatever the reason", () => {
    const fields = calibrationProblems([{ field: "probeInstrumentId", instrument: { ...meter, retiredAt: "2026-01-01T00:00:00Z" } }], "2026-11-24", "a long enough reason");
    expect(Object.keys(fields!)).toEqual(["probeInstrumentId"]);
  });
});

describe("the register's record rules", () => {
  const manometer = { kind: "manometer" as const, serial: "MM-1", calibratedOn: "2026-05-12", calibrationDueOn: "2027-05-12", rangeMin: -3735, rangeMax: 3735, accuracyPct: 1, accuracyFloor: 1 };
  it("accepts a complete manometer and fills the rest with nulls", () => {
    const parsed = instrumentCreateSchema.parse(manometer);
    expect(parsed).toMatchObject({ make: "", probeCoefficient: null, hoodCorrectionFactor: null, notes: "" });
  });
  it("names each field at fault with what is allowed", () => {
    const r = instrumentCreateSchema.safeParse({ ...manometer, rangeMin: 100, rangeMax: 50, probeCoefficient: 1, calibrationDueOn: "2026-05-01", accuracyFloor: 500 });
    expect(r.success).toBe(false);
    const fields = Object.fromEntries(r.error!.issues.map((i) => [i.path.join("."), i.message]));
    expect(fields.rangeMax).toBe("must be above the range minimum 100; got 50");
    expect(fields.probeCoefficient).toBe("applies to pitot tubes only; leave it empty");
    expect(fields.calibrationDueOn).toBe("must be after the calibration date 2026-05-12; got 2026-05-01");
    expect(fields.accuracyFloor).toBe("must be from 0 to 100 Pa for a manometer; got 500");
  });
  it("asks a pitot tube for its coefficient and refuses dates that are not dates or lie ahead", () => {
    const problems = instrumentRecordProblems(
      { kind: "pitot_tube", calibratedOn: "2027-01-05", calibrationDueOn: null, rangeMin: null, rangeMax: 900, accuracyPct: null, accuracyFloor: null, humidityAccuracyPct: null, probeCoefficient: null, probeHeadDiameterMm: 8, hoodCorrectionFactor: null },
      "2026-12-02",
    );
    expect(problems.probeCoefficient).toContain("1.0 for a standard pitot-static tube");
    expect(problems.calibratedOn).toBe("cannot be in the future (today is 2026-12-02); got 2027-01-05");
    const bad = instrumentCreateSchema.safeParse({ kind: "barometer", serial: "B-1", calibratedOn: "2026-02-30" });
    expect(bad.error!.issues[0]!.message).toBe('must be a real date as YYYY-MM-DD (e.g. 2027-03-10); got the text "2026-02-30"');
  });
});

describe("register to engine", () => {
  it("passes the stated accuracies of the reading and air instruments to the engine's uncertainty inputs", () => {
    expect(
      engineAccuracy([
        { kind: "manometer", accuracyPct: 1, accuracyFloor: 1, humidityAccuracyPct: null },
        { kind: "pitot_tube", accuracyPct: null, accuracyFloor: null, humidityAccuracyPct: null },
        { kind: "thermo_hygrometer", accuracyPct: null, accuracyFloor: 0.3, humidityAccuracyPct: 2 },
        { kind: "barometer", accuracyPct: null, accuracyFloor: 150, humidityAccuracyPct: null },
        null,
      ]),
    ).toEqual({ pressureAccuracyPct: 1, pressureFloorPa: 1, temperatureAccuracyC: 0.3, humidityAccuracyPct: 2, barometricAccuracyPa: 150 });
    expect(engineAccuracy([{ kind: "vane_anemometer", accuracyPct: 2, accuracyFloor: null, humidityAccuracyPct: null }])).toEqual({ velocityAccuracyPct: 2 });
  });
  it("names an instrument as a technician would", () => {
    expect(instrumentName({ kind: "manometer", make: "Airdex", model: "DM-40", serial: "MM-30418" })).toBe("Manometer · Airdex DM-40 · SN MM-30418");
    expect(instrumentName({ kind: "barometer", make: "", model: "", serial: "B-7" })).toBe("Barometer · SN B-7");
  });
});

describe("register values in the user's units", async () => {
  const { formatAccuracy, formatRange, kindUnit } = await import("@/lib/instruments/units");
  it("converts ranges as values and floors as differences (NIST SP 811: 1 in. w.c. = 249.08891 Pa; 1 K = 1.8 °F)", () => {
    expect(formatRange({ kind: "manometer", rangeMin: -3735, rangeMax: 3735 }, "SI")).toBe("-3,735 to 3,735 Pa");
    expect(formatRange({ kind: "manometer", rangeMin: -249.08891 * 15, rangeMax: 249.08891 * 15 }, "IP")).toBe("-15 to 15 in. w.c.");
    expect(formatRange({ kind: "pitot_tube", rangeMin: null, rangeMax: 914.4 }, "IP")).toBe("up to 36 in.");
    expect(formatAccuracy({ kind: "thermo_hygrometer", accuracyPct: null, accuracyFloor: 0.5, humidityAccuracyPct: 2 }, "IP")).toBe("±0.9 °F, ±2 % RH");
    const f = kindUnit("thermo_hygrometer", "IP")!;
    expect(f.fromDisplay(68)).toBeCloseTo(20, 9);
    expect(f.fromDisplay(0.9, { delta: true })).toBeCloseTo(0.5, 9);
    expect(kindUnit("tachometer", "IP")!.symbol).toBe("rpm");
    expect(kindUnit("clamp_meter", "SI")!.fromDisplay(12.5)).toBe(12.5);
  });
});
