import { AcceptedDeviationsNote } from "@/components/engineer/accepted-deviations-note";
import { listDeviations } from "@/db/queries/deviations";
import type { Metadata } from "next";
import Link from "next/link";
import { ductSize, pct } from "@/components/airflow/format";
import { ConditionsPicker } from "@/components/conditions/conditions-picker";
import { CalibrationStatus } from "@/components/instruments/calibration-status";
import { FieldKit } from "@/components/instruments/field-kit";
import { SyncStatusBanner } from "@/components/offline/sync-status-banner";
import { buttonClasses } from "@/components/ui/button";
import { Card, EmptyState } from "@/components/ui/card";
import { Cautions } from "@/components/ui/caution";
import { NotAllowed } from "@/components/ui/not-allowed";
import { StatusBadge } from "@/components/ui/status";
import { SectionPhotos } from "@/components/uploads/section-photos";
import { listConditionsForSystem } from "@/db/queries/conditions";
import { countTerminalsBySystem } from "@/db/queries/field";
import { listInstrumentsUsedInProject } from "@/db/queries/instruments";
import type { Conditions } from "@/lib/api-client/field";
import { recommendLayout } from "@/lib/airflow/layout";
import { can } from "@/lib/auth/policy";
import { instrumentName } from "@/lib/instruments/kinds";
import { formatCalendarDate, instrumentUsability } from "@/lib/instruments/usability";
import { ductOf } from "@/lib/server/airflow-view";
import { conditionsJson } from "@/lib/server/field-json";
import { loadAirflowScreen } from "@/lib/server/project-screen";
import { formatQuantity } from "@/lib/units";
import { fieldRoutes } from "@/lib/field-routes";

export const metadata: Metadata = { title: "Field work" };

const KIND_LABEL = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" } as const;

