import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ductSize, pct } from "@/components/airflow/format";
import { Card, EmptyState } from "@/components/ui/card";
import { Verdict } from "@/components/ui/status";
import { getLatestReport } from "@/db/queries/reports";
import { can } from "@/lib/auth/policy";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { formatQuantity } from "@/lib/units";
import { loadAirflowScreen } from "@/lib/server/project-screen";

export const metadata: Metadata = { title: "Project overview" };

const KIND_LABEL = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" } as const;

export default async function ProjectOverviewPage({ params }: { params: Promise<{ projectId: string }> }) {
  // The overview shows design against measured: every member may read it (design.view), owners included.
  const screen = await loadAirflowScreen(params, "design.view");
  if (!screen.allowed) notFound();
  const { project, units, systems } = screen;
  const latestReport = await getLatestReport({ projectId: project.id });
  const setsUp = can(screen.user, screen.access.role, "design.edit");
  const setupLink = (text: string) => (
    <Link href={`/projects/${project.id}/setup`} className="font-semibold text-accent-strong underline underline-offset-4">
      {text}
    </Link>
  );

  const sections = systems.flatMap((s) => s.sections);
  const measured = sections.filter((s) => s.reduction?.ok);
  const approved = sections.filter((s) => s.latest?.status === "approved");
  const exceptions = [
    ...sections
      .filter((s) => s.withinTolerance === false)
      .map((s) => `${s.section.tag}: ${pct(s.pctOfDesign)} of design (allowed ${formatTolerance(toleranceFor(project, "section"))})`),
    ...sections
      .filter((s) => s.reduction?.ok && s.reduction.result.quality.verdict === "poor")
      .map((s) => `${s.section.tag}: traverse plane judged poor`),
    ...systems.flatMap((s) =>
      s.junctions.flatMap((j) => (j.status === "checked" && !j.junction.pass ? [`${j.parent.tag}: continuity ${pct(j.junction.imbalancePct, 1)} by mass`] : [])),
    ),
  ];

  return (
    <main className="mx-auto grid max-w-7xl items-start gap-gutter px-gutter py-6 lg:grid-cols-3">
      <div className="space-y-gutter lg:col-span-2">
        {systems.length === 0 && (
          <EmptyState>
            No air systems yet.{" "}
            {setsUp ? <>Add them, with their duct trees and terminals, in {setupLink("Set-up")}, by form or from a design schedule file.</> : "The project's engineer adds them from the design schedule."}
          </EmptyState>
        )}
        {systems.map(({ system, sections: rows }) => (
          <Card
            key={system.id}
            title={
              <span>
                {system.tag} <span className="font-normal text-ink-soft">· {system.name}</span>
              </span>
            }
            actions={<span className="text-sm text-ink-muted">{KIND_LABEL[system.kind]} · {system.location}</span>}
          >
            <p className="num mb-3">
              Design airflow <strong>{formatQuantity(units, "flow", system.designFlowM3S)}</strong>
              {system.fanSpeedRpm !== null && <> · fan {system.fanSpeedRpm.toLocaleString("en-US")} rpm</>}
              {system.designStaticPa !== null && <> · design static {formatIn(FORM_UNITS[units].pressure, system.designStaticPa, 3)}</>}
            </p>
            {rows.length === 0 ? (
              <EmptyState>
                No duct sections in {system.tag} yet. {setsUp ? <>Add its trunk and branches in {setupLink("Set-up")}.</> : "The project's engineer adds them."}
              </EmptyState>
            ) : (
            <table className="w-full text-left">
              <thead className="border-b-2 border-line text-sm text-ink-muted">
                <tr>
                  <th className="py-2 pr-3">Section</th>
                  <th className="py-2 pr-3">Size</th>
                  <th className="py-2 pr-3 text-right">Design</th>
                  <th className="py-2 pr-3 text-right">Measured (std)</th>
                  <th className="py-2">% of design</th>
                </tr>
              </thead>
              <tbody>
                {rows.map((row) => (
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
                      {row.withinTolerance === null ? (
                        <span className="text-ink-muted">—</span>
                      ) : (
                        <span className="flex items-center gap-2">
                          <span className="num">{pct(row.pctOfDesign)}</span>
                          <Verdict pass={row.withinTolerance} passLabel="in tolerance" failLabel="out of tolerance" />
                        </span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
            )}
          </Card>
        ))}
      </div>
      <div className="space-y-gutter">
        <Card title="Progress">
          <p className="num text-3xl font-bold">
            {approved.length} <span className="text-lg font-normal text-ink-soft">of {sections.length} sections approved</span>
          </p>
          <p className="num text-ink-soft">{measured.length} sections have a reduced traverse.</p>
        </Card>
        <Card title="Open exceptions">
          {exceptions.length === 0 ? (
            <p className="text-ink-soft">None among the readings so far.</p>
          ) : (
            <ul className="list-disc space-y-1 pl-5">
              {exceptions.map((e) => (
                <li key={e}>{e}</li>
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
