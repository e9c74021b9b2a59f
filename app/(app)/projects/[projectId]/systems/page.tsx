import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import type { Metadata } from "next";
import { BalancingAids } from "@/components/airflow/balancing-aids";
import { ductSize, pct } from "@/components/airflow/format";
import { Card, EmptyState } from "@/components/ui/card";
import { NotAllowed } from "@/components/ui/not-allowed";
import { StatusBadge, Verdict } from "@/components/ui/status";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { displayUnit, formatQuantity } from "@/lib/units";
import { loadAirflowScreen } from "@/lib/server/project-screen";

export const metadata: Metadata = { title: "Design vs measured" };

export default async function DesignVsMeasuredPage({ params }: { params: Promise<{ projectId: string }> }) {
  const screen = await loadAirflowScreen(params, "design.edit");
  if (!screen.allowed) return <NotAllowed what="the design comparison" />;
  const { project, units, systems } = screen;
  const flow = (v: number) => formatQuantity(units, "flow", v, { withUnit: false });
  const flowUnit = displayUnit(units, "flow").symbol;
  const mass = (v: number) => formatQuantity(units, "massFlow", v, { withUnit: false });
  const massUnit = displayUnit(units, "massFlow").symbol;

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <p className="text-ink-soft">
        Design airflow is compared with measured flow at standard air ({formatIn(FORM_UNITS[units].density, project.standardDensityKgM3, 4)}). Continuity is checked by mass at every
        junction: volumes add only where the air has the same density. Tolerances: sections {formatTolerance(toleranceFor(project, "section"))}, junctions ±
        {project.continuityTolerancePct} %.
      </p>
      {systems.length === 0 && <EmptyState>No air systems yet: add them in Set-up, by form or from a design schedule file.</EmptyState>}
      {systems.map(({ system, sections, junctions, branchPlans, fan }) => (
        <Card key={system.id} title={`${system.tag} · ${system.name}`}>
          {sections.length === 0 && <EmptyState>No duct sections in {system.tag} yet: add its trunk and branches in Set-up.</EmptyState>}
          <div className={`overflow-x-auto ${sections.length === 0 ? "hidden" : ""}`}>
            <table className="w-full min-w-[46rem] text-left">
              <caption className="sr-only">Sections of {system.tag}, design against measured</caption>
              <thead className="border-b-2 border-line text-sm text-ink-muted">
                <tr>
                  <th className="py-2 pr-3">Section</th>
                  <th className="py-2 pr-3">Size</th>
                  <th className="py-2 pr-3 text-right">Design ({flowUnit})</th>
                  <th className="py-2 pr-3 text-right">Actual ({flowUnit})</th>
                  <th className="py-2 pr-3 text-right">Standard ({flowUnit})</th>
                  <th className="py-2 pr-3 text-right">Mass ({massUnit})</th>
                  <th className="py-2 pr-3">% of design</th>
                  <th className="py-2">Traverse</th>
                </tr>
              </thead>
              <tbody>
                {sections.map((row) => {
                  const r = row.reduction?.ok ? row.reduction.result : null;
                  return (
                    <tr key={row.section.id} className="border-b border-line">
                      <td className="py-2 pr-3 font-semibold" style={{ paddingLeft: `${row.depth * 1.25}rem` }}>
                        {row.section.tag}
                      </td>
                      <td className="py-2 pr-3">{ductSize(row.section, units)}</td>
                      <td className="py-2 pr-3 text-right">{flow(row.section.designFlowM3S)}</td>
                      <td className="py-2 pr-3 text-right">{r ? flow(r.flowM3S) : "—"}</td>
                      <td className="py-2 pr-3 text-right">{r ? flow(r.standardFlowM3S) : "—"}</td>
                      <td className="py-2 pr-3 text-right">{r ? mass(r.massFlowKgS) : "—"}</td>
                      <td className="py-2 pr-3">
                        {row.withinTolerance === null ? (
                          "—"
                        ) : (
                          <span className="flex items-center gap-2">
                            <span className="num">{pct(row.pctOfDesign, 1)}</span>
                            <Verdict pass={row.withinTolerance} passLabel="in" failLabel="out" />
                          </span>
                        )}
                      </td>
                      <td className="py-2">{row.latest ? <StatusBadge status={row.latest.status} /> : <span className="text-ink-muted">none</span>}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          <h3 className="mt-5 mb-2 text-lg font-semibold">Continuity at junctions</h3>
          {junctions.length === 0 && (
            <EmptyState>No junction to check yet: a junction appears where a section has branches. Add branches below the trunk in Set-up.</EmptyState>
          )}
          <ul className="space-y-2">
            {junctions.map((j) => (
              <li key={j.parent.id} className="rounded-card border border-line p-3">
                <p className="font-semibold">
                  {j.parent.tag} → {j.children.map((c) => c.tag).join(" + ")}
                </p>
                {j.status === "waiting" ? (
                  <p className="text-ink-soft">Waiting for reduced traverses on {j.missing.join(", ")}.</p>
                ) : (
                  <>
                    <p className="num">
                      Trunk {mass(j.junction.parentMassFlowKgS)} {massUnit} · branches {mass(j.junction.childrenMassFlowKgS)} {massUnit} · imbalance{" "}
                      {mass(j.junction.imbalanceKgS)} {massUnit} ({pct(j.junction.imbalancePct, 1)}, {formatQuantity(units, "flow", j.junction.imbalanceStandardM3S)} standard){" "}
                      <Verdict pass={j.junction.pass} />
                    </p>
                    <p className="text-sm text-ink-soft">{j.junction.note}</p>
                  </>
                )}
              </li>
            ))}
          </ul>
          <h3 className="mt-5 mb-2 text-lg font-semibold">Balancing aids</h3>
          <BalancingAids plans={branchPlans} fan={fan} units={units} />
        </Card>
      ))}
    </main>
  );
}
