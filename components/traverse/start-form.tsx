"use client";

/**
 * Start a traverse of a section: method, the engine's suggested counts with its reason (changeable),
 * port offset, readings kind, instruments from the register with their calibration, the air at the
 * plane (barometric pressure from the project's altitude unless measured; an empty duct static is
 * stated as assumed), and the operating conditions. Kept on this device while typed. Starting needs
 * the network once; the screen says so when it is not there.
 */
import { useRouter } from "next/navigation";
import { useEffect, useId, useMemo, useState } from "react";
import { ConditionsPicker } from "@/components/conditions/conditions-picker";
import type { ConditionsSystem } from "@/components/conditions/conditions-form";
import { InstrumentPicker } from "@/components/instruments/instrument-picker";
import { buttonClasses } from "@/components/ui/button";
import { ChoiceGroup } from "@/components/ui/choice-group";
import { QuantityField } from "@/components/ui/quantity-field";
import { ApiError } from "@/lib/api-client";
import { useFieldKit, type Conditions } from "@/lib/api-client/field";
import { traverseApi } from "@/lib/api-client/traverses";
import { barometricPressureFromAltitudePa } from "@/lib/airflow/air";
import { runCalcCommand } from "@/lib/airflow/commands";
import { fieldRoutes } from "@/lib/field-routes";
import { newId } from "@/lib/offline/ids";
import { useOfflineDraft } from "@/lib/offline/use-offline-draft";
import { camelKeys } from "@/lib/traverse/engine-input";
import type { LayoutJson } from "@/lib/traverse/result-types";
import { displayUnit, formatQuantity, fromDisplay, type UnitSystem } from "@/lib/units";
import { parseDecimal } from "@/lib/validation/decimal";
import { zodFieldErrors } from "@/lib/validation/result";
import { traverseCreateSchema, type ReadingsKind } from "@/lib/validation/traverses";
import { CrossSection } from "./cross-section";
import { InsertionDepths } from "./insertion-depths";

export interface StartSection {
  id: string;
  tag: string;
  shape: "round" | "rectangular";
  diameterMm: number | null;
  widthMm: number | null;
  heightMm: number | null;
  straightUpstreamMm: number | null;
  straightDownstreamMm: number | null;
  designFlowM3S: number;
  location: string;
}

interface Values {
  method: "equal-area" | "log-linear";
  readingsKind: ReadingsKind;
  lines: string;
  pointsPerLine: string;
  portOffset: string;
  dryBulb: string;
  humidity: "rh" | "wb";
  rh: string;
  wetBulb: string;
  staticPressure: string;
  barometric: string;
  standardDensity: string;
  readingInstrumentId: string | null;
  probeInstrumentId: string | null;
  airInstrumentId: string | null;
  barometerInstrumentId: string | null;
  overdueReason: string;
  conditionsId: string | null;
  /** Instruments taken from today's kit once; the technician's later choices stand. */
  kitApplied: boolean;
}

const EMPTY: Values = {
  method: "log-linear",
  readingsKind: "velocity_pressure",
  lines: "",
  pointsPerLine: "",
  portOffset: "",
  dryBulb: "",
  humidity: "rh",
  rh: "",
  wetBulb: "",
  staticPressure: "",
  barometric: "",
  standardDensity: "",
  readingInstrumentId: null,
  probeInstrumentId: null,
  airInstrumentId: null,
  barometerInstrumentId: null,
  overdueReason: "",
  conditionsId: null,
  kitApplied: false,
};

const KIND_CHOICES = [
  { value: "velocity_pressure" as const, label: "Pitot tube: velocity pressures" },
  { value: "velocity_actual" as const, label: "Anemometer: actual velocities" },
  { value: "velocity_standard" as const, label: "Anemometer: standard velocities" },
];

