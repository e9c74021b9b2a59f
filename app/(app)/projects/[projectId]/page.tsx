import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ductSize, pct } from "@/components/airflow/format";
import { badgeStatusOf, ResultBadge } from "@/components/engineer/result-badge";
import { Card, EmptyState } from "@/components/ui/card";
import { LocalTime } from "@/components/ui/local-time";
import { StatusBadge } from "@/components/ui/status";
import { listTraverseApprovals } from "@/db/queries/airflow";
import { getLatestReport } from "@/db/queries/reports";
import { requireProjectPage } from "@/lib/auth/guards";
import { can } from "@/lib/auth/policy";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { allResults, loadSystemDetails, progressOf, resultKey } from "@/lib/server/system-view";
import { formatQuantity, unitSystemFor } from "@/lib/units";

export const metadata: Metadata = { title: "Project overview" };

const KIND_LABEL = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" } as const;

/** A share in words and as a bar with its numbers printed (never colour alone). */
function Share({ label, done, total }: { label: string; done: number; total: number }) {
  const share = total > 0 ? Math.round((100 * done) / total) : 0;
  return (
    <div>
      <p className="flex justify-between gap-2">
        <span>{label}</span>
        <span className="num font-semibold whitespace-nowrap">
          {done} of {total} ({share} %)
        </span>
      </p>
      <div className="mt-1 h-3 w-full rounded-full border border-line-strong bg-paper" role="presentation">
        <div className="h-full rounded-full bg-accent" style={{ width: `${share}%` }} />
      </div>
    </div>
  );
}

/**
 * The project overview: every member's first page and the owner's dashboard. Read-only for everyone:
 * systems with design against measured, % complete by the newest traverse per section and the newest
 * reading per terminal setpoint, approvals, open exceptions, accepted deviations and the latest report.
 */
