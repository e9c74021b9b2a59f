"use client";

/**
 * Record the operating conditions of a system, sized for a gloved thumb: two number fields for fan
 * speed, large choices for terminal units and filters. What is typed is kept on this device as it is
 * typed (it survives a reload without network); "Record conditions" queues it for the server, which
 * gets it now or when the connection returns.
 */
import { useId, useMemo, useState } from "react";
import { SyncStatus } from "@/components/offline/sync-status";
import { ChoiceGroup } from "@/components/ui/choice-group";
import { buttonClasses } from "@/components/ui/button";
import { QuantityField } from "@/components/ui/quantity-field";
import { recordConditionsOffline, type ConditionsBody } from "@/lib/api-client/field";
import { BOX_LABELS, conditionsWarnings, FILTER_LABELS, type BoxOverride, type FilterState } from "@/lib/airflow/conditions";
import { newId } from "@/lib/offline/ids";
import { useSyncQueue } from "@/lib/offline/offline-context";
import { useOfflineDraft } from "@/lib/offline/use-offline-draft";
import { displayUnit, fromDisplay, type UnitSystem } from "@/lib/units";
import { BOX_OVERRIDES, conditionsCreateSchema, FILTER_STATES } from "@/lib/validation/conditions";
import { parseDecimal } from "@/lib/validation/decimal";
import { zodFieldErrors } from "@/lib/validation/result";

export interface ConditionsSystem {
  id: string;
  tag: string;
  name: string;
  fanSpeedRpm: number | null;
  hasVfd: boolean;
  kind: "supply" | "return" | "exhaust" | "outside_air";
}

interface FormValues {
  fanSpeedRpm: string;
  vfdHz: string;
  boxes: BoxOverride;
  outsideAirDamperPct: string;
  ductStaticSetpoint: string;
  filterState: FilterState;
  notes: string;
}

const EMPTY: FormValues = { fanSpeedRpm: "", vfdHz: "", boxes: "none", outsideAirDamperPct: "", ductStaticSetpoint: "", filterState: "unknown", notes: "" };

const BOX_CHOICES = BOX_OVERRIDES.map((v) => ({ value: v, label: v === "none" ? "Left to their controls" : v === "mixed" ? "Some forced, some not" : BOX_LABELS[v].replace(/^./, (c) => c.toUpperCase()) }));
const FILTER_CHOICES = FILTER_STATES.map((v) => ({ value: v, label: FILTER_LABELS[v].replace(/^./, (c) => c.toUpperCase()) }));

