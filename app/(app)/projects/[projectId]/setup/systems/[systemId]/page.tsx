import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { DuctTreeEditor } from "@/components/setup/duct-tree-editor";
import { SystemActions } from "@/components/setup/system-forms";
import { Card } from "@/components/ui/card";
import { NotAllowed } from "@/components/ui/not-allowed";
import { countFieldDataByItem, getSystemInProject, listSectionsOfSystem, listTerminalsOfSystem } from "@/db/queries/design";
import { requireProjectPage } from "@/lib/auth/guards";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { terminalResource } from "@/lib/design/resources";
import { unitSystemFor } from "@/lib/units";

export const metadata: Metadata = { title: "Duct tree" };

const KIND_LABEL = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" } as const;

export default async function SystemSetupPage({ params }: { params: Promise<{ projectId: string; systemId: string }> }) {
  const { projectId, systemId } = await params;
  const page = await requireProjectPage(projectId, "design.edit");
  if (!page.allowed) return <NotAllowed what="setting the project up" />;
  const { project } = page.access;
  const system = await getSystemInProject({ projectId: project.id, systemId });
  if (!system) notFound();
  const units = unitSystemFor(page.user, project);
  const u = FORM_UNITS[units];
  const [sections, terminals, counts] = await Promise.all([listSectionsOfSystem({ systemId }), listTerminalsOfSystem({ systemId }), countFieldDataByItem({ projectId: project.id })]);
  const detail = [
    `${KIND_LABEL[system.kind]} · design ${formatIn(u.flow, system.designFlowM3S, 4)}`,
    system.designStaticPa !== null && `static ${formatIn(u.pressure, system.designStaticPa, 3)}`,
    system.fanSpeedRpm !== null && `fan ${system.fanSpeedRpm.toLocaleString("en-US")} rpm`,
    system.designOutsideAirM3S !== null && `minimum outside air ${formatIn(u.flow, system.designOutsideAirM3S, 4)}`,
  ].filter(Boolean);
  const motor = [
    system.motorPowerKw !== null && formatIn(u.power, system.motorPowerKw, 3),
    system.motorSpeedRpm !== null && `${system.motorSpeedRpm.toLocaleString("en-US")} rpm`,
    system.motorFullLoadAmps !== null && `${system.motorFullLoadAmps} A`,
    system.motorVolts !== null && `${system.motorVolts} V`,
    system.motorPhases !== null && `${system.motorPhases}-phase`,
    system.motorServiceFactor !== null && `service factor ${system.motorServiceFactor}`,
    system.hasVfd && "on a variable-frequency drive",
  ].filter(Boolean);

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href={`/projects/${project.id}/setup`} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline-offset-4 hover:underline">
          ← Set-up
        </Link>
      </nav>
      <Card title={`${system.tag} · ${system.name}`}>
        <p className="num">{detail.join(" · ")}</p>
        <p className="num mb-3 text-ink-soft">
          {motor.length > 0 ? `Motor: ${motor.join(", ")}.` : "No motor nameplate data yet."} {system.location && `Location: ${system.location}.`}
        </p>
        <SystemActions projectId={project.id} system={system} units={units} sectionCount={sections.length} terminalCount={terminals.length} />
      </Card>
      <DuctTreeEditor
        projectId={project.id}
        units={units}
        system={{ id: system.id, tag: system.tag, kind: system.kind, designFlowM3S: system.designFlowM3S }}
        sections={sections}
        terminals={terminals.map(terminalResource)}
        traversesBySection={Object.fromEntries(counts.traversesBySection)}
        readingsByTerminal={Object.fromEntries(counts.readingsByTerminal)}
      />
    </main>
  );
}
