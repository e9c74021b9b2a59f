import { AcceptedDeviationsNote } from "@/components/engineer/accepted-deviations-note";
import { listDeviations } from "@/db/queries/deviations";
import type { Metadata } from "next";
import { ductSize, pct } from "@/components/airflow/format";
import { Card, EmptyState } from "@/components/ui/card";
import { NotAllowed } from "@/components/ui/not-allowed";
import { StatusBadge } from "@/components/ui/status";
import type { TraverseUncertainty } from "@/lib/airflow/traverse";
import { formatExpandedUncertainty } from "@/lib/airflow/uncertainty";
import { formatQuantity } from "@/lib/units";
import { loadAirflowScreen } from "@/lib/server/project-screen";

export const metadata: Metadata = { title: "Review" };

const QUALITY_LABEL = { good: "Good plane", marginal: "Marginal plane", poor: "Poor plane" } as const;

/** Expanded uncertainty of each flow, with its coverage; one line when the three agree (pitot readings). */
function UncertaintyFigures({ uncertainty }: { uncertainty: TraverseUncertainty }) {
  const figure = (u: number) => <span className="whitespace-nowrap">{formatExpandedUncertainty(u)}</span>;
  const { actual, standard, mass } = uncertainty;
  const same = formatExpandedUncertainty(actual.expanded) === formatExpandedUncertainty(standard.expanded) && formatExpandedUncertainty(mass.expanded) === formatExpandedUncertainty(standard.expanded);
  if (same) return <>{figure(standard.expanded)} on actual, standard and mass flow</>;
  return (
    <>
      {figure(standard.expanded)} on standard flow
      <span className="block text-sm text-ink-soft">
        actual flow {figure(actual.expanded)}; mass flow {figure(mass.expanded)}
      </span>
    </>
  );
}

export default async function ReviewPage({ params }: { params: Promise<{ projectId: string }> }) {
  const screen = await loadAirflowScreen(params, "traverse.review");
  if (!screen.allowed) return <NotAllowed what="reviewing readings" />;
  const { units, systems } = screen;
  const deviations = await listDeviations({ projectId: screen.project.id });
  const queue = systems.flatMap(({ system, sections }) =>
    sections.filter((s) => s.latest?.status === "submitted").map((s) => ({ system, ...s, latest: s.latest! })),
  );

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <h2>Awaiting your review ({queue.length})</h2>
      <AcceptedDeviationsNote deviations={deviations} />
      {queue.length === 0 && <EmptyState>Nothing is waiting: every submitted traverse has a decision.</EmptyState>}
      {queue.map((item) => (
        <Card
          key={item.latest.id}
          title={`${item.system.tag} / ${item.section.tag} · ${ductSize(item.section, units)}`}
          actions={<StatusBadge status={item.latest.status} />}
        >
          <p className="text-ink-soft">
            {item.section.location} · taken by {item.latest.takenByName ?? "—"} on {item.latest.takenAt?.toISOString().slice(0, 16).replace("T", " ") ?? "—"} UTC ·{" "}
            {item.latest.lines} × {item.latest.pointsPerLine} points, {item.latest.method === "log-linear" ? (item.section.shape === "round" ? "log-linear" : "log-Tchebycheff") : "equal-area"} · {item.latest.instrument}
          </p>
          {item.reduction?.ok ? (
            <div className="mt-3 grid gap-4 md:grid-cols-2">
              <dl className="num grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
                <dt className="text-ink-muted">Actual flow</dt>
                <dd className="font-semibold">{formatQuantity(units, "flow", item.reduction.result.flowM3S)}</dd>
                <dt className="text-ink-muted">Standard flow</dt>
                <dd className="font-semibold">
                  {formatQuantity(units, "flow", item.reduction.result.standardFlowM3S)} ({pct(item.pctOfDesign)} of design)
                </dd>
                <dt className="text-ink-muted">Mass flow</dt>
                <dd>{formatQuantity(units, "massFlow", item.reduction.result.massFlowKgS)}</dd>
                <dt className="text-ink-muted">Mean velocity</dt>
                <dd>{formatQuantity(units, "velocity", item.reduction.result.meanVelocityMS)}</dd>
                <dt className="text-ink-muted">Air density</dt>
                <dd>{formatQuantity(units, "density", item.reduction.result.densityKgM3)}</dd>
                <dt className="text-ink-muted">Uncertainty</dt>
                <dd>
                  <UncertaintyFigures uncertainty={item.reduction.result.uncertainty} />
                </dd>
              </dl>
              <div>
                <p className="font-semibold">{QUALITY_LABEL[item.reduction.result.quality.verdict]}</p>
                <ul className="list-disc pl-5 text-sm">
                  {[...item.reduction.result.quality.reasons, ...item.reduction.result.warnings].map((r) => (
                    <li key={r}>{r}</li>
                  ))}
                </ul>
              </div>
            </div>
          ) : (
            <p className="mt-3 font-semibold text-caution">{item.reduction?.ok === false ? item.reduction.message : "Not reduced."}</p>
          )}
        </Card>
      ))}
    </main>
  );
}
