/**
 * The instrument register's JSON (camelCase, SI for the kind: Pa, m/s, m³/s, °C, mm, rpm, A), shared by
 * `POST/PATCH /api/v1/instruments` and the add/edit form. Field checks live in the schemas; the rules
 * that tie fields together (range order, fields that belong to another kind, dates) are one function,
 * `instrumentRecordProblems`, run on the complete record: the create body, or the stored row with a
 * PATCH applied.
 */
import "./zod-browser";
import { z } from "zod";
import type { InstrumentKind } from "@/db/schema";
import { INSTRUMENT_KINDS, KIND_INFO } from "@/lib/instruments/kinds";
import { boundedText, enumOf, isCalendarDate, nullableDate, nullableNumber } from "./fields";

/**
 * Plausible limits per kind, in the kind's SI unit: a range or floor beyond these is a typo or a unit
 * mix-up (our choice, wide enough for any field instrument we know of).
 */
export const KIND_LIMITS: Readonly<Record<InstrumentKind, { min: number; max: number; floorMax: number; unit: string }>> = {
  manometer: { min: -20_000, max: 20_000, floorMax: 100, unit: "Pa" },
  pitot_tube: { min: 0, max: 5_000, floorMax: 0, unit: "mm" },
  capture_hood: { min: 0, max: 5, floorMax: 0.1, unit: "m³/s" },
  thermal_anemometer: { min: 0, max: 100, floorMax: 1, unit: "m/s" },
  vane_anemometer: { min: 0, max: 100, floorMax: 1, unit: "m/s" },
  tachometer: { min: 0, max: 100_000, floorMax: 100, unit: "rpm" },
  clamp_meter: { min: 0, max: 3_000, floorMax: 50, unit: "A" },
  thermo_hygrometer: { min: -60, max: 200, floorMax: 5, unit: "°C" },
  barometer: { min: 0, max: 200_000, floorMax: 2_000, unit: "Pa" },
};

/** Pitot coefficient: 1.0 for a standard pitot-static tube (common practice); S-type tubes near 0.84 (from memory). */
export const PROBE_COEFFICIENT = { min: 0.5, max: 1.2 };
/** A hood's correction factor multiplies its reading; makers' factors for other tops stay near 1 (our bound). */
export const HOOD_FACTOR = { min: 0.5, max: 2 };

const fields = {
  make: boundedText(80),
  model: boundedText(80),
  serial: boundedText(60, { min: 1, what: "the serial number on the instrument" }),
  certificateNumber: boundedText(80),
  calibratedOn: nullableDate(),
  calibrationDueOn: nullableDate(),
  // Bounds per kind are checked in instrumentRecordProblems; these catch absurd values early.
  rangeMin: nullableNumber(-1_000_000, 1_000_000, ""),
  rangeMax: nullableNumber(-1_000_000, 1_000_000, ""),
  accuracyPct: nullableNumber(0, 50, "% of reading"),
  accuracyFloor: nullableNumber(0, 1_000_000, ""),
  humidityAccuracyPct: nullableNumber(0, 20, "% RH"),
  probeCoefficient: nullableNumber(PROBE_COEFFICIENT.min, PROBE_COEFFICIENT.max, ""),
  probeHeadDiameterMm: nullableNumber(1, 50, "mm"),
  hoodCorrectionFactor: nullableNumber(HOOD_FACTOR.min, HOOD_FACTOR.max, ""),
  notes: boundedText(2_000),
};

const kindSchema = enumOf(INSTRUMENT_KINDS, "the kind of instrument");

