/** A synthetic closeout-report model for the renderer's layout test and the bench. */
import type { ReportModel, ReportTraverse } from "@/lib/report/model";

const LONG = "Above the corridor ceiling between gridlines C and D, reached from the riser cupboard's access panel behind the fire door ".repeat(3);

function traverse(n: number): ReportTraverse {
  const lines = n % 2 === 0 ? 10 : 2;
  const pointsPerLine = n % 2 === 0 ? 10 : 12;
  const rect = n % 2 === 0;
  const points = [];
  const layout = [];
  for (let k = 0; k < lines; k++) {
    const pts = [];
    for (let i = 0; i < pointsPerLine; i++) {
      const pos = ((i + 0.5) / pointsPerLine) * (rect ? 800 : 1000);
      pts.push({ xMm: rect ? ((k + 0.5) / lines) * 1600 : 0, yMm: rect ? pos : 500 - pos, depthMm: pos + 25, readPositionMm: pos, beyondProbeReach: i === 0 });
      points.push({ line: k, point: i, depthMm: pos + 25, readPositionMm: pos, reading: i === 3 ? null : 12 + ((i * 7 + k * 3) % 9), velocityMS: i === 3 ? null : 4 + ((i + k) % 5) * 0.4, filledFrom: i === 3 ? "along line" : null, filledVelocityMS: i === 3 ? 4.5 : null, beyondReach: i === 0 });
    }
    layout.push(rect ? { xMm: ((k + 0.5) / lines) * 1600, points: pts } : { angleDeg: 90 + k * 90, points: pts });
  }
  return {
    systemTag: `AHU-${Math.floor(n / 5) + 1}`,
    sectionTag: `S${n}.${n % 7}`,
    location: LONG,
    revision: 1 + (n % 3),
    status: "approved",
    rule: rect ? "Log-Tchebycheff" : "Log-linear",
    duct: rect ? { shape: "rectangular", widthMm: 1600, heightMm: 800 } : { shape: "round", diameterMm: 1000 },
    lines,
    pointsPerLine,
    layout,
    readingsKind: "velocity_pressure",
    points,
    air: { dryBulbC: 18.2, relativeHumidityPct: 51, barometricPa: 99_120, barometricSource: "measured", staticPa: 240, staticAssumed: n % 4 === 0 },
    densityKgM3: 1.19,
    standardDensityKgM3: 1.204,
    meanVelocityMS: 4.8,
    areaM2: 1.28,
    flowM3S: 6.1,
    standardFlowM3S: 6.03,
    massFlowKgS: 7.26,
    designM3S: 6.5,
    pctOfDesign: 92.8,
    pass: true,
    band: "±10 %",
    verdict: n % 3 === 0 ? "marginal" : "good",
    verdictReasons: [LONG],
    uncertainty: "± 6.1 % (k = 2, about 95 %)",
    integration: "Equal weights, 10 points filled from counterparts",
    warnings: [LONG, "8 points per line is fewer than the 10 recommended for this duct."],
    instruments: ["Manometer · Maker Model · SN 1", "Pitot-static tube · Maker · SN 2", "Thermo-hygrometer · Maker · SN 3"],
    takenBy: "Technician Name",
    takenAt: "2026-11-24T10:00:00Z",
    notes: LONG,
    review: { by: "Agent Name", at: "2026-11-25T10:00:00Z", witnessed: true, comment: LONG },
  };
}

/**
 * A project far larger than the demo: long names and notes everywhere, many sections, terminals and
 * traverses (by default 6 systems of 45 terminals and 14 traverses; the bench asks for 50 traverses and
 * 500 terminals). Invented numbers, for layout and timing only.
 */
