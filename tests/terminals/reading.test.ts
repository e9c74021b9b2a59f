import { describe, expect, it } from "vitest";
import { quantityFormat } from "@/lib/terminals/format";
import { currentReading, latestByPhase } from "@/lib/terminals/history";
import { computeReadingFlow, judgeReading, ReadingInputError, type ProjectBasis, type ReadingValues } from "@/lib/terminals/reading";
import { designFlowAt, setpointsFor, type TerminalDesign } from "@/lib/terminals/setpoints";
import { convert } from "@/lib/units";

const cfm = (v: number) => convert(v, "cfm", "m3/s");

// A project with −5 / +10 % on outlets (as some specifications write it) and ±10 % on terminal units.
const project: ProjectBasis = {
  altitudeM: 35,
  standardDensityKgM3: 1.2014, // 0.075 lb/ft³, US standard air (common practice)
  outletToleranceMinusPct: 5,
  outletTolerancePlusPct: 10,
  terminalUnitToleranceMinusPct: 10,
  terminalUnitTolerancePlusPct: 10,
  fanToleranceMinusPct: 5,
  fanTolerancePlusPct: 5,
  sectionToleranceMinusPct: 10,
  sectionTolerancePlusPct: 10,
  outsideAirToleranceMinusPct: 0,
  outsideAirTolerancePlusPct: 10,
};

const diffuser: TerminalDesign = { kind: "diffuser", designFlowM3S: cfm(200), designMinFlowM3S: null, designHeatingFlowM3S: null, effectiveAreaM2: null, controllerFlowFactor: null };
const vav: TerminalDesign = { kind: "vav_box", designFlowM3S: cfm(700), designMinFlowM3S: cfm(210), designHeatingFlowM3S: cfm(350), controllerFlowFactor: 0.87, effectiveAreaM2: null };

const base: ReadingValues = {
  method: "hood",
  phase: "initial",
  setpoint: "design",
  hoodFlowM3S: cfm(200),
  hoodCorrectionFactor: 1,
  hoodDensityCorrected: true,
  hoodBackPressureCompensated: true,
  velocitiesMS: null,
  velocityBasis: null,
  effectiveAreaM2: null,
  dryBulbC: 21,
  relativeHumidityPct: 50,
  barometricPa: null,
  controllerFlowM3S: null,
  controllerFlowFactor: null,
  damperMarked: false,
};

describe("setpoints", () => {
  it("reads outlets at design and terminal units at maximum, minimum and heating where scheduled", () => {
    expect(setpointsFor(diffuser)).toEqual(["design"]);
    expect(setpointsFor(vav)).toEqual(["maximum", "minimum", "heating"]);
    expect(setpointsFor({ ...vav, designHeatingFlowM3S: null })).toEqual(["maximum", "minimum"]);
    expect(designFlowAt(vav, "minimum")).toBe(cfm(210));
    expect(designFlowAt(vav, "design")).toBeNull();
    expect(designFlowAt(diffuser, "maximum")).toBeNull();
  });
});

