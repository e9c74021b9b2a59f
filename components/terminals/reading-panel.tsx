"use client";

/**
 * Reading one outlet, inlet or terminal unit, sized for a gloved thumb: large fields that take
 * decimals, Enter moves to the next field (and records from the last), values in the user's units.
 * What is typed is kept on this device as it is typed; "Record reading" puts the reading on the
 * device for the server (sent now, or when the network returns). The result is worked out live with
 * the same code the server runs.
 */
import { useEffect, useId, useMemo, useRef, useState } from "react";
import type { PickedConditions } from "@/components/conditions/conditions-picker";
import { InstrumentPicker } from "@/components/instruments/instrument-picker";
import { buttonClasses } from "@/components/ui/button";
import { ChoiceGroup } from "@/components/ui/choice-group";
import { QuantityField } from "@/components/ui/quantity-field";
import { useInstruments } from "@/lib/api-client/field";
import { recordTerminalReadingOffline, type TerminalReadingBody } from "@/lib/api-client/terminals";
import { summarizeConditions } from "@/lib/airflow/conditions";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { newId } from "@/lib/offline/ids";
import { useSyncQueue } from "@/lib/offline/offline-context";
import { useOfflineDraft } from "@/lib/offline/use-offline-draft";
import { quantityFormat } from "@/lib/terminals/format";
import { METHOD_LABELS, methodsFor, PHASE_LABELS, SETPOINT_LABELS, setpointsFor } from "@/lib/terminals/setpoints";
import { displayUnit, formatQuantity, type UnitSystem } from "@/lib/units";
import { isTerminalUnit } from "@/lib/validation/design";
import { evaluateBody, type BoardProject, type BoardTerminal, type BoardTraverse } from "./model";
import { buildBody, type PanelValues } from "./reading-form";
import { ReadingResult } from "./reading-result";

export interface ReadingPanelProps {
  projectId: string;
  terminal: BoardTerminal;
  systemTag: string;
  sectionTag: string;
  project: BoardProject;
  units: UnitSystem;
  /** The conditions chosen for the system above; null when none are recorded yet. */
  conditions: PickedConditions | null;
  /** Traverses of the terminal's section (only when the section feeds this terminal alone). */
  traverses: BoardTraverse[];
  /** How many terminals the terminal's section feeds. */
  terminalsOnSection: number;
  /** The panel's first values (from the technician's habits, or a refused reading being corrected). */
  initial: PanelValues;
  /** The instrument last used for each method (or today's kit), chosen when the method changes. */
  preferredInstruments: { hood: string | null; velocity_area: string | null };
  onRecorded: (key: string, body: TerminalReadingBody, values: PanelValues) => void;
  onClose: () => void;
}

const MAX_CELLS = 60;

