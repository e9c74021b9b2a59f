"use client";

/**
 * A system's operating conditions: the current ones in one line, the ones recorded on this device
 * that the server does not have yet (with where they are), and a compact form to record new ones.
 * With `onChange` it is also a picker: the technician chooses which recorded conditions a set of
 * readings was taken under (the current ones by default), and sees how they differ from the current.
 */
import { useQueryClient } from "@tanstack/react-query";
import { useEffect, useId, useState, useSyncExternalStore } from "react";
import { SyncStatus } from "@/components/offline/sync-status";
import { LocalTime } from "@/components/ui/local-time";
import { buttonClasses } from "@/components/ui/button";
import { fieldKeys, useDeviceConditions, useSystemConditions, type Conditions, type ConditionsBody } from "@/lib/api-client/field";
import { compareConditions, summarizeConditions, type ConditionsLike } from "@/lib/airflow/conditions";
import { useSyncQueue } from "@/lib/offline/offline-context";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import { ConditionsForm, type ConditionsSystem } from "./conditions-form";

/** A record the picker can offer: from the server, or kept on this device until the server has it. */
export interface PickedConditions extends ConditionsLike {
  id: string;
  recordedAt: string;
  /** False while the record is only on this device. */
  onServer: boolean;
}

export interface ConditionsPickerProps {
  projectId: string;
  system: ConditionsSystem;
  units: UnitSystem;
  /** Technicians: show "Record new conditions". */
  canRecord: boolean;
  /** Server-rendered list (newest first) for the first paint. */
  initial?: Conditions[];
  /** Picker mode: the chosen record's id (null = none). Omit both to only show and record. */
  value?: string | null;
  onChange?: (picked: PickedConditions | null) => void;
  /** Heading level inside the page (default h3). */
  headingLevel?: 2 | 3;
}

const MAX_CHOICES = 6;

function fromServer(c: Conditions): PickedConditions {
  return { ...c, onServer: true };
}

function fromDevice(b: ConditionsBody): PickedConditions {
  return {
    id: b.id,
    recordedAt: b.recordedAt,
    fanSpeedRpm: b.fanSpeedRpm ?? null,
    vfdHz: b.vfdHz ?? null,
    boxes: b.boxes ?? "none",
    outsideAirDamperPct: b.outsideAirDamperPct ?? null,
    ductStaticSetpointPa: b.ductStaticSetpointPa ?? null,
    filterState: b.filterState ?? "unknown",
    onServer: false,
  };
}