describe("judgeReading against an asymmetric band (−5 / +10 %, project specifications)", () => {
  const judge = (pct: number, terminal = diffuser, setpoint: ReadingValues["setpoint"] = "design") =>
    judgeReading({ ...base, setpoint, standardFlowM3S: (designFlowAt(terminal, setpoint)! * pct) / 100 }, terminal, project);

  it("passes 95 % and 110 %, fails 94.9 % and 110.1 % for an outlet", () => {
    expect([judge(95), judge(110), judge(94.9), judge(110.1)].map((j) => j.withinTolerance)).toEqual([true, true, false, false]);
    expect(judge(95).tolerance).toEqual({ minusPct: 5, plusPct: 10 });
    expect(judge(95).toleranceCategory).toBe("outlet");
    expect(judge(103).pctOfDesign).toBeCloseTo(103, 9);
  });

  it("judges a terminal unit in the terminal-unit band at the setpoint read", () => {
    const j = judge(91, vav, "minimum");
    expect(j.toleranceCategory).toBe("terminalUnit");
    expect(j.designFlowM3S).toBe(cfm(210));
    expect(j.withinTolerance).toBe(true);
  });

  it("says in the user's units what is implausible, and keeps quiet about a sound reading", () => {
    const ip = quantityFormat("IP");
    const j = judgeReading(
      { ...base, method: "velocity_area", velocitiesMS: [convert(350, "fpm", "m/s"), convert(6500, "fpm", "m/s")], standardFlowM3S: cfm(650), phase: "final" },
      diffuser,
      project,
      { instrument: { label: "vane anemometer", serial: "VA-1", rangeMin: convert(60, "fpm", "m/s"), rangeMax: convert(6000, "fpm", "m/s") }, format: ip },
    );
    expect(j.flags).toEqual([
      "3.3 × design: more than 3 times the design airflow. Check the outlet tag, the hood top or Ak, and the units.",
      "Beyond the range of vane anemometer VA-1 (60 fpm to 6,000 fpm): reading 2: 6,500 fpm. Readings outside the stated range carry no stated accuracy.",
      "Final reading without the damper position marked: mark it so the setting can be found again.",
    ]);
    expect(judge(100).flags).toEqual([]);
  });

  it("checks a terminal unit's controller: measured ÷ displayed, the factor that corrects it, and a difference too large to be a factor", () => {
    const j = judgeReading({ ...base, setpoint: "maximum", standardFlowM3S: cfm(630), controllerFlowM3S: cfm(700) }, vav, project);
    expect(j.controller!.ratio).toBeCloseTo(0.9, 12);
    expect(j.controller!.suggestedFlowFactor).toBeCloseTo(0.87 * 0.81, 12);
    const far = judgeReading({ ...base, setpoint: "maximum", standardFlowM3S: cfm(300), controllerFlowM3S: cfm(700) }, vav, project);
    expect(far.flags.join(" ")).toContain("swapped sensor tubes");
    // An outlet has no controller, whatever was sent.
    expect(judgeReading({ ...base, standardFlowM3S: cfm(200), controllerFlowM3S: cfm(700) }, diffuser, project).controller).toBeNull();
  });
});

describe("computeReadingFlow", () => {
  it("explains a hood reading in the user's units and refers it with the air at the outlet", () => {
    const r = computeReadingFlow({ ...base, hoodDensityCorrected: false, hoodCorrectionFactor: 1.04 }, diffuser, project, { format: quantityFormat("IP") });
    expect(r.steps[0]).toBe("Hood reading 200 cfm × correction factor 1.04 = 208 cfm.");
    expect(r.steps[1]).toMatch(/^Not density-corrected by the hood: referred to standard air with the air at the outlet \(69\.8 °F, 29\.8\d in\. Hg from the project's altitude: 0\.07\d\d lb\/ft³\)/);
    expect(r.flowM3S).toBeCloseTo(cfm(208), 12);
    expect(r.standardFlowM3S).toBeCloseTo((cfm(208) * r.densityKgM3!) / 1.2014, 12);
  });

  it("names what is missing: the dry-bulb, the hood's figure, the velocities and the effective area", () => {
    expect(() => computeReadingFlow({ ...base, dryBulbC: null }, diffuser, project)).toThrow(ReadingInputError);
    expect(() => computeReadingFlow({ ...base, method: "velocity_area", hoodFlowM3S: null }, diffuser, project)).toThrow(
      expect.objectContaining({ fields: { effectiveAreaM2: expect.any(String), velocitiesMS: expect.any(String), velocityBasis: expect.any(String) } }),
    );
    expect(() => computeReadingFlow({ ...base, hoodFlowM3S: null }, diffuser, project)).toThrow(expect.objectContaining({ fields: { hoodFlowM3S: "give the hood's reading" } }));
  });

  it("uses a stored density as it is, so an old reading explains itself the same way after the project changes", () => {
    const r = computeReadingFlow({ ...base, hoodDensityCorrected: false }, diffuser, { ...project, altitudeM: 1500 }, { densityKgM3: 1.15 });
    expect(r.standardFlowM3S).toBeCloseTo((cfm(200) * 1.15) / 1.2014, 12);
  });
});

describe("history", () => {
  const r = (id: string, phase: "initial" | "final", setpoint: "maximum" | "minimum", at: string) => ({ id, phase, setpoint, takenAt: at });
  const readings = [
    r("a", "initial", "maximum", "2026-11-24T10:00:00Z"),
    r("b", "final", "maximum", "2026-11-24T11:00:00Z"),
    r("c", "final", "maximum", "2026-11-24T12:00:00Z"),
    r("d", "initial", "minimum", "2026-11-24T10:30:00Z"),
  ];
  it("picks the latest initial and final at each setpoint, and the newest of either as the current reading", () => {
    const latest = latestByPhase(readings);
    expect(latest.maximum).toEqual({ initial: readings[0], final: readings[2] });
    expect(latest.minimum).toEqual({ initial: readings[3], final: null });
    expect(currentReading(readings, "maximum")!.id).toBe("c");
    expect(currentReading(readings, "minimum")!.id).toBe("d");
  });
});