export const instrumentCreateSchema = z
  .strictObject({
    kind: kindSchema,
    serial: fields.serial,
    make: fields.make.default(""),
    model: fields.model.default(""),
    certificateNumber: fields.certificateNumber.default(""),
    calibratedOn: fields.calibratedOn.default(null),
    calibrationDueOn: fields.calibrationDueOn.default(null),
    rangeMin: fields.rangeMin.default(null),
    rangeMax: fields.rangeMax.default(null),
    accuracyPct: fields.accuracyPct.default(null),
    accuracyFloor: fields.accuracyFloor.default(null),
    humidityAccuracyPct: fields.humidityAccuracyPct.default(null),
    probeCoefficient: fields.probeCoefficient.default(null),
    probeHeadDiameterMm: fields.probeHeadDiameterMm.default(null),
    hoodCorrectionFactor: fields.hoodCorrectionFactor.default(null),
    notes: fields.notes.default(""),
  })
  .superRefine(
    (record, ctx) => {
      // Runs even when some fields already failed, so every problem is reported at once; fields that
      // failed on their own are left out of the record check rather than reported twice.
      const failed = new Set(ctx.issues.map((i) => String(i.path?.[0] ?? "")));
      const raw = record as Record<string, unknown>;
      if (!(INSTRUMENT_KINDS as readonly unknown[]).includes(raw.kind)) return;
      const num = (k: string) => (!failed.has(k) && typeof raw[k] === "number" ? (raw[k] as number) : null);
      const day = (k: string) => (!failed.has(k) && typeof raw[k] === "string" && isCalendarDate(raw[k] as string) ? (raw[k] as string) : null);
      const clean: InstrumentRecord = {
        kind: raw.kind as InstrumentKind,
        calibratedOn: day("calibratedOn"),
        calibrationDueOn: day("calibrationDueOn"),
        rangeMin: num("rangeMin"),
        rangeMax: num("rangeMax"),
        accuracyPct: num("accuracyPct"),
        accuracyFloor: num("accuracyFloor"),
        humidityAccuracyPct: num("humidityAccuracyPct"),
        probeCoefficient: failed.has("probeCoefficient") ? 1 : num("probeCoefficient"),
        probeHeadDiameterMm: num("probeHeadDiameterMm"),
        hoodCorrectionFactor: num("hoodCorrectionFactor"),
      };
      for (const [path, message] of Object.entries(instrumentRecordProblems(clean))) if (!failed.has(path)) ctx.addIssue({ code: "custom", path: [path], message });
    },
    { when: (payload) => typeof payload.value === "object" && payload.value !== null },
  );
export type InstrumentCreateInput = z.input<typeof instrumentCreateSchema>;
export type InstrumentCreate = z.output<typeof instrumentCreateSchema>;

/** Any subset of the fields, plus `retired` (true retires it from today; false puts it back in service). */
export const instrumentPatchSchema = z.strictObject({
  kind: kindSchema.optional(),
  serial: fields.serial.optional(),
  make: fields.make.optional(),
  model: fields.model.optional(),
  certificateNumber: fields.certificateNumber.optional(),
  calibratedOn: fields.calibratedOn.optional(),
  calibrationDueOn: fields.calibrationDueOn.optional(),
  rangeMin: fields.rangeMin.optional(),
  rangeMax: fields.rangeMax.optional(),
  accuracyPct: fields.accuracyPct.optional(),
  accuracyFloor: fields.accuracyFloor.optional(),
  humidityAccuracyPct: fields.humidityAccuracyPct.optional(),
  probeCoefficient: fields.probeCoefficient.optional(),
  probeHeadDiameterMm: fields.probeHeadDiameterMm.optional(),
  hoodCorrectionFactor: fields.hoodCorrectionFactor.optional(),
  notes: fields.notes.optional(),
  retired: z.boolean({ error: "must be true (retire it) or false (back in service)" }).optional(),
  /**
   * The `updatedAt` of the instrument as the editor last saw it: when someone changed it since, the
   * change is refused (409, with the current instrument) instead of overwriting theirs.
   */
  ifUpdatedAt: z.string({ error: "must be the instrument's updatedAt as last read (an ISO date and time)" }).max(40).optional(),
});
export type InstrumentPatch = z.output<typeof instrumentPatchSchema>;

/** The fields that tie together, on a complete record. */
export type InstrumentRecord = Omit<InstrumentCreate, "notes" | "make" | "model" | "certificateNumber" | "serial">;

