"use client";

/**
 * One branch's outlets and terminal units: design against the latest initial and final readings,
 * the verdict of the reading that stands now, each terminal's history, the entry panel in place
 * below the terminal being read, and the branch's balancing plan.
 */
import { useId } from "react";
import type { PickedConditions } from "@/components/conditions/conditions-picker";
import { SyncStatus } from "@/components/offline/sync-status";
import { buttonClasses } from "@/components/ui/button";
import type { TerminalReadingBody } from "@/lib/api-client/terminals";
import type { ConditionsLike } from "@/lib/airflow/conditions";
import { compareConditions } from "@/lib/airflow/conditions";
import { toleranceFor } from "@/lib/airflow/tolerance";
import { useSyncQueue } from "@/lib/offline/offline-context";
import { currentReading, latestByPhase } from "@/lib/terminals/history";
import { designFlowAt, SETPOINT_LABELS, setpointsFor } from "@/lib/terminals/setpoints";
import type { TerminalSetpoint } from "@/db/schema";
import { isTerminalUnit, TERMINAL_KIND_LABELS } from "@/lib/validation/design";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import type { BoardBranch, BoardProject, BoardTerminal, BoardTraverse, ReadingView } from "./model";
import { OutletBalancing } from "./outlet-balancing";
import { HistoryItem, NowCell, ReadingCell } from "./reading-cells";
import type { PanelValues } from "./reading-form";
import { ReadingPanel } from "./reading-panel";

export interface OpenPanel {
  terminalId: string;
  setpoint: TerminalSetpoint;
  initial: PanelValues;
}

export interface BranchTableProps {
  projectId: string;
  systemTag: string;
  branch: BoardBranch;
  project: BoardProject;
  units: UnitSystem;
  canRecord: boolean;
  readingsOf: (terminalId: string) => ReadingView[];
  conditionsOf: (id: string | null) => ConditionsLike | null;
  conditions: PickedConditions | null;
  traversesOf: (sectionId: string) => BoardTraverse[];
  terminalsOnSection: number;
  open: OpenPanel | null;
  preferredInstruments: { hood: string | null; velocity_area: string | null };
  onOpen: (terminal: BoardTerminal, setpoint: TerminalSetpoint, restore?: TerminalReadingBody) => void;
  onClose: () => void;
  onRecorded: (terminal: BoardTerminal, setpoint: TerminalSetpoint, values: PanelValues, readingId: string) => void;
  historyOpen: ReadonlySet<string>;
  onToggleHistory: (terminalId: string) => void;
  /** The reading recorded last on this screen: its row keeps saying where it is, "Saved" included. */
  recent: { terminalId: string; readingId: string; phase: string } | null;
}

export const readButtonId = (terminalId: string, setpoint: TerminalSetpoint) => `read-${terminalId}-${setpoint}`;

const COLUMNS = 6;