export function longModel(size: { systems?: number; terminalsPerSystem?: number; traverses?: number } = {}): ReportModel {
  const systems = Array.from({ length: size.systems ?? 6 }, (_, k) => ({
    tag: `AHU-${k + 1}`,
    name: `Air handler serving the ${LONG.slice(0, 60)}`,
    kind: "Supply",
    location: LONG.slice(0, 90),
    designM3S: 12,
    rows: Array.from({ length: 30 }, (_, i) => ({
      tag: `S${k}.${i}`,
      location: i % 5 === 0 ? LONG : `Level ${i}`,
      depth: i % 4,
      status: (i % 3 === 0 ? "submitted" : "approved") as "submitted" | "approved",
      excluded: i % 3 === 0,
      designM3S: 0.4 + i * 0.01,
      measuredM3S: i % 3 === 0 ? null : 0.41 + i * 0.01,
      pctOfDesign: i % 3 === 0 ? null : 101,
      pass: i % 3 === 0 ? null : true,
      band: "−5 / +10 %",
    })),
    junctions: Array.from({ length: 12 }, (_, i) => ({
      parentTag: `S${k}.${i}`,
      childTags: Array.from({ length: 9 }, (_, c) => `S${k}.${i}.${c}`),
      status: (i % 2 === 0 ? "checked" : "waiting") as "checked" | "waiting",
      missing: i % 2 === 0 ? [] : [`S${k}.${i}.1`, `S${k}.${i}.4`],
      parentMassKgS: 1.2,
      childrenMassKgS: 1.15,
      imbalanceKgS: 0.05,
      imbalancePct: 4.2,
      imbalanceStandardM3S: 0.041,
      pass: true,
      note: LONG,
    })),
    terminalSet: { status: "approved" as const, excluded: false, revision: 2 },
    terminals: Array.from({ length: size.terminalsPerSystem ?? 45 }, (_, i) => ({
      tag: `SD-${k}${i}`,
      room: i % 6 === 0 ? LONG : `Room ${i}`,
      device: "Four-way ceiling diffuser",
      kind: "outlet" as const,
      setpoint: "Design",
      designM3S: 0.12,
      band: "±10 %",
      initial: { standardFlowM3S: 0.11, pctOfDesign: 92, pass: true, method: "Capture hood", takenAt: "2026-11-24T10:00:00Z" },
      final: i % 4 === 0 ? null : { standardFlowM3S: 0.121, pctOfDesign: 101, pass: true, method: "Capture hood", takenAt: "2026-11-25T10:00:00Z" },
    })),
    conditions: [LONG],
  }));
  return {
    kind: "issued",
    generatedAt: "2026-12-01T10:00:00Z",
    units: "IP",
    project: { name: `A very long project name ${LONG.slice(0, 80)}`, siteName: "Site", address: LONG, altitudeM: 300, standardDensityKgM3: 1.2 },
    revision: 12,
    code: "7KQ2-M9XD-4RTP",
    verifyUrl: "https://tab.example.test/verify/7KQ2-M9XD-4RTP",
    reason: LONG,
    period: { from: "2026-11-24T10:00:00Z", to: "2026-11-30T10:00:00Z" },
    measuredBy: Array.from({ length: 12 }, (_, i) => `Technician Number ${i + 1}`),
    tolerances: { fan: "±5 %", section: "±10 %", outlet: "−5 / +10 %", terminalUnit: "±10 %", continuityPct: 10 },
    certification: { state: "signed", name: "Supervisor Name", certifyingBody: LONG.slice(0, 100), certificateNumber: "X-1", statement: LONG.repeat(3), signedAt: "2026-11-30T10:00:00Z" },
    systems,
    traverses: Array.from({ length: size.traverses ?? 14 }, (_, n) => traverse(n)),
    instruments: Array.from({ length: 40 }, (_, i) => ({ kind: "Manometer", name: i % 7 === 0 ? LONG : "Maker Model", serial: `SN-${i}`, calibratedOn: "2026-01-01", calibrationDueOn: "2027-01-01", certificateNumber: "C-1", state: i % 5 === 0 ? "overdue at use" : "current" })),
    photos: [],
    verification: {
      recorded: true,
      by: "Agent Name",
      at: "2026-11-30T10:00:00Z",
      sampleSize: "12 of 40 points (30 %)",
      result: "passed",
      tolerance: "±10 %",
      items: Array.from({ length: 60 }, (_, i) => ({ item: `SD-${i}`, reportedM3S: 0.12, verifiedM3S: 0.118, differencePct: -1.7, pass: true })),
      comment: LONG,
    },
    deviations: Array.from({ length: 25 }, (_, i) => ({ item: `S${i}`, pctOfDesign: 86, reason: LONG, acceptedBy: "Engineer Name", acceptedAt: "2026-11-30T10:00:00Z" })),
    approvals: [
      { name: "Agent Name", role: "Commissioning agent", at: "2026-11-30T10:00:00Z", what: LONG },
      { name: "Engineer Name", role: "Engineer of record", at: "2026-11-30T10:00:00Z", what: "Approved the content of revision 12" },
    ],
  };
}
