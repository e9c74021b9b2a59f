/**
 * The traverse's numbers as each value lands: mean velocity, flows, % of design, the plane-quality
 * verdict with its reasons, the expanded uncertainty with its k, how gaps were filled, and the
 * engine's warnings. Where they came from is stated: this tablet, or the server's saved result.
 */
import { pct } from "@/components/airflow/format";
import { formatExpandedUncertainty } from "@/lib/airflow/uncertainty-format";
import type { TraverseResultJson } from "@/lib/traverse/result-types";
import { formatQuantity, type UnitSystem } from "@/lib/units";

const VERDICT: Record<TraverseResultJson["quality"]["verdict"], { label: string; tone: string; shape: string }> = {
  good: { label: "Plane good", tone: "border-ok bg-ok-soft", shape: "●" },
  marginal: { label: "Plane marginal", tone: "border-caution bg-caution-soft", shape: "◆" },
  poor: { label: "Plane poor", tone: "border-fault bg-fault-soft", shape: "■" },
};

const FILL_WORDS: Record<string, string> = {
  mirror: "the point at the same position on the other half of its line",
  "along-line": "interpolation along the line",
  "across-lines": "interpolation across the lines",
  "same-radius": "the points at the same radius on the other diameters",
};

export interface ResultSource {
  kind: "server" | "tablet";
  version: number | null;
}

export function LiveResults({
  result,
  units,
  designFlowM3S,
  tolerance,
  source,
  headingId,
}: {
  result: TraverseResultJson;
  units: UnitSystem;
  designFlowM3S: number;
  tolerance: { minusPct: number; plusPct: number };
  source: ResultSource;
  headingId: string;
}) {
  const pctOfDesign = (100 * result.standardFlowM3S) / designFlowM3S;
  const within = pctOfDesign >= 100 - tolerance.minusPct && pctOfDesign <= 100 + tolerance.plusPct;
  const v = VERDICT[result.quality.verdict];
  const counts = result.counts;
  const fills = [...new Set(result.points.filter((p) => p.filledFrom).map((p) => FILL_WORDS[p.filledFrom!] ?? p.filledFrom!))];
  const flowU = (u: { expandedPct: number | null }) => (u.expandedPct === null ? "not determinable" : formatExpandedUncertainty(u.expandedPct / 100));
  return (
    <div className="grid gap-3" aria-live="polite">
      <p className="text-sm text-ink-soft">
        {source.kind === "server" ? `Saved on the server (version ${source.version}).` : "Computed on this tablet as you type; the server's result replaces it once saved (they are the same calculation)."}
        {counts && ` ${counts.read} of ${counts.points} points read${counts.unreadable > 0 ? `, ${counts.unreadable} unreadable` : ""}${counts.notRead > 0 ? `, ${counts.notRead} not read yet` : ""}.`}
      </p>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-2 sm:grid-cols-3">
        <Figure label="Mean velocity" value={formatQuantity(units, "velocity", result.meanVelocityMS)} testId="mean-velocity" />
        <Figure label="Airflow at the plane" value={formatQuantity(units, "flow", result.flowM3S)} testId="actual-flow" />
        <Figure label="Standard airflow" value={formatQuantity(units, "flow", result.standardFlowM3S)} testId="standard-flow" />
        <Figure label="Mass flow" value={formatQuantity(units, "massFlow", result.massFlowKgS)} testId="mass-flow" />
        <Figure label="Air density" value={formatQuantity(units, "density", result.densityKgM3)} testId="density" />
        <div>
          <dt className="text-sm text-ink-soft">Of design ({formatQuantity(units, "flow", designFlowM3S)})</dt>
          <dd className="num text-xl font-semibold" data-testid="pct-of-design">
            {pct(pctOfDesign, 1)}{" "}
            <span className={`text-base ${within ? "text-ok" : "text-fault"}`}>
              {within ? "✓ within" : "✕ outside"} −{tolerance.minusPct}/+{tolerance.plusPct} %
            </span>
          </dd>
        </div>
      </dl>
      <p className="text-sm">
        <strong>Uncertainty</strong> of the standard airflow{" "}
        <span className="num font-semibold" data-testid="uncertainty">
          {result.uncertainty.expandedPct === null ? "not determinable" : formatExpandedUncertainty(result.uncertainty.expandedPct / 100)}
        </span>
        ; airflow at the plane {flowU(result.uncertainty.actual)}; mass flow {flowU(result.uncertainty.mass)}.
      </p>
      <div className={`rounded-card border-2 p-3 ${v.tone}`}>
        <p id={headingId} className="font-semibold">
          <span aria-hidden="true">{v.shape}</span> {v.label}
        </p>
        <ul className="list-disc pl-5 text-sm">
          {result.quality.reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      </div>
      {result.filledPoints > 0 && (
        <p className="text-sm">
          <strong>Gaps:</strong>{" "}
          {result.integrationRule === "tributary-area"
            ? "too many points missing to fill from their counterparts: the mean uses the area around each point read (tributary areas) instead of the method's equal weights."
            : `${result.filledPoints} ${result.filledPoints === 1 ? "point" : "points"} filled from ${fills.join(", ")}; the method's own equal weights are kept.`}
        </p>
      )}
      {result.integrationRule === "tributary-area" && result.filledPoints === 0 && (
        <p className="text-sm">
          <strong>Gaps:</strong> the mean uses the area around each point read (tributary areas) instead of the method&apos;s equal weights.
        </p>
      )}
      {result.warnings.length > 0 && (
        <ul className="grid gap-1 text-sm">
          {result.warnings.map((w) => (
            <li key={w} className="font-semibold text-caution">
              ▲ {w}
            </li>
          ))}
        </ul>
      )}
      <p className="text-sm text-ink-soft">
        Air: {formatQuantity(units, "temperature", result.air.dryBulbC)}, {Math.round(result.air.relativeHumidityPct)} % RH, barometric {formatQuantity(units, "barometric", result.air.barometricPa)} (
        {result.air.barometricSource === "measured" ? "measured" : "from the site altitude"}), duct static {formatQuantity(units, "pressure", result.air.staticPa)}
        {result.air.staticAssumed ? " (not measured: assumed)" : ""}.
      </p>
    </div>
  );
}

function Figure({ label, value, testId }: { label: string; value: string; testId: string }) {
  return (
    <div>
      <dt className="text-sm text-ink-soft">{label}</dt>
      <dd className="num text-xl font-semibold" data-testid={testId}>
        {value}
      </dd>
    </div>
  );
}
