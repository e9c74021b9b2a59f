"use client";

/**
 * The Terminals screen: per system, its operating conditions and each branch's outlets and terminal
 * units with design, readings, verdicts, history and the balancing plan. Readings come from the
 * server (kept on the device for use without network) and from this device until the server has
 * them; technicians read terminals in place.
 */
import { useQueryClient } from "@tanstack/react-query";
import { useEffect, useMemo, useState } from "react";
import { ConditionsPicker, type PickedConditions } from "@/components/conditions/conditions-picker";
import { StatusBadge } from "@/components/ui/status";
import { Card, EmptyState } from "@/components/ui/card";
import { useFieldKit, useInstruments, type Conditions } from "@/lib/api-client/field";
import { terminalKeys, useDeviceTerminalReadings, useProjectTerminalReadings, type ProjectReadings, type TerminalReadingBody } from "@/lib/api-client/terminals";
import type { ConditionsLike } from "@/lib/airflow/conditions";
import { useSyncQueue } from "@/lib/offline/offline-context";
import { useOfflineDraft } from "@/lib/offline/use-offline-draft";
import { quantityFormat } from "@/lib/terminals/format";
import { latestByPhase, newestFirst } from "@/lib/terminals/history";
import type { TerminalSetpoint } from "@/db/schema";
import type { UnitSystem } from "@/lib/units";
import { BranchTable, readButtonId, type OpenPanel } from "./branch-table";
import { viewFromDevice, viewFromServer, type BoardProject, type BoardSystem, type BoardTerminal, type BoardTraverse, type ReadingView } from "./model";
import { DEFAULT_HABITS, initialValues, panelFromBody, type Habits, type PanelValues } from "./reading-form";

export interface TerminalsBoardProps {
  projectId: string;
  project: BoardProject;
  units: UnitSystem;
  canRecord: boolean;
  userName: string | null;
  systems: BoardSystem[];
  traverses: BoardTraverse[];
  /** Terminals fed by each section, by section id. */
  terminalsPerSection: Record<string, number>;
  initialReadings: ProjectReadings;
}

const KIND_LABEL = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" } as const;

