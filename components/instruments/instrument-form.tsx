"use client";

/**
 * Add or edit an instrument. Values are typed in the user's units and sent in SI; the same zod schema
 * as the server checks them here first, and every error sits beside its field. What was typed is kept
 * when the server refuses it.
 */
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import type { InstrumentKind } from "@/db/schema";
import { buttonClasses } from "@/components/ui/button";
import { ApiError } from "@/lib/api-client";
import { useCreateInstrument, useUpdateInstrument, type Instrument } from "@/lib/api-client/field";
import { INSTRUMENT_KINDS, KIND_INFO } from "@/lib/instruments/kinds";
import { kindUnit } from "@/lib/instruments/units";
import { displayUnit, fromDisplay, toDisplay, type UnitSystem } from "@/lib/units";
import { instrumentCreateSchema, instrumentRecordProblems } from "@/lib/validation/instruments";
import { parseDecimal } from "@/lib/validation/decimal";
import { zodFieldErrors } from "@/lib/validation/result";

type FieldName =
  | "kind"
  | "make"
  | "model"
  | "serial"
  | "certificateNumber"
  | "calibratedOn"
  | "calibrationDueOn"
  | "rangeMin"
  | "rangeMax"
  | "accuracyPct"
  | "accuracyFloor"
  | "humidityAccuracyPct"
  | "probeCoefficient"
  | "probeHeadDiameterMm"
  | "hoodCorrectionFactor"
  | "notes";

type FormValues = Record<FieldName, string>;

const EMPTY: FormValues = {
  kind: "manometer",
  make: "",
  model: "",
  serial: "",
  certificateNumber: "",
  calibratedOn: "",
  calibrationDueOn: "",
  rangeMin: "",
  rangeMax: "",
  accuracyPct: "",
  accuracyFloor: "",
  humidityAccuracyPct: "",
  probeCoefficient: "1.0",
  probeHeadDiameterMm: "",
  hoodCorrectionFactor: "",
  notes: "",
};

const trimNumber = (n: number, decimals: number) => String(Number(n.toFixed(decimals)));

function toForm(i: Instrument, units: UnitSystem): FormValues {
  const unit = kindUnit(i.kind, units);
  const shown = (v: number | null, delta = false) => (v === null || !unit ? (v === null ? "" : String(v)) : trimNumber(unit.toDisplay(v, { delta }), unit.decimals + 3));
  const dim = (mm: number | null) => (mm === null ? "" : trimNumber(toDisplay(units, "dimension", mm), 3));
  return {
    kind: i.kind,
    make: i.make,
    model: i.model,
    serial: i.serial,
    certificateNumber: i.certificateNumber,
    calibratedOn: i.calibratedOn ?? "",
    calibrationDueOn: i.calibrationDueOn ?? "",
    rangeMin: shown(i.rangeMin),
    rangeMax: shown(i.rangeMax),
    accuracyPct: i.accuracyPct === null ? "" : String(i.accuracyPct),
    accuracyFloor: shown(i.accuracyFloor, true),
    humidityAccuracyPct: i.humidityAccuracyPct === null ? "" : String(i.humidityAccuracyPct),
    probeCoefficient: i.probeCoefficient === null ? "" : String(i.probeCoefficient),
    probeHeadDiameterMm: dim(i.probeHeadDiameterMm),
    hoodCorrectionFactor: i.hoodCorrectionFactor === null ? "" : String(i.hoodCorrectionFactor),
    notes: i.notes,
  };
}

