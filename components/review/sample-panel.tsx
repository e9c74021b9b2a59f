"use client";

/**
 * Verification samples: the commissioning agent draws a reproducible random sample of a submitted
 * system's sections, outlets and terminal units, enters their own readings under recorded operating
 * conditions, and sees each compared with the technician's within the project's tolerance; when more
 * disagree than the project allows, the panel recommends returning the whole system and offers it.
 */
import { useId, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { ApiError } from "@/lib/api-client";
import { reviewApi, reviewKeys, type Sample } from "@/lib/api-client/review";
import { summarizeConditions, type ConditionsLike } from "@/lib/airflow/conditions";
import { displayUnit, formatQuantity, fromDisplay, type UnitSystem } from "@/lib/units";
import { parseDecimal } from "@/lib/validation/decimal";
import { DecisionForm } from "./decision-form";

export interface SampleSystem {
  id: string;
  tag: string;
  name: string;
  submitted: number;
  conditions: (ConditionsLike & { id: string; recordedAt: string })[];
}

export interface SampleRuleText {
  samplePct: number;
  minCount: number;
  tolerancePct: number;
  allowedFailures: number;
}

const KIND = { outlet: "Outlet", terminal_unit: "Terminal unit", section: "Duct section" } as const;

export function SamplePanel({ projectId, systems, initial, units, rule, canAct }: { projectId: string; systems: SampleSystem[]; initial: Sample[]; units: UnitSystem; rule: SampleRuleText; canAct: boolean }) {
  const client = useQueryClient();
  const { data } = useQuery({ queryKey: reviewKeys.samples(projectId), queryFn: async () => (await reviewApi.samples(projectId)).samples, initialData: initial });
  const refresh = () => Promise.all([client.invalidateQueries({ queryKey: reviewKeys.samples(projectId) }), client.invalidateQueries({ queryKey: reviewKeys.queue(projectId) })]);
  const draw = useMutation({ mutationFn: (systemId: string) => reviewApi.drawSample(projectId, systemId), onSuccess: () => refresh() });

  return (
    <div className="grid gap-4">
      <p className="text-ink-soft">
        Rule for this project: {rule.samplePct} % of each kind (at least one of each kind read), at least {rule.minCount} items in all; a reading agrees within ±{rule.tolerancePct} % of the technician&apos;s; {rule.allowedFailures}{" "}
        {rule.allowedFailures === 1 ? "disagreement is" : "disagreements are"} allowed before the whole system should be returned. Change it in the project&apos;s settings.
      </p>
      {systems.map((system) => {
        const latest = data.find((s) => s.systemId === system.id);
        return (
          <section key={system.id} aria-labelledby={`sample-${system.id}`} className="grid gap-3 rounded-card border-2 border-line p-4">
            <div className="flex flex-wrap items-center justify-between gap-3">
              <h3 id={`sample-${system.id}`}>
                {system.tag} — {system.name}
              </h3>
              {canAct && system.submitted > 0 && (
                <Button type="button" variant={latest ? "secondary" : "primary"} disabled={draw.isPending} onClick={() => draw.mutate(system.id)}>
                  {latest ? "Draw a new sample" : "Draw a verification sample"}
                  <span className="sr-only"> of {system.tag}</span>
                </Button>
              )}
            </div>
            {draw.error && draw.variables === system.id && (
              <p role="alert" className="font-semibold text-fault">
                {draw.error instanceof ApiError ? draw.error.message : "The sample could not be drawn; nothing was stored."}
              </p>
            )}
            {latest ? (
              <SampleView sample={latest} system={system} projectId={projectId} units={units} canAct={canAct} onChanged={refresh} />
            ) : (
              <p className="text-ink-soft">{system.submitted > 0 ? "No sample drawn yet." : "Nothing submitted in this system: a sample is drawn from submitted readings."}</p>
            )}
          </section>
        );
      })}
    </div>
  );
}

function SampleView({ sample, system, projectId, units, canAct, onChanged }: { sample: Sample; system: SampleSystem; projectId: string; units: UnitSystem; canAct: boolean; onChanged: () => Promise<unknown> }) {
  const o = sample.outcome;
  return (
    <div className="grid gap-3">
      <p className="text-sm text-ink-soft">
        Drawn by {sample.drawnByName ?? "—"} on {new Date(sample.drawnAt).toISOString().slice(0, 16).replace("T", " ")} UTC · seed <span className="num">{sample.seed}</span> · {sample.items.length} of {sample.populationCount} items
        {sample.reproduced ? " · the stored seed draws these same items again" : " · the stored seed no longer reproduces this draw"}
      </p>
      <p role="status" className={`rounded-card border-2 p-3 font-semibold ${o.recommendReturn ? "border-fault bg-fault-soft text-fault" : "border-line bg-paper-raised"}`}>
        {o.recommendReturn ? "⚠ " : ""}
        {o.message}
      </p>
      {o.recommendReturn && canAct && system.submitted > 0 && (
        <details className="rounded-card border border-fault p-3" open>
          <summary className="min-h-touch cursor-pointer content-center font-semibold">Return everything submitted in {system.tag}</summary>
          <div className="mt-3">
            <DecisionForm label={`everything submitted in ${system.tag}`} suggestReturn onDecide={(input) => reviewApi.reviewSystem(projectId, system.id, input)} onDone={() => void onChanged()} />
          </div>
        </details>
      )}
      <ul className="grid gap-3">
        {sample.items.map((item) => (
          <SampleItemRow key={item.id} item={item} sample={sample} system={system} projectId={projectId} units={units} canAct={canAct} onChanged={onChanged} />
        ))}
      </ul>
    </div>
  );
}

function SampleItemRow({ item, sample, system, projectId, units, canAct, onChanged }: { item: Sample["items"][number]; sample: Sample; system: SampleSystem; projectId: string; units: UnitSystem; canAct: boolean; onChanged: () => Promise<unknown> }) {
  const id = useId();
  const section = item.kind === "section";
  const [method, setMethod] = useState<"hood" | "velocity_area" | "spot_traverse">(section ? "spot_traverse" : "hood");
  const [flowText, setFlowText] = useState("");
  const [velocitiesText, setVelocitiesText] = useState("");
  const [areaText, setAreaText] = useState("");
  const [conditionsId, setConditionsId] = useState(item.technician.conditionsId ?? system.conditions[0]?.id ?? "");
  const [error, setError] = useState<{ message: string; fields: Record<string, string> } | null>(null);
  const flowUnit = displayUnit(units, "flow");
  const save = useMutation({
    mutationFn: (body: unknown) => reviewApi.sampleReading(projectId, sample.id, item.id, body),
    onSuccess: () => {
      setError(null);
      void onChanged();
    },
    onError: (err) => setError(err instanceof ApiError ? { message: err.message, fields: err.fields } : { message: "Not saved; try again.", fields: {} }),
  });
  const witness = useMutation({ mutationFn: (w: boolean) => reviewApi.witness(projectId, sample.id, item.id, w), onSuccess: () => void onChanged() });

  const submit = () => {
    const fields: Record<string, string> = {};
    let body: Record<string, unknown> = { method, conditionsId: conditionsId || null };
    if (method === "velocity_area") {
      const velocities = velocitiesText.split(/[\s;]+/).filter(Boolean).map(parseDecimal);
      const area = parseDecimal(areaText);
      if (velocities.length === 0 || velocities.some((v) => v === null || v === "invalid")) fields.velocitiesMS = "Enter the velocities in m/s at standard air, separated by spaces.";
      if (area === null || area === "invalid") fields.effectiveAreaM2 = "Enter the effective area (Ak) in m².";
      body = { ...body, velocitiesMS: velocities, effectiveAreaM2: area };
    } else {
      const v = parseDecimal(flowText);
      if (v === null || v === "invalid" || v <= 0) fields.standardFlowM3S = `Enter the standard airflow in ${flowUnit.symbol}, a number above 0.`;
      else body = { ...body, standardFlowM3S: fromDisplay(units, "flow", v) };
    }
    if (Object.keys(fields).length > 0) return setError({ message: "Check the reading.", fields });
    save.mutate(body);
  };
  const verdict =
    item.agrees === true ? { text: "Agrees", shape: "✓", tone: "text-ok" } : item.agrees === false ? { text: "Disagrees", shape: "✕", tone: "text-fault" } : item.agent ? { text: "Not compared", shape: "!", tone: "text-caution" } : { text: "Not read yet", shape: "○", tone: "text-ink-soft" };

  return (
    <li className="grid gap-2 rounded-card border border-line bg-paper-raised p-3">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <p>
          <span className="font-semibold">{item.tag}</span> <span className="text-sm text-ink-soft">{KIND[item.kind]}</span>
        </p>
        <p className={`font-semibold ${verdict.tone}`}>
          <span aria-hidden="true">{verdict.shape} </span>
          {verdict.text}
          {item.differencePct !== null && item.agent && <span className="num"> ({item.differencePct >= 0 ? "+" : ""}{item.differencePct.toFixed(1)} %)</span>}
        </p>
      </div>
      <p className="num text-sm">
        Technician: {item.technician.flowM3S === null ? "—" : formatQuantity(units, "flow", item.technician.flowM3S)}
        {item.agent && <> · Agent: {formatQuantity(units, "flow", item.agent.flowM3S)} ({item.agent.method === "hood" ? "capture hood" : item.agent.method === "velocity_area" ? "velocity × area" : "spot traverse"})</>}
      </p>
      {item.conditionsDiffer.length > 0 && (
        <ul className="list-disc pl-5 text-sm font-semibold text-caution">
          {item.conditionsDiffer.map((m) => (
            <li key={m}>{m} Not compared: record readings under the same conditions.</li>
          ))}
        </ul>
      )}
      {canAct && (
        <div className="grid gap-2 md:grid-cols-[auto_auto_1fr_auto] md:items-end">
          <div>
            <label htmlFor={`${id}-method`} className="mb-1 block text-sm font-semibold">
              How read
            </label>
            <select id={`${id}-method`} value={method} onChange={(e) => setMethod(e.target.value as typeof method)} className="min-h-touch rounded-card border-2 border-line-strong bg-paper px-2">
              {section ? (
                <option value="spot_traverse">Spot traverse (standard airflow)</option>
              ) : (
                <>
                  <option value="hood">Capture hood (standard airflow)</option>
                  <option value="velocity_area">Velocity × effective area</option>
                </>
              )}
            </select>
          </div>
          {method === "velocity_area" ? (
            <>
              <div>
                <label htmlFor={`${id}-vel`} className="mb-1 block text-sm font-semibold">
                  Velocities (m/s, standard)
                </label>
                <input id={`${id}-vel`} inputMode="decimal" value={velocitiesText} onChange={(e) => setVelocitiesText(e.target.value)} aria-describedby={`${id}-err`} className="min-h-touch w-40 rounded-card border-2 border-line-strong bg-paper px-2" />
              </div>
              <div>
                <label htmlFor={`${id}-ak`} className="mb-1 block text-sm font-semibold">
                  Ak (m²)
                </label>
                <input id={`${id}-ak`} inputMode="decimal" value={areaText} onChange={(e) => setAreaText(e.target.value)} aria-describedby={`${id}-err`} className="min-h-touch w-28 rounded-card border-2 border-line-strong bg-paper px-2" />
              </div>
            </>
          ) : (
            <div>
              <label htmlFor={`${id}-flow`} className="mb-1 block text-sm font-semibold">
                Agent&apos;s airflow ({flowUnit.symbol}, standard)
              </label>
              <input id={`${id}-flow`} inputMode="decimal" value={flowText} onChange={(e) => setFlowText(e.target.value)} aria-describedby={`${id}-err`} className="min-h-touch w-36 rounded-card border-2 border-line-strong bg-paper px-2" />
            </div>
          )}
          <div className={method === "velocity_area" ? "md:col-span-4" : ""}>
            <label htmlFor={`${id}-cond`} className="mb-1 block text-sm font-semibold">
              Operating conditions
            </label>
            <select id={`${id}-cond`} value={conditionsId} onChange={(e) => setConditionsId(e.target.value)} className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper px-2">
              <option value="">Not recorded</option>
              {system.conditions.map((c) => (
                <option key={c.id} value={c.id}>
                  {new Date(c.recordedAt).toISOString().slice(0, 16).replace("T", " ")} UTC — {summarizeConditions(c)}
                  {c.id === item.technician.conditionsId ? " (the technician's)" : ""}
                </option>
              ))}
            </select>
          </div>
          <div className="flex flex-wrap items-center gap-3 md:col-span-4">
            <Button type="button" onClick={submit} disabled={save.isPending}>
              {item.agent ? "Replace reading" : "Save reading"}
              <span className="sr-only"> of {item.tag}</span>
            </Button>
            <label className="flex min-h-touch cursor-pointer items-center gap-2">
              <input type="checkbox" checked={item.witnessed} disabled={witness.isPending} onChange={(e) => witness.mutate(e.target.checked)} className="h-6 w-6" />
              Witnessed<span className="sr-only"> {item.tag}</span>
            </label>
          </div>
          <div id={`${id}-err`} aria-live="polite" className="text-sm font-semibold text-fault md:col-span-4">
            {error && (
              <>
                {error.message}
                {Object.entries(error.fields).map(([k, v]) => (
                  <span key={k} className="block">
                    {v}
                  </span>
                ))}
              </>
            )}
          </div>
        </div>
      )}
    </li>
  );
}