export default async function ProjectOverviewPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, access, allowed } = await requireProjectPage(projectId, "design.view");
  if (!allowed) notFound();
  const { project } = access;
  const units = unitSystemFor(user, project);
  const [details, latestReport] = await Promise.all([loadSystemDetails(project), getLatestReport({ projectId: project.id })]);
  const setsUp = can(user, access.role, "design.edit");
  const progress = progressOf(details);
  const results = allResults(details);
  const byKey = new Map(results.map((r) => [r.key, r]));
  const sections = details.flatMap((d) => d.sections.map((s) => ({ ...s, systemTag: d.system.tag })));
  const approvedSections = sections.filter((s) => s.latest?.status === "approved");
  const approvals = await listTraverseApprovals({ traverseIds: approvedSections.map((s) => s.latest!.id) });
  const approvedSets = details.flatMap((d) => {
    const ids = new Set(d.terminals.flatMap((t) => t.setpoints.flatMap((sp) => (sp.reading && sp.setStatus === "approved" ? [sp.reading.setId] : []))));
    return ids.size > 0 ? [{ system: d.system.tag, readings: d.terminals.flatMap((t) => t.setpoints).filter((sp) => sp.reading && sp.setStatus === "approved").length }] : [];
  });

  const openExceptions = [
    ...results.filter((r) => r.status === "outside" && !r.deviation).map((r) => ({ key: r.key, text: `${r.label}: ${r.value!.toFixed(1)} ${r.unit} (band ${r.tolerance})` })),
    ...sections
      .filter((s) => s.reduction?.ok && s.reduction.result.quality.verdict === "poor")
      .map((s) => ({ key: `plane:${s.section.id}`, text: `${s.section.tag}: traverse plane judged poor` })),
  ];
  const accepted = results.filter((r) => r.deviation);
  const setupLink = (text: string) => (
    <Link href={`/projects/${project.id}/setup`} className="font-semibold text-accent-strong underline underline-offset-4">
      {text}
    </Link>
  );

  return (
    <main className="mx-auto grid max-w-7xl items-start gap-gutter px-gutter py-6 lg:grid-cols-3">
      <div className="min-w-0 space-y-gutter lg:col-span-2">
        {details.length === 0 && (
          <EmptyState>
            No air systems yet.{" "}
            {setsUp ? <>Add them, with their duct trees and terminals, in {setupLink("Set-up")}, by form or from a design schedule file.</> : "The project's engineer of record adds them from the design schedule."}
          </EmptyState>
        )}
        {details.map((d) => {
          const { system, sections: rows } = d;
          const fan = byKey.get(resultKey("system", system.id, "fan"));
          const un = d.unaccounted;
          return (
            <Card
              key={system.id}
              className="min-w-0"
              title={
                <span>
                  {system.tag} <span className="font-normal text-ink-soft">· {system.name}</span>
                </span>
              }
              actions={<span className="text-sm text-ink-muted">{KIND_LABEL[system.kind]} · {system.location}</span>}
            >
              <p className="num mb-1">
                Design airflow <strong>{formatQuantity(units, "flow", system.designFlowM3S)}</strong>
                {system.fanSpeedRpm !== null && <> · fan {system.fanSpeedRpm.toLocaleString("en-US")} rpm</>}
                {system.designStaticPa !== null && <> · design static {formatIn(FORM_UNITS[units].pressure, system.designStaticPa, 3)}</>}
              </p>
              <p className="mb-3 flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
                {fan && (
                  <span className="inline-flex items-center gap-2">
                    Fan: {fan.value === null ? "not measured" : `${fan.value.toFixed(1)} % of design`} <ResultBadge status={badgeStatusOf(fan.status, fan.deviation !== null)} />
                  </span>
                )}
                <span>
                  Fan against outlets:{" "}
                  {un.status === "complete"
                    ? `${formatQuantity(units, "flow", un.unaccountedStandardM3S)} unaccounted ± ${formatQuantity(units, "flow", un.expandedUncertaintyM3S)} (k = 2)`
                    : un.status === "incomplete"
                      ? `not compared yet (${un.outletsRead} of ${un.outletsTotal} outlets read${un.missingTraverses.length > 0 ? `, no traverse of ${un.missingTraverses.map((m) => m.tag).join(", ")}` : ""})`
                      : "not applicable"}
                </span>
              </p>
              {rows.length === 0 ? (
                <EmptyState>
                  No duct sections in {system.tag} yet. {setsUp ? <>Add its trunk and branches in {setupLink("Set-up")}.</> : "The project's engineer of record adds them."}
                </EmptyState>
              ) : (
                <div className="overflow-x-auto">
                  <table className="w-full min-w-[36rem] text-left">
                    <caption className="sr-only">{system.tag}: sections, design against measured</caption>
                    <thead className="border-b-2 border-line text-sm text-ink-muted">
                      <tr>
                        <th scope="col" className="py-2 pr-3">Section</th>
                        <th scope="col" className="py-2 pr-3">Size</th>
                        <th scope="col" className="py-2 pr-3 text-right">Design</th>
                        <th scope="col" className="py-2 pr-3 text-right">Measured (std)</th>
                        <th scope="col" className="py-2">% of design</th>
                      </tr>
                    </thead>
                    <tbody>
                      {rows.map((row) => {
                        const r = byKey.get(resultKey("section", row.section.id, "design"));
                        return (
                          <tr key={row.section.id} className="border-b border-line">
                            <td className="py-2 pr-3" style={{ paddingLeft: `${row.depth * 1.25}rem` }}>
                              <span className="font-semibold">{row.section.tag}</span>{" "}
                              <span className="text-sm text-ink-muted">{row.section.kind === "trunk" ? "trunk" : "branch"}</span>
                            </td>
                            <td className="py-2 pr-3">{ductSize(row.section, units)}</td>
                            <td className="py-2 pr-3 text-right">{formatQuantity(units, "flow", row.section.designFlowM3S)}</td>
                            <td className="py-2 pr-3 text-right">
                              {row.reduction?.ok ? formatQuantity(units, "flow", row.reduction.result.standardFlowM3S) : <span className="text-ink-muted">not yet</span>}
                            </td>
                            <td className="py-2">
                              {row.withinTolerance === null || !r ? (
                                <span className="text-ink-muted">—</span>
                              ) : (
                                <span className="flex flex-wrap items-center gap-2">
                                  <span className="num">{pct(row.pctOfDesign)}</span>
                                  <ResultBadge status={badgeStatusOf(r.status, r.deviation !== null)} />
                                </span>
                              )}
                            </td>
                          </tr>
                        );
                      })}
                    </tbody>
                  </table>
                </div>
              )}
            </Card>
          );
        })}
      </div>
      <div className="space-y-gutter">
        <Card title="Progress">
          <div className="space-y-3">
            <Share label="Sections traversed" done={progress.sections.traversed} total={progress.sections.total} />
            <Share label="Sections approved" done={progress.sections.approved} total={progress.sections.total} />
            <Share label="Terminal readings taken" done={progress.terminalSetpoints.read} total={progress.terminalSetpoints.total} />
            <Share label="Terminal readings approved" done={progress.terminalSetpoints.approved} total={progress.terminalSetpoints.total} />
          </div>
          <p className="mt-2 text-sm text-ink-soft">
            Counted by each section&apos;s newest traverse (a re-traverse counts as not approved until it is) and each terminal&apos;s newest reading at every setpoint.
          </p>
        </Card>
        <Card title="Approvals">
          {approvedSections.length === 0 && approvedSets.length === 0 ? (
            <p className="text-ink-soft">Nothing approved yet.</p>
          ) : (
            <ul className="space-y-2">
              {approvedSections.map((s) => {
                const a = approvals.get(s.latest!.id);
                return (
                  <li key={s.section.id} className="flex flex-wrap items-center gap-2">
                    <StatusBadge status="approved" />
                    <span>
                      {s.systemTag} {s.section.tag}, traverse rev. {s.latest!.revision}
                      {a && (
                        <span className="text-sm text-ink-soft">
                          {" "}
                          by {a.reviewerName ?? "a former member"}, <LocalTime iso={a.at.toISOString()} />
                        </span>
                      )}
                    </span>
                  </li>
                );
              })}
              {approvedSets.map((s) => (
                <li key={s.system} className="flex flex-wrap items-center gap-2">
                  <StatusBadge status="approved" />
                  <span>
                    {s.system} terminal readings ({s.readings})
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Card>
        <Card title="Open exceptions">
          {openExceptions.length === 0 ? (
            <p className="text-ink-soft">None among the readings so far.</p>
          ) : (
            <ul className="space-y-1">
              {openExceptions.map((e) => (
                <li key={e.key} className="flex items-start gap-2">
                  <ResultBadge status="outside" label="" />
                  <span>{e.text}</span>
                </li>
              ))}
            </ul>
          )}
        </Card>
        <Card title="Accepted deviations">
          {accepted.length === 0 ? (
            <p className="text-ink-soft">The engineer of record has accepted no deviation.</p>
          ) : (
            <ul className="space-y-3">
              {accepted.map((r) => (
                <li key={r.key}>
                  <p className="flex flex-wrap items-center gap-2">
                    <ResultBadge status="accepted" label="" />
                    <strong>{r.label}</strong>
                  </p>
                  <p className="text-sm">
                    Accepted at <span className="num">{r.deviation!.acceptedValue.toFixed(1)}</span> {r.deviation!.valueUnit} (band {r.deviation!.tolerance}) by {r.deviation!.acceptedByName},{" "}
                    <LocalTime iso={r.deviation!.acceptedAt.toISOString()} />: “{r.deviation!.reason}”
                  </p>
                </li>
              ))}
            </ul>
          )}
        </Card>
        <Card title="Latest report">
          {latestReport ? (
            <p>
              Revision {latestReport.revision}, issued <span className="num">{latestReport.issuedAt.toISOString().slice(0, 10)}</span>.{" "}
              <a className="font-semibold text-accent-strong underline" href={`/api/v1/projects/${project.id}/reports/${latestReport.id}/pdf`}>
                Download the PDF
              </a>
            </p>
          ) : (
            <p className="text-ink-soft">No closeout report has been issued for this project yet.</p>
          )}
        </Card>
      </div>
    </main>
  );
}
