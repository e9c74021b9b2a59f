import type { Metadata } from "next";
import { ductSize, pct } from "@/components/airflow/format";
import { Card } from "@/components/ui/card";
import { Cautions } from "@/components/ui/caution";
import { NotAllowed } from "@/components/ui/not-allowed";
import { StatusBadge } from "@/components/ui/status";
import { SectionPhotos } from "@/components/uploads/section-photos";
import { can } from "@/lib/auth/policy";
import { recommendLayout } from "@/lib/airflow/layout";
import { ductOf } from "@/lib/server/airflow-view";
import { formatQuantity } from "@/lib/units";
import { loadAirflowScreen } from "@/lib/server/project-screen";

export const metadata: Metadata = { title: "Field work" };

export default async function FieldWorkPage({ params }: { params: Promise<{ projectId: string }> }) {
  const screen = await loadAirflowScreen(params, "traverse.record");
  if (!screen.allowed) return <NotAllowed what="taking readings" />;
  const { units, systems } = screen;
  const canAddPhotos = can(screen.user, screen.access.role, "photo.add");

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <Cautions />
      {systems.map(({ system, sections }) => (
        <Card key={system.id} title={`${system.tag} · ${system.name}`}>
          <ul className="divide-y divide-line">
            {sections.map((row) => {
              const duct = ductOf(row.section);
              const suggestion = recommendLayout({
                duct,
                method: "log-linear",
                straightUpstreamM: row.section.straightUpstreamMm === null ? undefined : row.section.straightUpstreamMm / 1000,
                straightDownstreamM: row.section.straightDownstreamMm === null ? undefined : row.section.straightDownstreamMm / 1000,
              });
              return (
                <li key={row.section.id} className="grid gap-2 py-3 md:grid-cols-[1fr_auto] md:items-center">
                  <div>
                    <p className="text-lg font-semibold">
                      {row.section.tag} <span className="font-normal text-ink-soft">· {ductSize(row.section, units)} · {row.section.location}</span>
                    </p>
                    <p className="num text-sm text-ink-soft">
                      Design {formatQuantity(units, "flow", row.section.designFlowM3S)} · suggested layout{" "}
                      {duct.shape === "round"
                        ? `${suggestion.lines} diameters × ${suggestion.pointsPerLine} points`
                        : `${suggestion.lines} lines × ${suggestion.pointsPerLine} points`}{" "}
                      ({duct.shape === "round" ? "log-linear" : "log-Tchebycheff"})
                    </p>
                    {suggestion.warnings.map((w) => (
                      <p key={w} className="text-sm font-semibold text-caution">
                        {w}
                      </p>
                    ))}
                  </div>
                  <div className="flex flex-wrap items-center gap-3 md:justify-end">
                    {row.latest ? <StatusBadge status={row.latest.status} /> : <span className="text-ink-muted">No traverse yet</span>}
                    {row.reduction?.ok && (
                      <span className="num font-semibold">
                        {formatQuantity(units, "flow", row.reduction.result.standardFlowM3S)} · {pct(row.pctOfDesign)}
                      </span>
                    )}
                    {row.reduction && !row.reduction.ok && <span className="text-sm text-caution">{row.reduction.message}</span>}
                  </div>
                  <div className="md:col-span-2">
                    <SectionPhotos
                      projectId={screen.project.id}
                      sectionId={row.section.id}
                      sectionTag={row.section.tag}
                      currentUserId={screen.user.id}
                      canAdd={canAddPhotos}
                      locked={row.latest?.status === "approved"}
                    />
                  </div>
                </li>
              );
            })}
          </ul>
        </Card>
      ))}
    </main>
  );
}