/** The form's values as the API's SI record, with a message for each field that is not a number. */
function toRecord(v: FormValues, units: UnitSystem) {
  const kind = v.kind as InstrumentKind;
  const info = KIND_INFO[kind];
  const unit = kindUnit(kind, units);
  const errors: Partial<Record<FieldName, string>> = {};
  const num = (name: FieldName, convert?: (n: number) => number): number | null => {
    const n = parseDecimal(v[name]);
    if (n === "invalid") {
      errors[name] = `must be a number; got "${v[name].trim()}"`;
      return null;
    }
    return n === null ? null : convert ? convert(n) : n;
  };
  const inUnit = (name: FieldName, delta = false) => num(name, unit ? (n) => unit.fromDisplay(n, { delta }) : undefined);
  const record = {
    kind,
    make: v.make,
    model: v.model,
    serial: v.serial,
    certificateNumber: v.certificateNumber,
    calibratedOn: v.calibratedOn.trim() === "" ? null : v.calibratedOn.trim(),
    calibrationDueOn: v.calibrationDueOn.trim() === "" ? null : v.calibrationDueOn.trim(),
    rangeMin: info.measure && kind !== "pitot_tube" ? inUnit("rangeMin") : null,
    rangeMax: info.measure ? inUnit("rangeMax") : null,
    accuracyPct: info.hasAccuracyPct ? num("accuracyPct") : null,
    accuracyFloor: info.floorLabel ? inUnit("accuracyFloor", true) : null,
    humidityAccuracyPct: info.humidityFields ? num("humidityAccuracyPct") : null,
    probeCoefficient: info.probeFields ? num("probeCoefficient") : null,
    probeHeadDiameterMm: info.probeFields ? num("probeHeadDiameterMm", (n) => fromDisplay(units, "dimension", n)) : null,
    hoodCorrectionFactor: info.hoodFields ? num("hoodCorrectionFactor") : null,
    notes: v.notes,
  };
  return { record, errors };
}

