import type { Metadata } from "next";
import Link from "next/link";
import { ProjectSettings } from "@/components/setup/project-settings";
import { AddSystem } from "@/components/setup/system-forms";
import { buttonClasses } from "@/components/ui/button";
import { Card, EmptyState } from "@/components/ui/card";
import { NotAllowed } from "@/components/ui/not-allowed";
import { getProjectDesign } from "@/db/queries/airflow";
import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import { requireProjectPage } from "@/lib/auth/guards";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { unitSystemFor } from "@/lib/units";

export const metadata: Metadata = { title: "Set-up" };

const KIND_LABEL = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" } as const;

export default async function SetupPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const page = await requireProjectPage(projectId, "design.edit");
  if (!page.allowed) return <NotAllowed what="setting the project up" />;
  const { project } = page.access;
  const units = unitSystemFor(page.user, project);
  const u = FORM_UNITS[units];
  const design = await getProjectDesign({ projectId: project.id });
  const bands = [
    ["Fans", toleranceFor(project, "fan")],
    ["Duct sections", toleranceFor(project, "section")],
    ["Outlets and inlets", toleranceFor(project, "outlet")],
    ["Terminal units", toleranceFor(project, "terminalUnit")],
    ["Outside air", toleranceFor(project, "outsideAir")],
  ] as const;

  return (
    <main className="mx-auto grid max-w-7xl items-start gap-gutter px-gutter py-6 lg:grid-cols-3">
      <div className="space-y-gutter lg:col-span-2">
        <Card title="Air systems" actions={<AddSystem projectId={project.id} units={units} emphasise={design.systems.length === 0} />}>
          {design.systems.length === 0 ? (
            <EmptyState>
              No air systems yet. Add the first fan or air handler with its design airflow, then its duct tree; or add the systems here and import their sections and
              terminals from a design schedule.
            </EmptyState>
          ) : (
            <ul className="divide-y divide-line">
              {design.systems.map((s) => {
                const sections = design.sections.filter((x) => x.systemId === s.id);
                const ids = new Set(sections.map((x) => x.id));
                const terminals = design.terminals.filter((t) => ids.has(t.sectionId));
                return (
                  <li key={s.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
                    <div>
                      <p className="text-lg font-semibold">
                        {s.tag} <span className="font-normal text-ink-soft">· {s.name}</span>
                      </p>
                      <p className="num text-sm text-ink-soft">
                        {KIND_LABEL[s.kind]} · design {formatIn(u.flow, s.designFlowM3S, 4)}
                        {s.designStaticPa !== null && ` at ${formatIn(u.pressure, s.designStaticPa, 3)}`} · {sections.length} duct section
                        {sections.length === 1 ? "" : "s"} · {terminals.length} terminal{terminals.length === 1 ? "" : "s"}
                      </p>
                      {sections.length === 0 && <p className="text-sm font-semibold text-caution">No duct tree yet: open the system to add its trunk.</p>}
                    </div>
                    <Link href={`/projects/${project.id}/setup/systems/${s.id}`} className={buttonClasses("secondary")} aria-label={`Open the duct tree of ${s.tag}`}>
                      Duct tree
                    </Link>
                  </li>
                );
              })}
            </ul>
          )}
        </Card>
        <Card title="Design schedule file">
          <p className="mb-3 text-ink-soft">
            Sections and terminals of every system in one CSV, with the unit in each column header (cfm and inches or L/s and millimetres). Export it, edit it in a
            spreadsheet and import it back; nothing is deleted by an import.
          </p>
          <div className="flex flex-wrap gap-3">
            <Link href={`/projects/${project.id}/setup/import`} className={buttonClasses("primary")}>
              Import a schedule
            </Link>
            <a href={`/api/v1/projects/${project.id}/design/export.csv?units=IP`} className={buttonClasses("secondary")} download>
              Export (cfm, in.)
            </a>
            <a href={`/api/v1/projects/${project.id}/design/export.csv?units=SI`} className={buttonClasses("secondary")} download>
              Export (L/s, mm)
            </a>
          </div>
        </Card>
      </div>
      <Card title="Project settings">
        <ProjectSettings project={project} units={units}>
          <dl className="num grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
            <dt className="text-ink-muted">Site</dt>
            <dd>{project.siteName}</dd>
            <dt className="text-ink-muted">Address</dt>
            <dd>{project.address || "—"}</dd>
            <dt className="text-ink-muted">Altitude</dt>
            <dd>{formatIn(u.altitude, project.altitudeM, 4)}</dd>
            <dt className="text-ink-muted">Units</dt>
            <dd>{project.unitSystem === "IP" ? "Inch-pound" : "SI"}</dd>
            <dt className="text-ink-muted">Standard air</dt>
            <dd>{formatIn(u.density, project.standardDensityKgM3, 4)}</dd>
            {bands.map(([label, band]) => (
              <div key={label} className="contents">
                <dt className="text-ink-muted">{label}</dt>
                <dd>{formatTolerance(band)} of design</dd>
              </div>
            ))}
            <dt className="text-ink-muted">Continuity</dt>
            <dd>±{project.continuityTolerancePct} % by mass</dd>
          </dl>
        </ProjectSettings>
      </Card>
    </main>
  );
}