export function ReadingPanel(props: ReadingPanelProps) {
  const { terminal, units, project } = props;
  const formId = useId();
  const formRef = useRef<HTMLFormElement>(null);
  const queue = useSyncQueue();
  const register = useInstruments();
  const draft = useOfflineDraft<PanelValues>({ key: `terminal-form:${terminal.id}`, initial: props.initial });
  const v = draft.value;
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);
  const unit = isTerminalUnit(terminal.kind);
  const flowUnit = displayUnit(units, "flow").symbol;
  const velocityUnit = displayUnit(units, "velocity").symbol;
  const tempUnit = displayUnit(units, "temperature").symbol;
  const areaUnit = FORM_UNITS[units].area;
  const format = useMemo(() => quantityFormat(units), [units]);
  const instruments = useMemo(() => register.data?.data ?? [], [register.data]);
  const set = <K extends keyof PanelValues>(name: K, value: PanelValues[K]) => draft.setValue((prev) => ({ ...prev, [name]: value }));
  const traverse = props.traverses.find((t) => t.id === v.traverseId) ?? null;

  // Nothing chosen yet and the register (once loaded) has one usable instrument of the kind: that one.
  const kinds = v.method === "hood" ? ["capture_hood"] : v.method === "velocity_area" ? ["thermal_anemometer", "vane_anemometer"] : [];
  const onlyCandidate = (() => {
    const candidates = instruments.filter((i) => kinds.includes(i.kind) && i.calibrationStatus.usable);
    return candidates.length === 1 ? candidates[0]!.id : null;
  })();
  useEffect(() => {
    if (draft.ready && v.instrumentId === null && onlyCandidate) draft.setValue((prev) => (prev.instrumentId === null ? { ...prev, instrumentId: onlyCandidate } : prev));
  }, [draft, v.instrumentId, onlyCandidate]);

  // Live: what the reading would be, from what is typed so far (nothing shown until it can be worked out).
  const preview = useMemo(() => {
    const built = buildBody(v, { terminal, units, conditionsId: props.conditions?.id ?? null, instruments, traverseConditionsId: traverse?.conditionsId ?? null, preview: true }, { id: "00000000-0000-4000-8000-000000000000", takenAt: new Date().toISOString() });
    if (!built.ok) return { missing: Object.values(built.errors)[0] ?? null };
    const body = built.body;
    try {
      const instrument = instruments.find((i) => i.id === body.instrumentId) ?? null;
      const { flow, judged } = evaluateBody(body, { terminal, project, format, instrument, traverse });
      return {
        ...flow,
        designFlowM3S: judged.designFlowM3S,
        pctOfDesign: judged.pctOfDesign,
        withinTolerance: judged.withinTolerance,
        tolerance: judged.tolerance,
        controllerFlowM3S: judged.controller?.displayedM3S ?? null,
        controllerFlowFactor: judged.controller?.flowFactor ?? null,
        controllerRatio: judged.controller?.ratio ?? null,
        suggestedFlowFactor: judged.controller?.suggestedFlowFactor ?? null,
        flags: judged.flags,
      };
    } catch (err) {
      return { missing: err instanceof Error ? err.message : null };
    }
  }, [v, terminal, units, props.conditions, instruments, traverse, project, format]);

  async function record(e?: React.FormEvent) {
    e?.preventDefault();
    if (!queue || busy) return;
    const stamp = { id: newId(), takenAt: new Date().toISOString() };
    const built = buildBody(v, { terminal, units, conditionsId: props.conditions?.id ?? null, instruments, traverseConditionsId: traverse?.conditionsId ?? null }, stamp);
    if (!built.ok) {
      setErrors(built.errors);
      // The first field at fault takes the cursor, so a keyboard user lands where the fix is.
      requestAnimationFrame(() => formRef.current?.querySelector<HTMLElement>('[aria-invalid="true"]')?.focus());
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      const key = await recordTerminalReadingOffline(queue, props.projectId, terminal.id, built.body);
      await draft.discard();
      props.onRecorded(key, built.body, v);
    } finally {
      setBusy(false);
    }
  }

  /** Enter moves to the next field; from the last one it records. */
  function onKeyDown(e: React.KeyboardEvent<HTMLFormElement>) {
    const target = e.target as HTMLElement;
    if (e.key !== "Enter" || !(target instanceof HTMLInputElement) || e.nativeEvent.isComposing) return;
    if (target.type === "search") return;
    e.preventDefault();
    const all = [...formRef.current!.querySelectorAll<HTMLElement>("input, textarea, select, button[type=submit]")].filter((el) => {
      if ((el as HTMLInputElement).disabled || el.getAttribute("type") === "hidden" || el.offsetParent === null) return false;
      if (el instanceof HTMLInputElement && el.type === "radio") {
        const group = [...formRef.current!.querySelectorAll<HTMLInputElement>(`input[type=radio][name="${CSS.escape(el.name)}"]`)];
        const checked = group.find((r) => r.checked);
        return checked ? el === checked : el === group[0];
      }
      return true;
    });
    const index = all.indexOf(target);
    const next = all[index + 1];
    if (!next || next.getAttribute("type") === "submit") {
      void record();
      return;
    }
    next.focus();
    if (next instanceof HTMLInputElement && next.type === "text") next.select();
  }

  const field = (name: string, label: string, unitText: string | null, value: string, onChange: (text: string) => void, opts: { hint?: string; autoFocus?: boolean; placeholder?: string } = {}) => {
    const id = `${formId}-${name}`;
    const error = errors[name];
    return (
      <QuantityField
        key={name}
        id={id}
        label={label}
        unit={unitText}
        value={value}
        onValue={onChange}
        hint={opts.hint}
        error={error}
        enterKeyHint="next"
        autoFocus={opts.autoFocus}
        placeholder={opts.placeholder}
      />
    );
  };

  const setpoints = setpointsFor(terminal);
  const methods = methodsFor(terminal.kind);
  const registerFactor = instruments.find((i) => i.id === v.instrumentId)?.hoodCorrectionFactor ?? null;
  const errorCount = Object.keys(errors).length;

  return (
    <form ref={formRef} onSubmit={record} onKeyDown={onKeyDown} noValidate aria-label={`Reading of ${terminal.tag}`} className="grid gap-4">
      {errorCount > 0 && (
        <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft p-3 font-semibold text-fault">
          Check the {errorCount === 1 ? "field" : `${errorCount} fields`} marked below; nothing was recorded yet.
        </p>
      )}
      <p className="flex items-start gap-2 rounded-card border border-caution/50 bg-caution-soft px-3 py-2 text-sm">
        <svg viewBox="0 0 24 24" width="22" height="22" aria-hidden="true" className="shrink-0 text-caution">
          <path d="M7 3v18M17 3v18M7 7h10M7 11.5h10M7 16h10" fill="none" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" />
        </svg>
        {unit
          ? "Terminal units sit above the ceiling: work from a secured platform or ladder, and keep clear of reheat coils and energised controls; lock out fan-powered boxes before opening them."
          : "Ceiling outlets: work from a secured ladder or platform, and keep the hood's weight off the ceiling grid."}
      </p>
      <div className="grid gap-4">
          <div className={`grid gap-4 ${unit ? "md:grid-cols-2" : ""}`}>
            <ChoiceGroup legend="Phase" name={`phase-${terminal.id}`} choices={(["initial", "final"] as const).map((p) => ({ value: p, label: p === "initial" ? `${PHASE_LABELS[p]} (as found)` : `${PHASE_LABELS[p]} (after adjustment)` }))} value={v.phase} onChange={(p) => set("phase", p)} />
            {unit && <ChoiceGroup legend="Unit forced to" name={`setpoint-${terminal.id}`} choices={setpoints.map((s) => ({ value: s, label: SETPOINT_LABELS[s] }))} value={v.setpoint} onChange={(s) => set("setpoint", s)} error={errors.setpoint} />}
          </div>
          <ChoiceGroup legend="Read by" name={`method-${terminal.id}`} choices={methods.map((m) => ({ value: m, label: METHOD_LABELS[m] }))} value={v.method} onChange={(m) => draft.setValue((prev) => ({ ...prev, method: m, instrumentId: m === "traverse" ? null : props.preferredInstruments[m] }))} columns={methods.length > 2 ? 4 : 2} />

          {v.method === "hood" && (
            <div className="grid gap-4 md:grid-cols-2">
              {field("hoodReading", "Hood reading", flowUnit, v.hoodReading, (t) => set("hoodReading", t), { autoFocus: true })}
              {field("hoodFactor", "Correction factor", null, v.hoodFactor, (t) => set("hoodFactor", t), {
                placeholder: registerFactor !== null ? String(registerFactor) : "1",
                hint: registerFactor !== null ? `Empty: the register's factor for this hood, ${registerFactor}.` : "Empty: 1 (no correction). The hood's maker gives factors for other tops and outlets.",
              })}
              <ChoiceGroup legend="Did the hood correct for density?" name={`dens-${terminal.id}`} choices={[{ value: "yes", label: "Yes: it shows standard air" }, { value: "no", label: "No: refer it here" }]} value={v.hoodDensityCorrected} onChange={(x) => set("hoodDensityCorrected", x)} />
              <ChoiceGroup legend="Back pressure compensated?" name={`bp-${terminal.id}`} choices={[{ value: "yes", label: "Yes" }, { value: "no", label: "No" }]} value={v.hoodBackPressure} onChange={(x) => set("hoodBackPressure", x)} />
            </div>
          )}

          {v.method === "velocity_area" && (
            <fieldset className="grid gap-3">
              <legend className="mb-1 font-semibold">Velocity readings across the face ({velocityUnit}); they are averaged</legend>
              <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
                {v.velocities.map((text, i) => field(`velocities.${i}`, `Reading ${i + 1}`, null, text, (t) => draft.setValue((prev) => ({ ...prev, velocities: prev.velocities.map((x, j) => (j === i ? t : x)) })), { autoFocus: i === 0 }))}
              </div>
              <div className="flex flex-wrap gap-2">
                <button type="button" className={buttonClasses("secondary")} disabled={v.velocities.length >= MAX_CELLS} onClick={() => set("velocities", [...v.velocities, ""])}>
                  Add a reading cell
                </button>
                {v.velocities.length > 1 && (
                  <button type="button" className={buttonClasses("quiet")} onClick={() => set("velocities", v.velocities.slice(0, Math.max(1, v.velocities.length - 1)))}>
                    Remove the last cell
                  </button>
                )}
              </div>
              <div className="grid gap-4 md:grid-cols-2">
                <ChoiceGroup legend="The anemometer shows" name={`basis-${terminal.id}`} choices={[{ value: "actual", label: "Actual velocity" }, { value: "standard", label: "Standard velocity" }]} value={v.velocityBasis} onChange={(x) => set("velocityBasis", x)} error={errors.velocityBasis} />
                {field("effectiveArea", "Effective area Ak", areaUnit.symbol, v.effectiveArea, (t) => set("effectiveArea", t), {
                  hint: terminal.effectiveAreaM2 !== null ? `Empty: the maker's Ak on record, ${formatIn(areaUnit, terminal.effectiveAreaM2, 4)}.` : "From the maker's data for this outlet and this instrument.",
                })}
              </div>
            </fieldset>
          )}

          {v.method === "traverse" && (
            <fieldset aria-describedby={errors.traverseId ? `${formId}-traverse-error` : undefined}>
              <legend className="mb-1 font-semibold">Traverse of {props.sectionTag}</legend>
              {props.terminalsOnSection > 1 ? (
                <p className="rounded-card border border-dashed border-line-strong p-3 text-ink-soft">
                  {props.sectionTag} feeds {props.terminalsOnSection} terminals: its traverse is their total, not {terminal.tag}&apos;s airflow. Read {terminal.tag} by hood or velocity × area.
                </p>
              ) : props.traverses.length === 0 ? (
                <p className="rounded-card border border-dashed border-line-strong p-3 text-ink-soft">No traverse of {props.sectionTag} yet: traverse it from Field work first.</p>
              ) : (
                <div className="grid gap-2">
                  {props.traverses.map((t, i) => (
                    <label key={t.id} className={`flex min-h-touch cursor-pointer items-start gap-3 rounded-card border-2 px-3 py-2 has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-accent ${v.traverseId === t.id ? "border-accent bg-accent-soft" : "border-line-strong bg-paper-raised"}`}>
                      <input type="radio" name={`traverse-${terminal.id}`} checked={v.traverseId === t.id} disabled={t.standardFlowM3S === null || t.status === "returned"} onChange={() => set("traverseId", t.id)} autoFocus={i === 0} className="mt-1 h-5 w-5 shrink-0 accent-accent" />
                      <span>
                        <span className="font-semibold">Revision {t.revision}</span> · {t.status === "draft" ? "in progress" : t.status}
                        <span className="num block text-sm">{t.standardFlowM3S !== null ? `${formatQuantity(units, "flow", t.standardFlowM3S)} at standard air` : t.problem}</span>
                      </span>
                    </label>
                  ))}
                </div>
              )}
              {errors.traverseId && (
                <p id={`${formId}-traverse-error`} className="mt-1 text-sm font-semibold text-fault">
                  {errors.traverseId}
                </p>
              )}
            </fieldset>
          )}

          {v.method !== "traverse" && (
            <div className="grid gap-4 md:grid-cols-2">
              {field("dryBulb", "Dry-bulb at the outlet", tempUnit, v.dryBulb, (t) => set("dryBulb", t), { hint: "For the air's density; barometric pressure comes from the project's altitude." })}
              {field("rh", "RH at the outlet", "%", v.rh, (t) => set("rh", t), { hint: "Leave empty if not measured: 50 % is assumed." })}
            </div>
          )}

          {unit && (
            <div className="grid gap-4 md:grid-cols-2">
              {field("controllerFlow", "Controller display", flowUnit, v.controllerFlow, (t) => set("controllerFlow", t), { hint: "The airflow the box's controller shows at the same moment." })}
              {field("controllerFactor", "Flow factor in the controller", null, v.controllerFactor, (t) => set("controllerFactor", t), {
                placeholder: terminal.controllerFlowFactor !== null ? String(terminal.controllerFlowFactor) : "",
                hint: terminal.controllerFlowFactor !== null ? `Empty: the design's ${terminal.controllerFlowFactor}.` : "As found in the controller.",
              })}
            </div>
          )}

          {!unit && v.phase === "final" && (
            <label className="flex min-h-touch cursor-pointer items-center gap-3 rounded-card border-2 border-line-strong bg-paper-raised px-3 py-2 font-semibold has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-accent">
              <input type="checkbox" checked={v.damperMarked} onChange={(e) => set("damperMarked", e.target.checked)} className="h-6 w-6 shrink-0 accent-accent" />
              Damper position marked
            </label>
          )}

          <div className="grid gap-3">
            <div className={`rounded-card border-2 p-3 ${errors.conditions ? "border-fault bg-fault-soft" : "border-line bg-paper"}`}>
              <p className="text-sm font-semibold text-ink-muted">Taken under ({props.systemTag})</p>
              {props.conditions ? (
                <p>{summarizeConditions(props.conditions, (pa) => formatQuantity(units, "pressure", pa))}</p>
              ) : (
                <p className="font-semibold text-fault">{errors.conditions ?? "No operating conditions recorded yet: record them above before the first reading."}</p>
              )}
            </div>
            <section aria-live="polite" aria-label="Result" className="rounded-card border-2 border-accent bg-paper-raised p-3">
              <h4 className="mb-2 font-semibold">Result</h4>
              {"standardFlowM3S" in preview ? (
                <ReadingResult result={preview} units={units} live />
              ) : (
                <p className="text-ink-soft">The airflow, % of design and the verdict show here as you type.{preview.missing ? ` Still needed: ${preview.missing}.` : ""}</p>
              )}
            </section>
          </div>

          {v.method !== "traverse" && (
            <div className="grid gap-4 lg:grid-cols-2">
              <InstrumentPicker
                kinds={v.method === "hood" ? ["capture_hood"] : ["thermal_anemometer", "vane_anemometer"]}
                label={v.method === "hood" ? "Capture hood" : "Anemometer"}
                value={v.instrumentId}
                onChange={(i) => set("instrumentId", i?.id ?? null)}
                overdueReason={v.overdueReason}
                onOverdueReasonChange={(r) => set("overdueReason", r)}
                error={errors.instrumentId ?? (errors.overdueReason && !errors.airInstrumentId ? errors.overdueReason : undefined)}
              />
              <InstrumentPicker
                kinds={["thermo_hygrometer"]}
                label="Thermometer for the dry-bulb"
                value={v.airInstrumentId}
                onChange={(i) => set("airInstrumentId", i?.id ?? null)}
                overdueReason={v.overdueReason}
                onOverdueReasonChange={(r) => set("overdueReason", r)}
                error={errors.airInstrumentId}
                allowNone
              />
            </div>
          )}

          <div>
            <label htmlFor={`${formId}-notes`} className="mb-1 block font-semibold">
              Notes
            </label>
            <textarea id={`${formId}-notes`} value={v.notes} onChange={(e) => set("notes", e.target.value)} rows={2} maxLength={1000} className="w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 py-2 text-lg" placeholder="e.g. damper 2 turns in, pattern set to four-way" />
          </div>
      </div>

      <div className="flex flex-wrap gap-3">
        <button type="submit" disabled={busy || !draft.ready} className={buttonClasses("primary", "min-w-48 text-lg")}>
          Record reading<span className="sr-only"> of {terminal.tag}</span>
        </button>
        <button
          type="button"
          className={buttonClasses("secondary")}
          onClick={async () => {
            await draft.discard();
            props.onClose();
          }}
        >
          Cancel
        </button>
      </div>
    </form>
  );
}