export function ConditionsForm({
  projectId,
  system,
  units,
  onDone,
  focusFirst = false,
}: {
  projectId: string;
  system: ConditionsSystem;
  units: UnitSystem;
  /** Put the cursor in the first field (the form was just opened by the technician). */
  focusFirst?: boolean;
  /** Called after the record is queued (key of the queued record) or when the form is closed (null). */
  onDone: (queuedKey: string | null) => void;
}) {
  const formId = useId();
  const queue = useSyncQueue();
  const draft = useOfflineDraft<FormValues>({ key: `conditions-form:${system.id}`, initial: EMPTY });
  const v = draft.value;
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);
  const pressure = displayUnit(units, "pressure");
  const set = <K extends keyof FormValues>(name: K, value: FormValues[K]) => draft.setValue((prev) => ({ ...prev, [name]: value }));

  const numbers = useMemo(() => {
    const errs: Record<string, string> = {};
    const num = (name: keyof FormValues, field: string) => {
      const n = parseDecimal(String(v[name]));
      if (n === "invalid") errs[field] = `must be a number; got "${String(v[name]).trim()}"`;
      return n === "invalid" ? null : n;
    };
    const staticShown = num("ductStaticSetpoint", "ductStaticSetpointPa");
    const body = {
      fanSpeedRpm: num("fanSpeedRpm", "fanSpeedRpm"),
      vfdHz: num("vfdHz", "vfdHz"),
      boxes: v.boxes,
      outsideAirDamperPct: num("outsideAirDamperPct", "outsideAirDamperPct"),
      ductStaticSetpointPa: staticShown === null ? null : fromDisplay(units, "pressure", staticShown),
      filterState: v.filterState,
      notes: v.notes,
    };
    return { body, errs };
  }, [v, units]);
  const warnings = conditionsWarnings(numbers.body, system);

  async function record(e: React.FormEvent) {
    e.preventDefault();
    if (!queue) return;
    const parsed = conditionsCreateSchema.safeParse(numbers.body);
    const fieldErrors = { ...(parsed.success ? {} : zodFieldErrors(parsed.error)), ...numbers.errs };
    if (Object.keys(fieldErrors).length > 0) {
      setErrors(fieldErrors);
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      const body: ConditionsBody = { ...numbers.body, id: newId(), recordedAt: new Date().toISOString() };
      const key = await recordConditionsOffline(queue, projectId, system.id, body);
      await draft.discard();
      onDone(key);
    } finally {
      setBusy(false);
    }
  }

  const numberField = (name: keyof FormValues, apiField: string, label: string, unit: string, hint?: string, autoFocus = false) => {
    const id = `${formId}-${name}`;
    const error = errors[apiField];
    // Opened by a tap or Enter: the first field takes the cursor at once.
    return <QuantityField id={id} label={label} unit={unit} value={String(v[name])} onValue={(text) => set(name, text as never)} hint={hint} error={error} autoFocus={autoFocus} />;
  };

  const speedFields = [
    numberField("fanSpeedRpm", "fanSpeedRpm", "Fan speed", "rpm", system.fanSpeedRpm ? `Scheduled ${system.fanSpeedRpm} rpm; read it at the fan shaft.` : "Read it at the fan shaft.", focusFirst && !system.hasVfd),
    numberField("vfdHz", "vfdHz", "Drive frequency", "Hz", system.hasVfd ? "From the drive's display." : "Only if the fan runs on a variable-frequency drive.", focusFirst && system.hasVfd),
  ];

  return (
    <form onSubmit={record} noValidate className="grid gap-4" aria-label={`Record operating conditions of ${system.tag}`}>
      <div className="grid gap-4 sm:grid-cols-2">{system.hasVfd ? speedFields.reverse() : speedFields}</div>
      {warnings.length > 0 && (
        <ul className="rounded-card border-2 border-caution bg-caution-soft p-3 text-sm" aria-live="polite">
          {warnings.map((w) => (
            <li key={w}>
              <strong>Check:</strong> {w}
            </li>
          ))}
        </ul>
      )}
      <ChoiceGroup legend="Terminal units" name="boxes" choices={BOX_CHOICES} value={v.boxes} onChange={(b) => set("boxes", b)} error={errors.boxes} columns={4} />
      <div className="grid gap-4 sm:grid-cols-2">
        {system.kind !== "exhaust" && numberField("outsideAirDamperPct", "outsideAirDamperPct", "Outside-air damper", "% open", "Economizer position; leave empty when the system has none.")}
        {numberField("ductStaticSetpoint", "ductStaticSetpointPa", "Duct static set point", pressure.symbol, "As set in the controls; leave empty for constant-speed fans.")}
      </div>
      <ChoiceGroup legend="Filters" name="filters" choices={FILTER_CHOICES} value={v.filterState} onChange={(f) => set("filterState", f)} error={errors.filterState} columns={4} />
      <div>
        <label htmlFor={`${formId}-notes`} className="mb-1 block font-semibold">
          Notes
        </label>
        <textarea
          id={`${formId}-notes`}
          value={v.notes}
          onChange={(e) => set("notes", e.target.value)}
          rows={2}
          maxLength={1000}
          className="w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 py-2 text-lg"
          placeholder="e.g. economizer held at minimum from the BMS"
        />
        {errors.notes && <p className="mt-1 text-sm font-semibold text-fault">{errors.notes}</p>}
      </div>
      {draft.syncState === "saved-on-device" && <SyncStatus syncState="saved-on-device" notSentYet what="the conditions" online={draft.online} deviceError={draft.deviceError} />}
      <div className="flex flex-wrap gap-3">
        <button type="submit" disabled={busy || !draft.ready} className={buttonClasses("primary", "min-w-48 text-lg")}>
          Record conditions
        </button>
        <button
          type="button"
          className={buttonClasses("secondary")}
          onClick={async () => {
            await draft.discard();
            onDone(null);
          }}
        >
          Cancel
        </button>
      </div>
    </form>
  );
}