export function ConditionsPicker({ projectId, system, units, canRecord, initial, value, onChange, headingLevel = 3 }: ConditionsPickerProps) {
  const headingId = useId();
  const queue = useSyncQueue();
  const client = useQueryClient();
  const query = useSystemConditions(projectId, system.id, initial);
  const device = useDeviceConditions(system.id);
  const [formOpen, setFormOpen] = useState(false);
  // A form typed earlier and not recorded (e.g. before a reload) opens again with what was typed.
  const formDraftKey = `conditions-form:${system.id}`;
  const draftWaiting = useSyncExternalStore(
    (l) => (queue ? queue.subscribe(formDraftKey, l) : () => {}),
    () => !!queue?.snapshot(formDraftKey)?.dirty,
    () => false,
  );
  const open = formOpen || draftWaiting;
  const fmtPa = (pa: number) => formatQuantity(units, "pressure", pa);

  const serverList = query.data?.data ?? initial ?? [];
  const listed = new Set(serverList.map((c) => c.id));
  // Records made on this device stay shown, with where they are, until the server's list includes them.
  const onDevice = device.filter((r) => !listed.has(r.value.id));
  const savedUnlisted = onDevice.filter((r) => r.state === "saved").map((r) => r.key).join("|");
  useEffect(() => {
    if (savedUnlisted) void client.invalidateQueries({ queryKey: fieldKeys.conditions(projectId, system.id) });
  }, [client, projectId, system.id, savedUnlisted]);
  const listedKeys = device.filter((r) => listed.has(r.value.id) && r.state === "saved").map((r) => r.key).join("|");
  useEffect(() => {
    if (queue && listedKeys) for (const key of listedKeys.split("|")) void queue.discard(key);
  }, [queue, listedKeys]);

  const all: PickedConditions[] = [...onDevice.map((r) => ({ ...fromDevice(r.value), onServer: r.state === "saved" })), ...serverList.map(fromServer)].sort((a, b) =>
    b.recordedAt.localeCompare(a.recordedAt),
  );
  const current = all[0] ?? null;
  const chosen = value === undefined ? current : (all.find((c) => c.id === value) ?? null);

  // Picker mode with nothing chosen yet: the current conditions are the natural default.
  useEffect(() => {
    if (onChange && value === null && current) onChange(current);
  }, [onChange, value, current]);

  const Heading = headingLevel === 2 ? "h2" : "h3";
  const differences = chosen && current && chosen.id !== current.id ? compareConditions(chosen, current, { labels: ["the chosen conditions", "the current ones"], formatPressure: fmtPa }) : [];

  return (
    <section aria-labelledby={headingId} className="grid gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <Heading id={headingId} className="text-lg font-semibold">
          Operating conditions <span className="font-normal text-ink-soft">· {system.tag}</span>
        </Heading>
        {query.data?.fromDevice && <span className="text-sm text-ink-soft">Shown from this device (no network)</span>}
      </div>

      {current ? (
        <div role="group" aria-label="Current conditions" className="rounded-card border border-line bg-paper p-3">
          <p className="text-sm font-semibold text-ink-muted">Current{current.onServer ? "" : " · on this device until the server has it"}</p>
          <p className="text-lg">{summarizeConditions(current, fmtPa)}</p>
          <p className="text-sm text-ink-soft">
            Recorded <LocalTime iso={current.recordedAt} />
            {"recordedByName" in current && current.recordedByName ? ` by ${String(current.recordedByName)}` : ""}
          </p>
        </div>
      ) : (
        <p className="rounded-card border border-dashed border-line-strong bg-paper p-3 text-ink-soft">
          No conditions recorded yet for {system.tag}.{canRecord ? " Record them before the first readings: fan speed, terminal units, outside-air damper, static set point and filters." : ""}
        </p>
      )}

      {onDevice.map((r) => (
        <div key={r.key} className="grid gap-1">
          {r.value.id !== current?.id && <p className="text-sm">{summarizeConditions(fromDevice(r.value), fmtPa)}</p>}
          <SyncStatus syncState={r.state} error={r.error} nextAttemptAt={r.nextAttemptAt} online={queue?.isOnline()} retry={() => queue?.retry(r.key)} what="these conditions" />
        </div>
      ))}

      {onChange && all.length > 0 && (
        <fieldset>
          <legend className="mb-1 font-semibold">Readings taken under</legend>
          <div className="grid gap-2">
            {all.slice(0, MAX_CHOICES).map((c, i) => (
              <label
                key={c.id}
                className={`flex min-h-touch cursor-pointer items-start gap-3 rounded-card border-2 px-3 py-2 has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-accent ${chosen?.id === c.id ? "border-accent bg-accent-soft" : "border-line-strong bg-paper-raised"}`}
              >
                <input type="radio" name={`conditions-${headingId}`} checked={chosen?.id === c.id} onChange={() => onChange(c)} className="mt-1 h-5 w-5 shrink-0 accent-accent" />
                <span>
                  <span className="font-semibold">{i === 0 ? "Current" : "Earlier"}</span> · <LocalTime iso={c.recordedAt} />
                  {!c.onServer && " · on this device only"}
                  <span className="block text-sm">{summarizeConditions(c, fmtPa)}</span>
                </span>
              </label>
            ))}
          </div>
        </fieldset>
      )}

      {differences.length > 0 && (
        <div role="note" className="rounded-card border-2 border-caution bg-caution-soft p-3 text-sm">
          <p className="font-semibold">These readings are not comparable with readings under the current conditions:</p>
          <ul className="list-disc pl-5">
            {differences.map((d) => (
              <li key={d.message}>{d.message}</li>
            ))}
          </ul>
        </div>
      )}

      {canRecord &&
        (open ? (
          <div className="rounded-card border-2 border-accent bg-paper-raised p-3">
            <ConditionsForm projectId={projectId} system={system} units={units} focusFirst={formOpen} onDone={() => setFormOpen(false)} />
          </div>
        ) : (
          <div>
            <button type="button" className={buttonClasses(current ? "secondary" : "primary")} onClick={() => setFormOpen(true)}>
              {current ? "Record changed conditions" : "Record conditions"}
              <span className="sr-only"> for {system.tag}</span>
            </button>
          </div>
        ))}
    </section>
  );
}