/** How many days a calibration may run (our bound: ten years; makers ask for one or two). */
const MAX_CALIBRATION_DAYS = 3653;

/**
 * Problems of a complete instrument record, by field: values beyond the kind's plausible limits, range
 * min not below max, fields that belong to another kind, a due date not after the calibration date,
 * a calibration date in the future. `today` (YYYY-MM-DD) defaults to the runtime's date.
 */
export function instrumentRecordProblems(record: InstrumentRecord, today?: string): Record<string, string> {
  const out: Record<string, string> = {};
  const info = KIND_INFO[record.kind];
  const limits = KIND_LIMITS[record.kind];
  const label = info.label.toLowerCase();

  for (const key of ["rangeMin", "rangeMax"] as const) {
    const v = record[key];
    if (v === null) continue;
    if (info.measure === null) out[key] = `does not apply to a ${label}; leave it empty`;
    else if (v < limits.min || v > limits.max) out[key] = `must be from ${limits.min} to ${limits.max} ${limits.unit} for a ${label}; got ${v}`;
  }
  if (record.rangeMin !== null && record.rangeMax !== null && !out.rangeMin && !out.rangeMax && record.rangeMin >= record.rangeMax)
    out.rangeMax = `must be above the range minimum ${record.rangeMin}; got ${record.rangeMax}`;

  if (record.accuracyPct !== null && !info.hasAccuracyPct) out.accuracyPct = `does not apply to a ${label}; leave it empty`;
  if (record.accuracyFloor !== null) {
    if (info.floorLabel === null) out.accuracyFloor = `does not apply to a ${label}; leave it empty`;
    else if (record.accuracyFloor > limits.floorMax) out.accuracyFloor = `must be from 0 to ${limits.floorMax} ${limits.unit} for a ${label}; got ${record.accuracyFloor}`;
  }
  if (record.humidityAccuracyPct !== null && !info.humidityFields) out.humidityAccuracyPct = "applies to thermo-hygrometers only; leave it empty";
  if (!info.probeFields) {
    if (record.probeCoefficient !== null) out.probeCoefficient = "applies to pitot tubes only; leave it empty";
    if (record.probeHeadDiameterMm !== null) out.probeHeadDiameterMm = "applies to pitot tubes only; leave it empty";
  } else if (record.probeCoefficient === null) {
    out.probeCoefficient = `is needed for a pitot tube: 1.0 for a standard pitot-static tube, or the calibrated coefficient (${PROBE_COEFFICIENT.min} to ${PROBE_COEFFICIENT.max}); got nothing`;
  }
  if (record.hoodCorrectionFactor !== null && !info.hoodFields) out.hoodCorrectionFactor = "applies to capture hoods only; leave it empty";

  const now = today ?? localToday();
  if (record.calibratedOn !== null && record.calibratedOn > addDays(now, 1))
    out.calibratedOn = `cannot be in the future (today is ${now}); got ${record.calibratedOn}`;
  if (record.calibratedOn !== null && record.calibrationDueOn !== null) {
    if (record.calibrationDueOn <= record.calibratedOn)
      out.calibrationDueOn = `must be after the calibration date ${record.calibratedOn}; got ${record.calibrationDueOn}`;
    else if (daysFrom(record.calibratedOn, record.calibrationDueOn) > MAX_CALIBRATION_DAYS)
      out.calibrationDueOn = `must be within ten years of the calibration date ${record.calibratedOn}; got ${record.calibrationDueOn}`;
  }
  return out;
}

function localToday(): string {
  const d = new Date();
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

function addDays(iso: string, days: number): string {
  return new Date(Date.parse(`${iso}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}

function daysFrom(a: string, b: string): number {
  return (Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / 86_400_000;
}

export const instrumentListQuerySchema = z.strictObject({
  kind: z
    .string()
    .transform((s) => s.split(",").filter((k) => k !== ""))
    .pipe(z.array(kindSchema).max(INSTRUMENT_KINDS.length))
    .optional(),
  includeRetired: z.enum(["true", "false"], { error: 'must be "true" or "false"' }).optional(),
});