export function TerminalsBoard(props: TerminalsBoardProps) {
  const { projectId, project, units, canRecord, systems } = props;
  const queue = useSyncQueue();
  const client = useQueryClient();
  const query = useProjectTerminalReadings(projectId, props.initialReadings);
  const server = query.data?.data ?? props.initialReadings;
  const device = useDeviceTerminalReadings();
  const register = useInstruments({ includeRetired: true });
  const kit = useFieldKit(projectId);
  const habits = useOfflineDraft<Habits>({ key: `terminal-habits:${projectId}`, initial: DEFAULT_HABITS });
  const format = useMemo(() => quantityFormat(units), [units]);
  const [open, setOpen] = useState<OpenPanel | null>(null);
  const [historyOpen, setHistoryOpen] = useState<Set<string>>(new Set());
  const [picked, setPicked] = useState<Record<string, PickedConditions | null>>({});
  const [recent, setRecent] = useState<{ terminalId: string; readingId: string; phase: string } | null>(null);

  const terminals = useMemo(() => new Map(systems.flatMap((s) => s.branches.flatMap((b) => b.terminals)).map((t) => [t.id, t])), [systems]);
  const instruments = useMemo(() => new Map((register.data?.data ?? []).map((i) => [i.id, i])), [register.data]);

  // Readings recorded here stay shown, with where they are, until the server's list includes them.
  const listed = useMemo(() => new Set(server.readings.map((r) => r.id)), [server.readings]);
  const onDevice = device.filter((r) => !listed.has(r.value.id));
  const savedUnlisted = onDevice.filter((r) => r.state === "saved").map((r) => r.key).join("|");
  useEffect(() => {
    if (savedUnlisted) void client.invalidateQueries({ queryKey: terminalKeys.project(projectId) });
  }, [client, projectId, savedUnlisted]);
  const listedKeys = device.filter((r) => listed.has(r.value.id) && r.state === "saved").map((r) => r.key).join("|");
  useEffect(() => {
    if (queue && listedKeys) for (const key of listedKeys.split("|")) void queue.discard(key);
  }, [queue, listedKeys]);

  const byTerminal = new Map<string, ReadingView[]>();
  const add = (v: ReadingView) => byTerminal.set(v.terminalId, [...(byTerminal.get(v.terminalId) ?? []), v]);
  for (const r of server.readings) add(viewFromServer(r));
  for (const r of onDevice) {
    const terminal = terminals.get(r.terminalId);
    if (terminal) add(viewFromDevice(r, { terminal, project, format, instruments, traverses: props.traverses, userName: props.userName }));
  }
  const readingsOf = (terminalId: string) => newestFirst(byTerminal.get(terminalId) ?? []);

  const conditionsById = new Map<string, ConditionsLike>();
  for (const c of [...systems.flatMap((s) => s.conditions), ...server.conditions] as Conditions[]) conditionsById.set(c.id, c);
  for (const c of Object.values(picked)) if (c) conditionsById.set(c.id, c);
  const conditionsOf = (id: string | null) => (id ? (conditionsById.get(id) ?? null) : null);

  const effectiveHabits: Habits = {
    ...habits.value,
    hoodInstrumentId: habits.value.hoodInstrumentId ?? kit.value.hoodInstrumentId,
    anemometerId:
      habits.value.anemometerId ??
      (kit.value.readingInstrumentId && ["thermal_anemometer", "vane_anemometer"].includes(instruments.get(kit.value.readingInstrumentId)?.kind ?? "") ? kit.value.readingInstrumentId : null),
    airInstrumentId: habits.value.airInstrumentId ?? kit.value.airInstrumentId,
  };

  function openPanel(terminal: BoardTerminal, setpoint: TerminalSetpoint, restore?: TerminalReadingBody) {
    const pair = latestByPhase(readingsOf(terminal.id))[setpoint];
    const base = initialValues(terminal, setpoint, pair?.initial ? "final" : "initial", effectiveHabits);
    if (!base.overdueReason && kit.value.overdueReason) base.overdueReason = kit.value.overdueReason;
    setRecent(null);
    setOpen({ terminalId: terminal.id, setpoint, initial: restore ? panelFromBody(restore, units, base) : base });
  }

  function recorded(terminal: BoardTerminal, setpoint: TerminalSetpoint, values: PanelValues, readingId: string) {
    setRecent({ terminalId: terminal.id, readingId, phase: values.phase });
    habits.setValue((h) => ({
      ...h,
      method: values.method === "traverse" ? h.method : values.method,
      hoodDensityCorrected: values.hoodDensityCorrected,
      hoodBackPressure: values.hoodBackPressure,
      velocityBasis: values.velocityBasis,
      dryBulb: values.dryBulb || h.dryBulb,
      rh: values.rh,
      hoodInstrumentId: values.method === "hood" ? values.instrumentId : h.hoodInstrumentId,
      anemometerId: values.method === "velocity_area" ? values.instrumentId : h.anemometerId,
      airInstrumentId: values.airInstrumentId,
    }));
    setOpen(null);
    requestAnimationFrame(() => document.getElementById(readButtonId(terminal.id, setpoint))?.focus());
  }

  function close() {
    const was = open;
    setOpen(null);
    if (was) requestAnimationFrame(() => document.getElementById(readButtonId(was.terminalId, was.setpoint))?.focus());
  }

  if (systems.length === 0) return <EmptyState>No air systems in this project yet: the project&apos;s engineer sets them up, with their outlets and terminal units, in Set-up.</EmptyState>;

  return (
    <>
      {query.data?.fromDevice && (
        <p role="status" className="rounded-card border border-line bg-paper-raised px-3 py-2">
          Readings shown as kept on this device (no network); what you record now is kept here and sent when the connection returns.
        </p>
      )}
      {server.truncated && <p className="rounded-card border border-caution bg-caution-soft px-3 py-2">Only the newest {server.readings.length.toLocaleString("en-US")} readings are shown.</p>}
      {systems.map((system) => {
        const set = server.sets.find((s) => s.systemId === system.id) ?? null;
        const branches = system.branches.filter((b) => b.terminals.length > 0);
        const chosen = picked[system.id] ?? null;
        return (
          <Card
            key={system.id}
            title={
              <span>
                {system.tag} <span className="font-normal text-ink-soft">· {system.name}</span>
              </span>
            }
            actions={
              <span className="flex flex-wrap items-center gap-2 text-sm text-ink-soft">
                {KIND_LABEL[system.kind]}
                {system.location && ` · ${system.location}`}
                {set ? (
                  <span className="inline-flex items-center gap-2">
                    · Terminal readings <StatusBadge status={set.status} />
                    {set.revision > 1 && <span>revision {set.revision}</span>}
                  </span>
                ) : (
                  " · No terminal readings yet"
                )}
              </span>
            }
          >
            <div className="grid gap-gutter">
              <div className="rounded-card border border-line p-3">
                <ConditionsPicker
                  projectId={projectId}
                  system={{ id: system.id, tag: system.tag, name: system.name, fanSpeedRpm: system.fanSpeedRpm, hasVfd: system.hasVfd, kind: system.kind }}
                  units={units}
                  canRecord={canRecord}
                  initial={system.conditions}
                  {...(canRecord ? { value: chosen?.id ?? null, onChange: (c: PickedConditions | null) => setPicked((p) => (p[system.id]?.id === c?.id ? p : { ...p, [system.id]: c })) } : {})}
                />
              </div>
              {branches.length === 0 ? (
                <EmptyState>No outlets or terminal units scheduled on {system.tag} yet: the project&apos;s engineer adds them in Set-up.</EmptyState>
              ) : (
                branches.map((branch) => (
                  <BranchTable
                    key={branch.id}
                    projectId={projectId}
                    systemTag={system.tag}
                    branch={branch}
                    project={project}
                    units={units}
                    canRecord={canRecord}
                    readingsOf={readingsOf}
                    conditionsOf={conditionsOf}
                    conditions={chosen}
                    traversesOf={(sectionId) => props.traverses.filter((t) => t.sectionId === sectionId)}
                    terminalsOnSection={props.terminalsPerSection[branch.id] ?? 0}
                    open={open && branch.terminals.some((t) => t.id === open.terminalId) ? open : null}
                    onOpen={openPanel}
                    onClose={close}
                    onRecorded={recorded}
                    recent={recent}
                    preferredInstruments={{ hood: effectiveHabits.hoodInstrumentId, velocity_area: effectiveHabits.anemometerId }}
                    historyOpen={historyOpen}
                    onToggleHistory={(id) =>
                      setHistoryOpen((h) => {
                        const next = new Set(h);
                        if (next.has(id)) next.delete(id);
                        else next.add(id);
                        return next;
                      })
                    }
                  />
                ))
              )}
            </div>
          </Card>
        );
      })}
    </>
  );
}