export function BranchTable(props: BranchTableProps) {
  const { branch, units, project, canRecord } = props;
  const headingId = useId();
  const queue = useSyncQueue();
  const outlets = branch.terminals.filter((t) => !isTerminalUnit(t.kind));

  return (
    <section aria-labelledby={headingId} className="grid gap-3">
      <h3 id={headingId} className="text-lg font-semibold">
        {branch.tag} <span className="font-normal text-ink-soft">· {branch.location || "branch"} · design {formatQuantity(units, "flow", branch.designFlowM3S)}</span>
      </h3>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[44rem] table-fixed text-left">
          <colgroup>
            <col className="w-[24%]" />
            <col className="w-[12%]" />
            <col className="w-[16%]" />
            <col className="w-[16%]" />
            <col className="w-[17%]" />
            <col className="w-[15%]" />
          </colgroup>
          <caption className="sr-only">
            Outlets and terminal units on {branch.tag}: design airflow, the latest initial and final readings at standard air, and the verdict of the reading that stands now
          </caption>
          <thead className="border-b-2 border-line text-sm text-ink-muted">
            <tr>
              <th scope="col" className="py-2 pr-3">
                Terminal
              </th>
              <th scope="col" className="py-2 pr-3">
                Design
              </th>
              <th scope="col" className="py-2 pr-3">
                Initial
              </th>
              <th scope="col" className="py-2 pr-3">
                Final
              </th>
              <th scope="col" className="py-2 pr-3">
                Now
              </th>
              <th scope="col" className="py-2">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {branch.terminals.map((terminal) => {
              const readings = props.readingsOf(terminal.id);
              const latest = latestByPhase(readings);
              const unit = isTerminalUnit(terminal.kind);
              const setpoints = setpointsFor(terminal);
              const device = readings.filter((r) => r.device);
              const historyShown = props.historyOpen.has(terminal.id);
              const panelHere = props.open?.terminalId === terminal.id;
              return [
                ...setpoints.map((setpoint, i) => {
                  const pair = latest[setpoint] ?? { initial: null, final: null };
                  const now = currentReading(readings, setpoint);
                  const design = designFlowAt(terminal, setpoint);
                  const comparable =
                    pair.initial && pair.final && pair.initial.conditionsId !== pair.final.conditionsId
                      ? compareConditions(props.conditionsOf(pair.initial.conditionsId), props.conditionsOf(pair.final.conditionsId), { labels: ["the initial reading", "the final one"] })
                      : [];
                  return (
                    <tr key={`${terminal.id}-${setpoint}`} className={`align-top ${i === setpoints.length - 1 ? "border-b border-line" : ""}`}>
                      <th scope="row" className="py-2 pr-3 text-left font-normal">
                        {i === 0 ? (
                          <span className="grid">
                            <span className="text-lg font-semibold">{terminal.tag}</span>{" "}
                            <span className="text-sm text-ink-soft">
                              {TERMINAL_KIND_LABELS[terminal.kind]}
                              {terminal.room && ` · ${terminal.room}`}
                            </span>{" "}
                          </span>
                        ) : (
                          <span className="sr-only">{terminal.tag} </span>
                        )}
                        {unit && <span className="block font-semibold">{SETPOINT_LABELS[setpoint]}</span>}
                      </th>
                      <td className="num py-2 pr-3">{design === null ? "—" : formatQuantity(units, "flow", design)}</td>
                      <td className="py-2 pr-3">
                        <ReadingCell reading={pair.initial} units={units} />
                      </td>
                      <td className="py-2 pr-3">
                        <ReadingCell reading={pair.final} units={units} showDamper={!unit && pair.final !== null} />
                      </td>
                      <td className="py-2 pr-3">
                        <NowCell reading={now} units={units} />
                        {comparable.length > 0 && <span className="block text-sm font-semibold text-caution">Initial and final under different conditions</span>}
                      </td>
                      <td className="py-2">
                        <span className="flex flex-col items-stretch gap-2">
                          {canRecord && (
                            <button
                              id={readButtonId(terminal.id, setpoint)}
                              type="button"
                              aria-expanded={panelHere && props.open?.setpoint === setpoint}
                              className={buttonClasses(now ? "secondary" : "primary", "px-3")}
                              onClick={() => (panelHere && props.open?.setpoint === setpoint ? props.onClose() : props.onOpen(terminal, setpoint))}
                            >
                              {panelHere && props.open?.setpoint === setpoint ? "Close" : "Read"}
                              <span className="sr-only">
                                {" "}
                                {terminal.tag}
                                {unit ? ` at ${SETPOINT_LABELS[setpoint].toLowerCase()}` : ""}
                              </span>
                            </button>
                          )}
                          {i === 0 && readings.length > 0 && (
                            <button type="button" aria-expanded={historyShown} className={buttonClasses("quiet", "whitespace-nowrap px-1")} onClick={() => props.onToggleHistory(terminal.id)}>
                              History ({readings.length})<span className="sr-only"> of {terminal.tag}</span>
                            </button>
                          )}
                        </span>
                      </td>
                    </tr>
                  );
                }),
                ...device
                  .filter((r) => r.device!.state !== "saved")
                  .map((r) => (
                    <tr key={`${r.id}-sync`}>
                      <td colSpan={COLUMNS} className="pb-2">
                        <div className="grid gap-2">
                          <SyncStatus
                            syncState={r.device!.state}
                            error={r.device!.error}
                            nextAttemptAt={r.device!.nextAttemptAt}
                            online={queue?.isOnline()}
                            retry={() => queue?.retry(r.device!.key)}
                            what={`the ${r.phase} reading of ${terminal.tag}`}
                            singular
                          />
                          {r.device!.state === "error" && canRecord && (
                            <div>
                              <button
                                type="button"
                                className={buttonClasses("secondary")}
                                onClick={async () => {
                                  await queue?.discard(r.device!.key);
                                  props.onOpen(terminal, r.setpoint, r.device!.body);
                                }}
                              >
                                Correct and record again<span className="sr-only"> the reading of {terminal.tag}</span>
                              </button>
                            </div>
                          )}
                        </div>
                      </td>
                    </tr>
                  )),
                props.recent?.terminalId === terminal.id && !device.some((r) => r.id === props.recent!.readingId && r.device!.state !== "saved") && readings.some((r) => r.id === props.recent!.readingId) ? (
                  <tr key={`${terminal.id}-recent`}>
                    <td colSpan={COLUMNS} className="pb-2">
                      <SyncStatus syncState="saved" what={`the ${props.recent.phase} reading of ${terminal.tag}`} singular />
                    </td>
                  </tr>
                ) : null,
                panelHere && props.open ? (
                  <tr key={`${terminal.id}-panel`}>
                    <td colSpan={COLUMNS} className="pb-4">
                      <div className="rounded-card border-2 border-accent bg-paper-raised p-3">
                        <ReadingPanel
                          key={`${props.open.setpoint}-${props.open.initial.phase}`}
                          projectId={props.projectId}
                          terminal={terminal}
                          systemTag={props.systemTag}
                          sectionTag={branch.tag}
                          project={project}
                          units={units}
                          conditions={props.conditions}
                          traverses={props.terminalsOnSection === 1 ? props.traversesOf(terminal.sectionId) : []}
                          terminalsOnSection={props.terminalsOnSection}
                          initial={props.open.initial}
                          preferredInstruments={props.preferredInstruments}
                          onRecorded={(_key, body, values) => props.onRecorded(terminal, props.open!.setpoint, values, body.id)}
                          onClose={props.onClose}
                        />
                      </div>
                    </td>
                  </tr>
                ) : null,
                historyShown ? (
                  <tr key={`${terminal.id}-history`}>
                    <td colSpan={COLUMNS} className="pb-4">
                      <div className="rounded-card border border-line bg-paper px-3">
                        <p id={`history-${terminal.id}`} className="pt-3 font-semibold">
                          History of {terminal.tag}, newest first (every reading is kept)
                        </p>
                        <ol aria-label={`Readings of ${terminal.tag}, newest first`}>
                          {readings.map((r) => (
                            <HistoryItem key={r.id} reading={r} units={units} conditions={props.conditionsOf(r.conditionsId)} />
                          ))}
                        </ol>
                      </div>
                    </td>
                  </tr>
                ) : null,
              ];
            })}
          </tbody>
        </table>
      </div>
      {outlets.length > 1 && (
        <OutletBalancing
          branchTag={branch.tag}
          outlets={outlets.map((t) => ({ tag: t.tag, designFlowM3S: t.designFlowM3S, reading: currentReading(props.readingsOf(t.id), "design") }))}
          tolerance={toleranceFor(project, "outlet")}
          units={units}
          conditionsOf={props.conditionsOf}
        />
      )}
    </section>
  );
}