export function StartTraverseForm({
  projectId,
  section,
  system,
  units,
  altitudeM,
  standardDensityKgM3,
  nextRevision,
  conditions,
}: {
  projectId: string;
  section: StartSection;
  system: ConditionsSystem;
  units: UnitSystem;
  altitudeM: number;
  standardDensityKgM3: number;
  nextRevision: number;
  conditions: Conditions[];
}) {
  const formId = useId();
  const router = useRouter();
  const draft = useOfflineDraft<Values>({ key: `traverse-start:${section.id}`, initial: EMPTY });
  const kit = useFieldKit(projectId);
  const v = draft.value;
  const set = <K extends keyof Values>(name: K, value: Values[K]) => draft.setValue((prev) => ({ ...prev, [name]: value }));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  // Today's kit from the Field work screen fills the instruments once.
  const kitReady = draft.ready && kit.ready && !v.kitApplied;
  const setDraft = draft.setValue;
  const kitValue = kit.value;
  useEffect(() => {
    if (!kitReady) return;
    setDraft((prev) => ({
      ...prev,
      kitApplied: true,
      readingInstrumentId: prev.readingInstrumentId ?? kitValue.readingInstrumentId,
      probeInstrumentId: prev.probeInstrumentId ?? kitValue.probeInstrumentId,
      airInstrumentId: prev.airInstrumentId ?? kitValue.airInstrumentId,
      barometerInstrumentId: prev.barometerInstrumentId ?? kitValue.barometerInstrumentId,
      overdueReason: prev.overdueReason || kitValue.overdueReason,
    }));
  }, [kitReady, setDraft, kitValue]);

  const dim = displayUnit(units, "dimension");
  const pressure = displayUnit(units, "pressure");
  const baro = displayUnit(units, "barometric");
  const temp = displayUnit(units, "temperature");
  const density = displayUnit(units, "density");
  const standardBaroPa = barometricPressureFromAltitudePa(altitudeM);

  const numbers = useMemo(() => {
    const errs: Record<string, string> = {};
    const num = (text: string, field: string) => {
      const n = parseDecimal(text);
      if (n === "invalid") errs[field] = `must be a number; got "${text.trim()}"`;
      return n === "invalid" ? null : n;
    };
    const lines = num(v.lines, "lines");
    const points = num(v.pointsPerLine, "pointsPerLine");
    const offset = num(v.portOffset, "portOffsetMm");
    const dry = num(v.dryBulb, "air.dryBulbC");
    const rh = v.humidity === "rh" ? num(v.rh, "air.relativeHumidityPct") : null;
    const wb = v.humidity === "wb" ? num(v.wetBulb, "air.wetBulbC") : null;
    const st = num(v.staticPressure, "air.staticPa");
    const bp = num(v.barometric, "air.barometricPa");
    const sd = num(v.standardDensity, "instrument.standardDensityKgM3");
    return {
      errs,
      lines,
      points,
      body: {
        id: "",
        sectionId: section.id,
        method: v.method,
        ...(lines !== null ? { lines } : {}),
        ...(points !== null ? { pointsPerLine: points } : {}),
        portOffsetMm: offset === null ? 0 : fromDisplay(units, "dimension", offset),
        readingsKind: v.readingsKind,
        air: {
          dryBulbC: dry === null ? (undefined as unknown as number) : fromDisplay(units, "temperature", dry),
          ...(v.humidity === "rh" ? { relativeHumidityPct: rh } : { wetBulbC: wb === null ? null : fromDisplay(units, "temperature", wb) }),
          staticPa: st === null ? null : fromDisplay(units, "pressure", st),
          barometricPa: bp === null ? null : fromDisplay(units, "barometric", bp),
        },
        instrument: {
          readingInstrumentId: v.readingInstrumentId,
          probeInstrumentId: v.readingsKind === "velocity_pressure" ? v.probeInstrumentId : null,
          airInstrumentId: v.airInstrumentId,
          barometerInstrumentId: v.barometerInstrumentId,
          overdueReason: v.overdueReason,
          standardDensityKgM3: sd === null ? null : fromDisplay(units, "density", sd),
        },
        conditionsId: v.conditionsId,
      },
    };
  }, [v, units, section.id]);

  const duct = section.shape === "round" ? { shape: "round" as const, diameter_mm: section.diameterMm ?? 0 } : { shape: "rectangular" as const, width_mm: section.widthMm ?? 0, height_mm: section.heightMm ?? 0 };
  const layoutRun = runCalcCommand("layout", {
    duct,
    method: v.method,
    ...(numbers.lines !== null ? { lines: numbers.lines } : {}),
    ...(numbers.points !== null ? { points_per_line: numbers.points } : {}),
    ...(section.straightUpstreamMm !== null ? { straight_upstream_mm: section.straightUpstreamMm } : {}),
    ...(section.straightDownstreamMm !== null ? { straight_downstream_mm: section.straightDownstreamMm } : {}),
    port_offset_mm: numbers.body.portOffsetMm,
  });
  const layout = layoutRun.ok ? (camelKeys(layoutRun.value) as LayoutJson) : null;
  const layoutError = layoutRun.ok ? null : Object.values(layoutRun.error.fields ?? {})[0] ?? layoutRun.error.message;
  const drawingDuct = section.shape === "round" ? { shape: "round" as const, diameterMm: section.diameterMm ?? 0 } : { shape: "rectangular" as const, widthMm: section.widthMm ?? 0, heightMm: section.heightMm ?? 0 };
  const lineNoun = section.shape === "round" ? "Diameters" : "Lines";

  async function start(e: React.FormEvent) {
    e.preventDefault();
    setMessage(null);
    const body = { ...numbers.body, id: newId() };
    const parsed = traverseCreateSchema.safeParse(body);
    const fieldErrors = { ...(parsed.success ? {} : zodFieldErrors(parsed.error)), ...numbers.errs };
    if (layoutError) fieldErrors.pointsPerLine ??= layoutError;
    if (Object.keys(fieldErrors).length > 0) {
      setErrors(fieldErrors);
      setMessage("Check the fields marked below.");
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      const res = await traverseApi.create(projectId, parsed.data as Parameters<typeof traverseApi.create>[1]);
      await draft.discard();
      router.push(fieldRoutes.traverse(projectId, res.traverse.id));
    } catch (err) {
      if (err instanceof ApiError && err.status === 0) setMessage("No network: a new traverse needs the server once. Everything typed here stays on this device; start it when the connection returns, then readings are kept on the tablet as usual.");
      else if (err instanceof ApiError) {
        setErrors(err.fields);
        setMessage(err.message);
      } else setMessage("The traverse could not be started; try again.");
    } finally {
      setBusy(false);
    }
  }

  const field = (name: keyof Values, apiField: string, label: string, unit: string, hint?: string) => {
    const id = `${formId}-${String(name)}`;
    const error = errors[apiField];
    return <QuantityField id={id} label={label} unit={unit} value={String(v[name] ?? "")} onValue={(text) => set(name, text as never)} hint={hint} error={error} />;
  };

  return (
    <form onSubmit={start} noValidate className="grid gap-gutter" aria-label={`Start a traverse of ${section.tag}`}>
      {!draft.online && (
        <p role="status" className="rounded-card border-2 border-caution bg-caution-soft p-3 font-semibold">
          No network. A new traverse needs the server once to be started; what you type here is kept on this device until then.
        </p>
      )}
      {message && (
        <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft p-3 font-semibold">
          {message}
        </p>
      )}

      <section aria-labelledby={`${formId}-layout`} className="grid gap-4 rounded-card border border-line bg-paper-raised p-gutter">
        <h2 id={`${formId}-layout`}>Layout</h2>
        <ChoiceGroup
          legend="Method"
          name="method"
          choices={[
            { value: "log-linear", label: section.shape === "round" ? "Log-linear" : "Log-Tchebycheff" },
            { value: "equal-area", label: "Equal-area" },
          ]}
          value={v.method}
          onChange={(m) => draft.setValue((prev) => ({ ...prev, method: m, lines: "", pointsPerLine: "" }))}
        />
        {layout && (
          <div className="rounded-card border border-line bg-paper p-3" aria-live="polite">
            <p className="font-semibold">
              Suggested: {layout.recommended.lines} {lineNoun.toLowerCase()} × {layout.recommended.pointsPerLine} points
            </p>
            <p className="text-sm">{layout.reason}</p>
            {layout.warnings.map((w) => (
              <p key={w} className="mt-1 text-sm font-semibold text-caution">
                ▲ {w}
              </p>
            ))}
          </div>
        )}
        <div className="grid gap-4 sm:grid-cols-3">
          {field("lines", "lines", lineNoun, "count", `Empty: ${layout?.recommended.lines ?? "the suggestion"}`)}
          {field("pointsPerLine", "pointsPerLine", "Points per line", "count", `Empty: ${layout?.recommended.pointsPerLine ?? "the suggestion"}`)}
          {field("portOffset", "portOffsetMm", "Port offset", dim.symbol, "Wall, insulation and port fitting, added to every depth.")}
        </div>
        {layoutError && <p className="font-semibold text-fault">{layoutError}</p>}
        <ChoiceGroup legend="Readings" name="kind" choices={KIND_CHOICES} value={v.readingsKind} onChange={(k) => set("readingsKind", k)} />
        {v.readingsKind === "velocity_standard" &&
          field("standardDensity", "instrument.standardDensityKgM3", "Anemometer's reference density", density.symbol, `From its manual; empty: the project's standard air, ${formatQuantity(units, "density", standardDensityKgM3)}.`)}
        {layout && (
          <details className="rounded-card border border-line p-3">
            <summary className="min-h-touch cursor-pointer py-2 font-semibold">Drawing and insertion depths</summary>
            <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
              <CrossSection duct={drawingDuct} layout={layout} title={`Cross-section of ${section.tag} with the traverse points`} />
              <InsertionDepths layout={layout} units={units} portOffsetMm={numbers.body.portOffsetMm} round={section.shape === "round"} />
            </div>
          </details>
        )}
      </section>

      <section aria-labelledby={`${formId}-instruments`} className="grid gap-4 rounded-card border border-line bg-paper-raised p-gutter">
        <h2 id={`${formId}-instruments`}>Instruments</h2>
        <InstrumentPicker
          kinds={v.readingsKind === "velocity_pressure" ? ["manometer"] : ["thermal_anemometer", "vane_anemometer"]}
          label={v.readingsKind === "velocity_pressure" ? "Manometer" : "Anemometer"}
          value={v.readingInstrumentId}
          onChange={(i) => set("readingInstrumentId", i?.id ?? null)}
          overdueReason={v.overdueReason}
          onOverdueReasonChange={(r) => set("overdueReason", r)}
          error={errors["instrument.readingInstrumentId"] ?? errors["instrument.overdueReason"]}
          allowNone
        />
        {v.readingsKind === "velocity_pressure" && (
          <InstrumentPicker
            kinds={["pitot_tube"]}
            label="Pitot tube"
            value={v.probeInstrumentId}
            onChange={(i) => set("probeInstrumentId", i?.id ?? null)}
            overdueReason={v.overdueReason}
            onOverdueReasonChange={(r) => set("overdueReason", r)}
            error={errors["instrument.probeInstrumentId"]}
            allowNone
          />
        )}
        <div className="grid gap-4 xl:grid-cols-2">
          <InstrumentPicker kinds={["thermo_hygrometer"]} label="Thermo-hygrometer" value={v.airInstrumentId} onChange={(i) => set("airInstrumentId", i?.id ?? null)} overdueReason={v.overdueReason} onOverdueReasonChange={(r) => set("overdueReason", r)} error={errors["instrument.airInstrumentId"]} allowNone />
          <InstrumentPicker kinds={["barometer"]} label="Barometer" value={v.barometerInstrumentId} onChange={(i) => set("barometerInstrumentId", i?.id ?? null)} overdueReason={v.overdueReason} onOverdueReasonChange={(r) => set("overdueReason", r)} error={errors["instrument.barometerInstrumentId"]} allowNone />
        </div>
      </section>

      <section aria-labelledby={`${formId}-air`} className="grid gap-4 rounded-card border border-line bg-paper-raised p-gutter">
        <h2 id={`${formId}-air`}>Air at the plane</h2>
        <div className="grid gap-4 sm:grid-cols-2">
          {field("dryBulb", "air.dryBulbC", "Dry-bulb", temp.symbol)}
          <ChoiceGroup legend="Humidity as" name="humidity" choices={[{ value: "rh", label: "Relative humidity" }, { value: "wb", label: "Wet-bulb" }]} value={v.humidity} onChange={(h) => set("humidity", h)} />
          {v.humidity === "rh" ? field("rh", "air.relativeHumidityPct", "Relative humidity", "%") : field("wetBulb", "air.wetBulbC", "Wet-bulb", temp.symbol)}
          {field(
            "staticPressure",
            "air.staticPa",
            "Duct static pressure",
            pressure.symbol,
            v.staticPressure.trim() === "" ? "Not measured yet: left empty, 0 is assumed and the result says so. Negative on return and exhaust ducts." : "Gauge pressure at the plane; negative on return and exhaust ducts.",
          )}
          {field("barometric", "air.barometricPa", "Barometric pressure", baro.symbol, `Empty: ${formatQuantity(units, "barometric", standardBaroPa)}, the standard atmosphere at the site's ${formatQuantity(units, "length", altitudeM, { decimals: 0 })}. Give the station reading, not a sea-level weather report.`)}
        </div>
        {errors["air.relativeHumidityPct"] && v.humidity === "wb" && <p className="text-sm font-semibold text-fault">{errors["air.relativeHumidityPct"]}</p>}
      </section>

      <section className="rounded-card border border-line bg-paper-raised p-gutter">
        <ConditionsPicker projectId={projectId} system={system} units={units} canRecord initial={conditions} value={v.conditionsId} onChange={(c) => set("conditionsId", c?.id ?? null)} headingLevel={2} />
        {errors.conditionsId && <p className="mt-2 text-sm font-semibold text-fault">{errors.conditionsId}</p>}
      </section>

      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" disabled={busy || !draft.ready} className={buttonClasses("primary", "min-w-56 text-lg")}>
          Start traverse{nextRevision > 1 ? ` (revision ${nextRevision})` : ""}
        </button>
        <p className="text-sm text-ink-soft">{nextRevision > 1 ? `Earlier traverses of ${section.tag} stay as history.` : "Kept on this device while you type."}</p>
      </div>
    </form>
  );
}
