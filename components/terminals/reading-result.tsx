/**
 * What one reading means, in words and shapes: the airflow at standard air, % of design and the
 * verdict against the band, the controller check of a terminal unit, and what to look at (flags,
 * cautions, the steps taken). Used live in the entry panel and in each terminal's history.
 */
import { Verdict } from "@/components/ui/status";
import { formatTolerance } from "@/lib/airflow/tolerance";
import type { Tolerance } from "@/lib/airflow/balancing";
import { formatQuantity, type UnitSystem } from "@/lib/units";

export interface ResultLike {
  standardFlowM3S: number;
  flowM3S: number;
  designFlowM3S: number | null;
  pctOfDesign: number | null;
  withinTolerance: boolean | null;
  tolerance: Tolerance;
  controllerFlowM3S: number | null;
  controllerFlowFactor: number | null;
  controllerRatio: number | null;
  suggestedFlowFactor: number | null;
  steps: string[];
  warnings: string[];
  flags: string[];
}

export function pctText(pct: number | null): string {
  return pct === null ? "—" : `${Math.round(pct)} %`;
}

/** The verdict in words with its shape; "No design to compare" when nothing is scheduled. */
export function ReadingVerdict({ result, compact = false }: { result: Pick<ResultLike, "pctOfDesign" | "withinTolerance" | "tolerance">; compact?: boolean }) {
  if (result.withinTolerance === null || result.pctOfDesign === null) return <span className="text-ink-soft">No design to compare</span>;
  return (
    <span className="inline-flex flex-wrap items-center gap-x-2">
      <span className="num font-semibold">{pctText(result.pctOfDesign)}</span>
      <Verdict pass={result.withinTolerance} passLabel={compact ? "Within" : "Within tolerance"} failLabel={compact ? "Outside" : "Outside tolerance"} />
      {!compact && <span className="text-sm text-ink-soft">({formatTolerance(result.tolerance)})</span>}
    </span>
  );
}

/** Flags in words with a warning shape: implausible, never silently accepted. */
export function Flags({ flags, title = "Check this reading" }: { flags: string[]; title?: string }) {
  if (flags.length === 0) return null;
  return (
    <div className="rounded-card border-2 border-fault bg-fault-soft p-3 text-sm">
      <p className="flex items-center gap-2 font-semibold text-fault">
        <svg viewBox="0 0 16 16" width="18" height="18" aria-hidden="true">
          <path d="M8 1.5L15 14H1L8 1.5z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
          <path d="M8 6v4M8 11.8v.4" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        </svg>
        {title}
      </p>
      <ul className="mt-1 list-disc space-y-1 pl-5 text-ink">
        {flags.map((f) => (
          <li key={f}>{f}</li>
        ))}
      </ul>
    </div>
  );
}

/** A terminal unit's controller against the measured airflow: the ratio and the factor that would correct it. */
export function ControllerCheck({ result, units }: { result: ResultLike; units: UnitSystem }) {
  if (result.controllerFlowM3S === null) return null;
  return (
    <div className="rounded-card border border-line bg-paper p-3">
      <p className="font-semibold">Controller display {formatQuantity(units, "flow", result.controllerFlowM3S)}</p>
      {result.controllerRatio === null ? (
        <p className="text-sm">The display read zero: no ratio to correct by.</p>
      ) : (
        <>
          <p className="num">
            Measured ÷ displayed <strong>{result.controllerRatio.toFixed(3)}</strong>
          </p>
          {result.suggestedFlowFactor !== null && result.controllerFlowFactor !== null ? (
            <p className="num">
              Flow factor {result.controllerFlowFactor.toFixed(3)} → <strong>{result.suggestedFlowFactor.toFixed(3)}</strong>
              <span className="block text-sm text-ink-soft">
                = factor × (measured ÷ displayed)²: the factor scales the sensed velocity pressure, and airflow goes as its square root. For the controls contractor to set.
              </span>
            </p>
          ) : (
            <p className="text-sm text-ink-soft">No flow factor on record: give the one in the controller to get the corrected factor.</p>
          )}
        </>
      )}
    </div>
  );
}

/** The whole result: figures, verdict, controller check, flags, cautions and the steps (folded). */
export function ReadingResult({ result, units, live = false }: { result: ResultLike; units: UnitSystem; live?: boolean }) {
  return (
    <div className="grid gap-3">
      <div className="grid gap-1">
        <p className="num text-xl">
          <strong>{formatQuantity(units, "flow", result.standardFlowM3S)}</strong> <span className="text-base text-ink-soft">at standard air</span>
        </p>
        <p className="num text-sm text-ink-soft">
          {formatQuantity(units, "flow", result.flowM3S)} actual
          {result.designFlowM3S !== null && <> · design {formatQuantity(units, "flow", result.designFlowM3S)}</>}
        </p>
        <p>
          <ReadingVerdict result={result} />
        </p>
      </div>
      <ControllerCheck result={result} units={units} />
      <Flags flags={result.flags} />
      {result.warnings.length > 0 && (
        <ul className="rounded-card border-2 border-caution bg-caution-soft p-3 text-sm">
          {result.warnings.map((w) => (
            <li key={w}>
              <strong>Note:</strong> {w}
            </li>
          ))}
        </ul>
      )}
      {result.steps.length > 0 && (
        <details className="text-sm" open={live}>
          <summary className="inline-flex min-h-touch cursor-pointer items-center font-semibold text-accent-strong">How it was worked out</summary>
          <ol className="list-decimal space-y-1 pl-5">
            {result.steps.map((s) => (
              <li key={s}>{s}</li>
            ))}
          </ol>
        </details>
      )}
    </div>
  );
}