export function InstrumentForm({ units, instrument, kindLocked = false }: { units: UnitSystem; instrument?: Instrument; kindLocked?: boolean }) {
  const router = useRouter();
  const formId = useId();
  const [values, setValues] = useState<FormValues>(() => (instrument ? toForm(instrument, units) : EMPTY));
  const [errors, setErrors] = useState<Partial<Record<string, string>>>({});
  const [summary, setSummary] = useState<string | null>(null);
  const create = useCreateInstrument();
  const update = useUpdateInstrument(instrument?.id ?? "");
  const busy = create.isPending || update.isPending;

  const kind = values.kind as InstrumentKind;
  const info = KIND_INFO[kind];
  const unit = useMemo(() => kindUnit(kind, units), [kind, units]);
  const set = (name: FieldName) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement>) => setValues((v) => ({ ...v, [name]: e.target.value }));

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setSummary(null);
    const { record, errors: numberErrors } = toRecord(values, units);
    const parsed = instrumentCreateSchema.safeParse(record);
    const fieldErrors: Record<string, string> = { ...(parsed.success ? {} : zodFieldErrors(parsed.error)), ...numberErrors };
    if (parsed.success) Object.assign(fieldErrors, instrumentRecordProblems(parsed.data), numberErrors);
    if (Object.keys(fieldErrors).length > 0) {
      setErrors(fieldErrors);
      setSummary(`Check ${Object.keys(fieldErrors).length === 1 ? "the field" : `the ${Object.keys(fieldErrors).length} fields`} marked below.`);
      return;
    }
    setErrors({});
    try {
      const saved = instrument
        ? await update.mutateAsync({ ...parsed.data!, ...(kindLocked ? { kind: undefined } : {}), ifUpdatedAt: instrument.updatedAt })
        : await create.mutateAsync(parsed.data!);
      router.push(`/instruments?saved=${encodeURIComponent(saved.instrument.serial)}`);
      router.refresh();
    } catch (err) {
      if (err instanceof ApiError) {
        setErrors(err.fields);
        setSummary(err.message);
      } else setSummary("Something went wrong; what you typed is still here. Try again.");
    }
  }

  const field = (name: FieldName, label: string, opts: { hint?: string; unitLabel?: string; decimal?: boolean; type?: string; required?: boolean; autoComplete?: string } = {}) => {
    const id = `${formId}-${name}`;
    const error = errors[name];
    const describedBy = [opts.hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;
    return (
      <div>
        <label htmlFor={id} className="mb-1 block font-semibold">
          {label}
          {opts.unitLabel && <span className="font-normal text-ink-soft"> ({opts.unitLabel})</span>}
          {opts.required && <span className="font-normal text-ink-soft"> (required)</span>}
        </label>
        <input
          id={id}
          name={name}
          type={opts.type ?? "text"}
          inputMode={opts.decimal ? "decimal" : undefined}
          autoComplete={opts.autoComplete ?? "off"}
          value={values[name]}
          onChange={set(name)}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 text-lg"
        />
        {opts.hint && (
          <p id={`${id}-hint`} className="mt-1 text-sm text-ink-soft">
            {opts.hint}
          </p>
        )}
        {error && (
          <p id={`${id}-error`} className="mt-1 text-sm font-semibold text-fault">
            {error}
          </p>
        )}
      </div>
    );
  };

  const dimension = displayUnit(units, "dimension");
  return (
    <form onSubmit={submit} noValidate className="grid gap-5" aria-describedby={summary ? `${formId}-summary` : undefined}>
      {summary && (
        <p id={`${formId}-summary`} role="alert" className="rounded-card border-2 border-fault bg-fault-soft p-3 font-semibold text-fault">
          {summary}
        </p>
      )}
      <fieldset className="grid gap-4 md:grid-cols-2">
        <legend className="mb-2 text-lg font-semibold">The instrument</legend>
        <div>
          <label htmlFor={`${formId}-kind`} className="mb-1 block font-semibold">
            Kind
          </label>
          <select
            id={`${formId}-kind`}
            value={values.kind}
            onChange={set("kind")}
            disabled={kindLocked}
            aria-describedby={`${formId}-kind-hint`}
            className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 text-lg"
          >
            {INSTRUMENT_KINDS.map((k) => (
              <option key={k} value={k}>
                {KIND_INFO[k].label}
              </option>
            ))}
          </select>
          <p id={`${formId}-kind-hint`} className="mt-1 text-sm text-ink-soft">
            {kindLocked ? "Used for readings, so its kind stays. Add a new entry for another instrument." : `Used for ${info.use}.`}
          </p>
          {errors.kind && <p className="mt-1 text-sm font-semibold text-fault">{errors.kind}</p>}
        </div>
        {field("serial", "Serial number", { required: true, hint: "As engraved or labelled on the instrument." })}
        {field("make", "Make")}
        {field("model", "Model")}
      </fieldset>

      <fieldset className="grid gap-4 md:grid-cols-3">
        <legend className="mb-2 text-lg font-semibold">Calibration</legend>
        {field("calibratedOn", "Calibrated on", { type: "date" })}
        {field("calibrationDueOn", "Calibration due", { type: "date", hint: "The last day it may be used; past it, readings need a stated reason." })}
        {field("certificateNumber", "Certificate number", { hint: "From the laboratory's certificate; attach the file itself under Calibration certificate on the instrument's page." })}
      </fieldset>

      {(info.measure || info.probeFields || info.hoodFields) && (
        <fieldset className="grid gap-4 md:grid-cols-3">
          <legend className="mb-2 text-lg font-semibold">Range and accuracy</legend>
          {info.measure && kind !== "pitot_tube" && field("rangeMin", "Range from", { decimal: true, unitLabel: unit?.symbol })}
          {info.measure && field("rangeMax", kind === "pitot_tube" ? info.rangeLabel : "Range to", { decimal: true, unitLabel: unit?.symbol })}
          {info.hasAccuracyPct && field("accuracyPct", "Accuracy", { decimal: true, unitLabel: "± % of reading" })}
          {info.floorLabel && field("accuracyFloor", info.floorLabel, { decimal: true, unitLabel: `± ${unit?.symbol ?? ""}`, hint: info.hasAccuracyPct ? "Added to the % of reading, as makers state it." : undefined })}
          {info.humidityFields && field("humidityAccuracyPct", "Humidity accuracy", { decimal: true, unitLabel: "± % RH" })}
          {info.probeFields && field("probeCoefficient", "Pitot coefficient", { decimal: true, hint: "1.0 for a standard pitot-static tube; otherwise the calibrated value." })}
          {info.probeFields && field("probeHeadDiameterMm", "Head diameter", { decimal: true, unitLabel: dimension.symbol })}
          {info.hoodFields && field("hoodCorrectionFactor", "Hood correction factor", { decimal: true, hint: "The maker's factor for the hood top in use; leave empty when none applies." })}
        </fieldset>
      )}

      <div>
        <label htmlFor={`${formId}-notes`} className="mb-1 block font-semibold">
          Notes
        </label>
        <textarea
          id={`${formId}-notes`}
          value={values.notes}
          onChange={set("notes")}
          rows={3}
          maxLength={2000}
          aria-invalid={errors.notes ? true : undefined}
          className="w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 py-2 text-lg"
        />
        {errors.notes && <p className="mt-1 text-sm font-semibold text-fault">{errors.notes}</p>}
      </div>

      <div className="flex flex-wrap gap-3">
        <button type="submit" disabled={busy} className={buttonClasses("primary", "min-w-40 text-lg")}>
          {busy ? "Saving…" : instrument ? "Save changes" : "Add to the register"}
        </button>
        <button type="button" onClick={() => router.push("/instruments")} className={buttonClasses("secondary")}>
          Cancel
        </button>
      </div>
    </form>
  );
}
