/**
 * Small pieces of a terminal's row: one reading in a cell (airflow, % of design, where it is), and a
 * reading in the history list with everything it carries.
 */
import { SyncIcon, SYNC_LABELS } from "@/components/offline/sync-status";
import { LocalTime } from "@/components/ui/local-time";
import { summarizeConditions, type ConditionsLike } from "@/lib/airflow/conditions";
import { METHOD_LABELS, PHASE_LABELS, SETPOINT_LABELS } from "@/lib/terminals/setpoints";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import type { ReadingView } from "./model";
import { ControllerCheck, Flags, pctText, ReadingVerdict } from "./reading-result";

/** A reading in a table cell: standard airflow and % of design, and a shape when it is still on the device. */
export function ReadingCell({ reading, units, showDamper = false }: { reading: ReadingView | null; units: UnitSystem; showDamper?: boolean }) {
  if (!reading) return <span className="text-ink-soft">Not read</span>;
  const known = Number.isFinite(reading.standardFlowM3S);
  return (
    <span className="grid">
      <span className="num font-semibold">{known ? formatQuantity(units, "flow", reading.standardFlowM3S) : "—"}</span>
      <span className="num text-sm text-ink-soft">{pctText(reading.pctOfDesign)} of design</span>
      {showDamper && <span className="text-sm">{reading.damperMarked ? "Damper marked" : "Damper not marked"}</span>}
      {reading.device && (
        <span className="inline-flex items-center gap-1 text-sm">
          <SyncIcon state={reading.device.state} size={16} />
          {SYNC_LABELS[reading.device.state]}
        </span>
      )}
    </span>
  );
}

/** The verdict of the reading that stands now, with how many things to check. */
export function NowCell({ reading, units }: { reading: ReadingView | null; units: UnitSystem }) {
  if (!reading) return <span className="text-ink-soft">—</span>;
  return (
    <span className="grid gap-0.5">
      <ReadingVerdict result={reading} compact />
      {reading.flags.length > 0 && (
        <span className="inline-flex items-center gap-1 text-sm font-semibold text-fault">
          <svg viewBox="0 0 16 16" width="14" height="14" aria-hidden="true">
            <path d="M8 1.5L15 14H1L8 1.5z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
          </svg>
          {reading.flags.length} to check
        </span>
      )}
      {reading.controllerRatio !== null && (
        <span className="num text-sm">
          Controller ×{reading.controllerRatio.toFixed(2)}
          {reading.suggestedFlowFactor !== null && <> · factor → {reading.suggestedFlowFactor.toFixed(3)}</>}
        </span>
      )}
      {reading.controllerRatio === null && reading.controllerFlowM3S !== null && <span className="text-sm">Controller showed {formatQuantity(units, "flow", reading.controllerFlowM3S)}</span>}
    </span>
  );
}

/** One reading in a terminal's history: when, what, how, by whom, under which conditions, and what to check. */
export function HistoryItem({ reading, units, conditions }: { reading: ReadingView; units: UnitSystem; conditions: ConditionsLike | null }) {
  const known = Number.isFinite(reading.standardFlowM3S);
  return (
    <li className="grid gap-2 border-b border-line py-3 last:border-b-0">
      <p className="flex flex-wrap items-baseline gap-x-3">
        <strong>
          {PHASE_LABELS[reading.phase]}
          {reading.setpoint !== "design" && ` at ${SETPOINT_LABELS[reading.setpoint].toLowerCase()}`}
        </strong>
        <LocalTime iso={reading.takenAt} />
        <span className="text-sm text-ink-soft">
          {METHOD_LABELS[reading.method]}
          {reading.takenByName && ` · ${reading.takenByName}`}
          {reading.instrumentName && ` · ${reading.instrumentName}`}
        </span>
        {reading.device && (
          <span className="inline-flex items-center gap-1 text-sm font-semibold">
            <SyncIcon state={reading.device.state} size={16} /> {SYNC_LABELS[reading.device.state]}
          </span>
        )}
      </p>
      <p className="num">
        {known ? (
          <>
            <strong>{formatQuantity(units, "flow", reading.standardFlowM3S)}</strong> at standard air ({formatQuantity(units, "flow", reading.flowM3S)} actual) ·{" "}
          </>
        ) : null}
        <ReadingVerdict result={reading} />
        {reading.phase === "final" && reading.setpoint === "design" && <> · {reading.damperMarked ? "damper position marked" : "damper position not marked"}</>}
      </p>
      <p className="text-sm text-ink-soft">Conditions: {conditions ? summarizeConditions(conditions, (pa) => formatQuantity(units, "pressure", pa)) : "not recorded"}</p>
      <ControllerCheck result={reading} units={units} />
      <Flags flags={reading.flags} />
      {reading.warnings.length > 0 && (
        <ul className="text-sm">
          {reading.warnings.map((w) => (
            <li key={w}>
              <strong>Note:</strong> {w}
            </li>
          ))}
        </ul>
      )}
      {reading.notes && <p className="text-sm">“{reading.notes}”</p>}
      {reading.steps.length > 0 && (
        <details className="text-sm">
          <summary className="inline-flex min-h-touch cursor-pointer items-center font-semibold text-accent-strong">How it was worked out</summary>
          <ol className="list-decimal space-y-1 pl-5">
            {reading.steps.map((s) => (
              <li key={s}>{s}</li>
            ))}
          </ol>
        </details>
      )}
    </li>
  );
}
