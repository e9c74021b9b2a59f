/**
 * The closeout report as data: a plain, serialisable object (SI numbers, ISO times, strings) that
 * lib/server/report-data.ts gathers from the database and lib/report/render.ts turns into PDF bytes.
 * Nothing here reads the database or draws anything, so the renderer can be tested on any model.
 */
import type { UnitSystem } from "@/lib/units";

/** Where an item stands in review. "not read": no data at all. */
export type ItemStatus = "approved" | "submitted" | "draft" | "returned" | "not read";

export interface ReportPerson {
  name: string;
  role: string;
  /** ISO time of their approval or signature in the app. */
  at: string;
}

export interface ReportModel {
  kind: "draft" | "issued";
  /** ISO time the model was gathered. */
  generatedAt: string;
  units: UnitSystem;
  project: { name: string; siteName: string; address: string; altitudeM: number; standardDensityKgM3: number };
  /** Issued: the revision and verification code printed on every page. Draft: null. */
  revision: number | null;
  code: string | null;
  /** The link printed and encoded in the QR code: `/verify/<code>` when issued, the verification page for a draft. */
  verifyUrl: string;
  /** Why this revision replaces the previous one (revision 2 on). */
  reason: string;
  /** First and last reading taken, ISO dates. */
  period: { from: string | null; to: string | null };
  measuredBy: string[];
  tolerances: { fan: string; section: string; outlet: string; terminalUnit: string; continuityPct: number };
  certification: ReportCertification;
  systems: ReportSystem[];
  traverses: ReportTraverse[];
  instruments: ReportInstrument[];
  photos: ReportPhoto[];
  verification: ReportVerification;
  deviations: ReportDeviation[];
  approvals: ReportApproval[];
}

export interface ReportCertification {
  /** "none": no supervisor designated; "unsigned": designated, statement not signed yet. */
  state: "signed" | "unsigned" | "none";
  name: string | null;
  certifyingBody: string | null;
  certificateNumber: string | null;
  statement: string | null;
  signedAt: string | null;
}

/** One line of a system's summary: the fan or a duct section, design against measured. */
export interface SummaryRow {
  tag: string;
  location: string;
  depth: number;
  status: ItemStatus;
  /** Issued reports: true for an item whose data were not approved (shown, never dropped). */
  excluded: boolean;
  designM3S: number;
  /** Standard flow measured, m³/s; null when not read or excluded. */
  measuredM3S: number | null;
  pctOfDesign: number | null;
  pass: boolean | null;
  /** The acceptance band in words, e.g. "±10 %". */
  band: string;
}

export interface JunctionRow {
  parentTag: string;
  childTags: string[];
  /** "waiting": some member not measured (or excluded), named in `missing`. */
  status: "checked" | "waiting";
  missing: string[];
  parentMassKgS: number | null;
  childrenMassKgS: number | null;
  imbalanceKgS: number | null;
  imbalancePct: number | null;
  imbalanceStandardM3S: number | null;
  pass: boolean | null;
  note: string;
}

export interface TerminalRow {
  tag: string;
  room: string;
  device: string;
  kind: "outlet" | "terminal unit";
  setpoint: string;
  designM3S: number | null;
  band: string;
  initial: TerminalReadingCell | null;
  final: TerminalReadingCell | null;
}

export interface TerminalReadingCell {
  standardFlowM3S: number;
  pctOfDesign: number | null;
  pass: boolean | null;
  method: string;
  takenAt: string;
}

export interface ReportSystem {
  tag: string;
  name: string;
  kind: string;
  location: string;
  designM3S: number;
  rows: SummaryRow[];
  junctions: JunctionRow[];
  terminalSet: { status: ItemStatus; excluded: boolean; revision: number | null };
  terminals: TerminalRow[];
  /** The operating conditions the terminal readings were taken under, in words. */
  conditions: string[];
}

export interface ReportTraversePoint {
  line: number;
  point: number;
  depthMm: number;
  readPositionMm: number;
  /** As read: Pa for pitot readings, m/s for anemometers; null when not read. */
  reading: number | null;
  velocityMS: number | null;
  /** How a point not read was filled, and the velocity used. */
  filledFrom: string | null;
  filledVelocityMS: number | null;
  beyondReach: boolean;
}

export interface ReportTraverse {
  systemTag: string;
  sectionTag: string;
  location: string;
  revision: number;
  status: ItemStatus;
  rule: string;
  duct: { shape: "round"; diameterMm: number } | { shape: "rectangular"; widthMm: number; heightMm: number };
  lines: number;
  pointsPerLine: number;
  /** The layout's lines for the drawing (mm): round ports at their angles, rectangular lines at their x. */
  layout: { angleDeg?: number; xMm?: number; points: { xMm: number; yMm: number; depthMm: number; readPositionMm: number; beyondProbeReach?: boolean }[] }[];
  readingsKind: "velocity_pressure" | "velocity_actual" | "velocity_standard";
  points: ReportTraversePoint[];
  air: { dryBulbC: number; relativeHumidityPct: number; barometricPa: number; barometricSource: string; staticPa: number; staticAssumed: boolean };
  densityKgM3: number;
  standardDensityKgM3: number;
  meanVelocityMS: number;
  areaM2: number;
  flowM3S: number;
  standardFlowM3S: number;
  massFlowKgS: number;
  designM3S: number;
  pctOfDesign: number;
  pass: boolean;
  band: string;
  verdict: "good" | "marginal" | "poor";
  verdictReasons: string[];
  /** "± 6.1 % (k = 2, about 95 %)". */
  uncertainty: string;
  integration: string;
  warnings: string[];
  instruments: string[];
  takenBy: string | null;
  takenAt: string | null;
  notes: string;
  review: { by: string; at: string; witnessed: boolean; comment: string } | null;
}

export interface ReportInstrument {
  kind: string;
  name: string;
  serial: string;
  calibratedOn: string | null;
  calibrationDueOn: string | null;
  certificateNumber: string;
  /** "current", "overdue at use", "no calibration on record". */
  state: string;
}

export interface ReportPhoto {
  sectionTag: string;
  systemTag: string;
  caption: string;
  takenBy: string | null;
  takenAt: string;
  /** The image itself (JPEG or PNG), base64, or null when storage did not return it. */
  format: "jpeg" | "png";
  base64: string | null;
  width: number | null;
  height: number | null;
}

/** The commissioning agent's verification sample: re-readings of a share of the reported values. */
export type ReportVerification =
  | { recorded: false }
  | {
      recorded: true;
      by: string;
      at: string;
      /** "12 of 40 points (30 %)". */
      sampleSize: string;
      result: "passed" | "failed";
      tolerance: string;
      items: { item: string; reportedM3S: number; verifiedM3S: number; differencePct: number; pass: boolean }[];
      comment: string;
    };

export interface ReportDeviation {
  item: string;
  pctOfDesign: number | null;
  reason: string;
  acceptedBy: string;
  acceptedAt: string;
}

export interface ReportApproval extends ReportPerson {
  /** "approved the content of this report", "signed the certification statement". */
  what: string;
}
