/**
 * The project's acceptance bands around design airflow per category: −minus % … +plus % of design
 * (asymmetric bands such as −5 / +10 % are common in specifications; contract documents govern).
 * Judge a reading with `withinTolerance` from ./balancing.
 */
import type { Tolerance } from "./balancing";

export type ToleranceCategory = "fan" | "section" | "outlet" | "terminalUnit" | "outsideAir";

/** The project's band for a category, from its settings columns. */
export function toleranceFor(
  project: {
    fanToleranceMinusPct: number;
    fanTolerancePlusPct: number;
    sectionToleranceMinusPct: number;
    sectionTolerancePlusPct: number;
    outletToleranceMinusPct: number;
    outletTolerancePlusPct: number;
    terminalUnitToleranceMinusPct: number;
    terminalUnitTolerancePlusPct: number;
    outsideAirToleranceMinusPct: number;
    outsideAirTolerancePlusPct: number;
  },
  category: ToleranceCategory,
): Tolerance {
  switch (category) {
    case "fan":
      return { minusPct: project.fanToleranceMinusPct, plusPct: project.fanTolerancePlusPct };
    case "section":
      return { minusPct: project.sectionToleranceMinusPct, plusPct: project.sectionTolerancePlusPct };
    case "outlet":
      return { minusPct: project.outletToleranceMinusPct, plusPct: project.outletTolerancePlusPct };
    case "terminalUnit":
      return { minusPct: project.terminalUnitToleranceMinusPct, plusPct: project.terminalUnitTolerancePlusPct };
    case "outsideAir":
      return { minusPct: project.outsideAirToleranceMinusPct, plusPct: project.outsideAirTolerancePlusPct };
  }
}

/** "±10 %" for a symmetric band, "−5 / +10 %" otherwise. */
export function formatTolerance(band: Tolerance): string {
  return band.minusPct === band.plusPct ? `±${band.minusPct} %` : `−${band.minusPct} / +${band.plusPct} %`;
}