export default async function FieldWorkPage({ params }: { params: Promise<{ projectId: string }> }) {
  const screen = await loadAirflowScreen(params, "traverse.record");
  if (!screen.allowed) return <NotAllowed what="taking readings" />;
  const { units, systems, project } = screen;
  const canAddPhotos = can(screen.user, screen.access.role, "photo.add");

  const [terminalCounts, instrumentsInUse, conditionLists, deviations] = await Promise.all([
    countTerminalsBySystem({ projectId: project.id }),
    listInstrumentsUsedInProject({ projectId: project.id }),
    Promise.all(systems.map(async ({ system }) => [system.id, JSON.parse(JSON.stringify((await listConditionsForSystem({ systemId: system.id, limit: 10 })).map(conditionsJson))) as Conditions[]] as const)),
    listDeviations({ projectId: project.id }),
  ]);
  const conditionsBySystem = new Map(conditionLists);
  const today = new Date();

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <SyncStatusBanner />
      <Cautions layout="tiles" />
      <AcceptedDeviationsNote deviations={deviations.filter((d) => d.subject === "section" || d.subject === "junction")} />
      {systems.length === 0 && <EmptyState>No air systems in this project yet: the project&apos;s engineer sets them up in Set-up before field work can start.</EmptyState>}

      {systems.map(({ system, sections }) => {
        const counts = terminalCounts.get(system.id) ?? { outlets: 0, terminalUnits: 0 };
        return (
          <Card
            key={system.id}
            title={
              <span>
                {system.tag} <span className="font-normal text-ink-soft">· {system.name}</span>
              </span>
            }
            actions={
              <span className="num text-sm text-ink-soft">
                {KIND_LABEL[system.kind]} · {system.location} · design {formatQuantity(units, "flow", system.designFlowM3S)}
                {system.fanSpeedRpm !== null && ` · fan ${system.fanSpeedRpm} rpm`}
              </span>
            }
          >
            <div className="grid gap-gutter xl:grid-cols-[3fr_2fr]">
              <div className="grid content-start gap-4">
                <h3 className="text-lg font-semibold">Duct sections</h3>
                {sections.length === 0 ? (
                  <EmptyState>No duct sections in {system.tag} yet: the project&apos;s engineer adds them in Set-up before traverses can start.</EmptyState>
                ) : (
                  <ul className="divide-y divide-line rounded-card border border-line">
                    {sections.map((row) => {
                      const duct = ductOf(row.section);
                      const suggestion = recommendLayout({
                        duct,
                        method: "log-linear",
                        straightUpstreamM: row.section.straightUpstreamMm === null ? undefined : row.section.straightUpstreamMm / 1000,
                        straightDownstreamM: row.section.straightDownstreamMm === null ? undefined : row.section.straightDownstreamMm / 1000,
                      });
                      const latest = row.latest;
                      const editable = latest && (latest.status === "draft" || latest.status === "returned");
                      return (
                        <li key={row.section.id} className="grid gap-3 p-3 lg:grid-cols-[1fr_auto] lg:items-center" style={{ paddingLeft: `${0.75 + row.depth * 1}rem` }}>
                          <div>
                            <p className="text-lg font-semibold">
                              {row.section.tag} <span className="font-normal text-ink-soft">· {ductSize(row.section, units)} · {row.section.location}</span>
                            </p>
                            <p className="num text-sm text-ink-soft">
                              Design {formatQuantity(units, "flow", row.section.designFlowM3S)} · suggested layout{" "}
                              {duct.shape === "round" ? `${suggestion.lines} diameters × ${suggestion.pointsPerLine} points` : `${suggestion.lines} lines × ${suggestion.pointsPerLine} points`} (
                              {duct.shape === "round" ? "log-linear" : "log-Tchebycheff"})
                            </p>
                            {suggestion.warnings.map((w) => (
                              <p key={w} className="text-sm font-semibold text-caution">
                                {w}
                              </p>
                            ))}
                            <div className="mt-1 flex flex-wrap items-center gap-3">
                              {latest ? <StatusBadge status={latest.status} /> : <span className="text-ink-muted">No traverse yet</span>}
                              {latest && latest.revision > 1 && <span className="text-sm text-ink-soft">revision {latest.revision}</span>}
                              {row.reduction?.ok && (
                                <span className="num font-semibold">
                                  {formatQuantity(units, "flow", row.reduction.result.standardFlowM3S)} · {pct(row.pctOfDesign)} of design
                                </span>
                              )}
                              {row.reduction && !row.reduction.ok && <span className="text-sm text-caution">{row.reduction.message}</span>}
                            </div>
                          </div>
                          <div className="flex flex-wrap gap-2 lg:justify-end">
                            {latest && (
                              <Link prefetch={false} href={fieldRoutes.traverse(project.id, latest.id)} className={buttonClasses(editable ? "primary" : "secondary")}>
                                {editable ? "Continue" : "Open"}
                                <span className="sr-only"> the traverse of {row.section.tag}</span>
                              </Link>
                            )}
                            {!editable && (
                              <Link prefetch={false} href={fieldRoutes.newTraverse(project.id, row.section.id)} className={buttonClasses(latest ? "secondary" : "primary")}>
                                {latest ? "Re-traverse" : "Start traverse"}
                                <span className="sr-only"> of {row.section.tag}</span>
                              </Link>
                            )}
                          </div>
                          <div className="lg:col-span-2">
                            <SectionPhotos
                              projectId={project.id}
                              sectionId={row.section.id}
                              sectionTag={row.section.tag}
                              currentUserId={screen.user.id}
                              canAdd={canAddPhotos}
                              locked={latest?.status === "approved"}
                            />
                          </div>
                        </li>
                      );
                    })}
                  </ul>
                )}
              </div>

              <div className="grid content-start gap-gutter">
                <div className="rounded-card border border-line p-3">
                  <ConditionsPicker
                    projectId={project.id}
                    system={{ id: system.id, tag: system.tag, name: system.name, fanSpeedRpm: system.fanSpeedRpm, hasVfd: system.hasVfd, kind: system.kind }}
                    units={units}
                    canRecord
                    initial={conditionsBySystem.get(system.id)}
                  />
                </div>
                <div className="rounded-card border border-line p-3">
                  <h3 className="text-lg font-semibold">Terminals</h3>
                  {counts.outlets + counts.terminalUnits === 0 ? (
                    <p className="text-ink-soft">No outlets or terminal units scheduled on {system.tag} yet.</p>
                  ) : (
                    <p>
                      {counts.outlets > 0 && `${counts.outlets} ${counts.outlets === 1 ? "outlet or inlet" : "outlets and inlets"}`}
                      {counts.outlets > 0 && counts.terminalUnits > 0 && " · "}
                      {counts.terminalUnits > 0 && `${counts.terminalUnits} terminal ${counts.terminalUnits === 1 ? "unit" : "units"}`}
                    </p>
                  )}
                  <Link prefetch={false} href={fieldRoutes.terminals(project.id)} className={buttonClasses("secondary", "mt-2")}>
                    Terminal readings<span className="sr-only"> of {system.tag}</span>
                  </Link>
                </div>
              </div>
            </div>
          </Card>
        );
      })}

      <Card title="Instruments in use" actions={<Link href="/instruments" className={buttonClasses("secondary")}>Instrument register</Link>}>
        {instrumentsInUse.length === 0 ? (
          <EmptyState>No readings in this project name an instrument yet. Pick instruments from the register when you start a traverse or read a terminal.</EmptyState>
        ) : (
          <ul className="grid gap-3 md:grid-cols-2">
            {instrumentsInUse.map(({ instrument, lastUsedAt, uses }) => (
              <li key={instrument.id} className="rounded-card border border-line p-3">
                <Link href={fieldRoutes.instrument(instrument.id)} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
                  {instrumentName(instrument)}
                </Link>
                <div className="mt-1">
                  <CalibrationStatus usability={instrumentUsability(instrument, today)} />
                </div>
                <p className="text-sm text-ink-soft">
                  {uses} {uses === 1 ? "reading set" : "reading sets"} in this project{lastUsedAt ? `, last on ${formatCalendarDate(lastUsedAt.toISOString().slice(0, 10))}` : ""}
                </p>
              </li>
            ))}
          </ul>
        )}
        <div className="mt-gutter border-t border-line pt-gutter">
          <FieldKit projectId={project.id} />
        </div>
      </Card>
    </main>
  );
}
