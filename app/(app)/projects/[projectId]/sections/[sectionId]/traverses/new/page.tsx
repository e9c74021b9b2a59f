import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ductSize } from "@/components/airflow/format";
import { SyncStatusBanner } from "@/components/offline/sync-status-banner";
import { StartTraverseForm } from "@/components/traverse/start-form";
import { Cautions } from "@/components/ui/caution";
import { NotAllowed } from "@/components/ui/not-allowed";
import { listConditionsForSystem } from "@/db/queries/conditions";
import { getSectionInProject } from "@/db/queries/design";
import { isUuid } from "@/db/queries/projects";
import { listRevisionsOfSection } from "@/db/queries/traverses";
import type { Conditions } from "@/lib/api-client/field";
import { requireProjectPage } from "@/lib/auth/guards";
import { fieldRoutes } from "@/lib/field-routes";
import { conditionsJson } from "@/lib/server/field-json";
import { formatQuantity, unitSystemFor } from "@/lib/units";

export const metadata: Metadata = { title: "Start a traverse" };

export default async function NewTraversePage({ params }: { params: Promise<{ projectId: string; sectionId: string }> }) {
  const { projectId, sectionId } = await params;
  const { user, access, allowed } = await requireProjectPage(projectId, "traverse.record");
  if (!allowed) return <NotAllowed what="taking readings" />;
  const { project } = access;
  const found = isUuid(sectionId) ? await getSectionInProject({ projectId: project.id, sectionId }) : null;
  if (!found) notFound();
  const { section, system } = found;
  const units = unitSystemFor(user, project);
  const [revisions, conditions] = await Promise.all([listRevisionsOfSection({ sectionId: section.id }), listConditionsForSystem({ systemId: system.id, limit: 10 })]);
  const latest = revisions[0];
  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href={fieldRoutes.hub(project.id)} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
          ← Field work
        </Link>
      </nav>
      <div>
        <h1 className="text-2xl">
          Start a traverse of {section.tag} <span className="font-normal text-ink-soft">· {system.tag}</span>
        </h1>
        <p className="num text-ink-soft">
          {ductSize(section, units)} · design {formatQuantity(units, "flow", section.designFlowM3S)} · {section.location || "location not recorded"}
          {section.straightUpstreamMm !== null && ` · straight run ${formatQuantity(units, "length", section.straightUpstreamMm / 1000, { decimals: 1 })} upstream`}
          {section.straightDownstreamMm !== null && `, ${formatQuantity(units, "length", section.straightDownstreamMm / 1000, { decimals: 1 })} downstream`}
        </p>
        {latest && (
          <p className="mt-1">
            {section.tag} already has revision {latest.revision} ({latest.status === "draft" ? "in progress" : latest.status}).{" "}
            <Link href={fieldRoutes.traverse(project.id, latest.id)} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
              Open revision {latest.revision}
            </Link>
          </p>
        )}
      </div>
      <SyncStatusBanner />
      <Cautions layout="tiles" />
      <StartTraverseForm
        projectId={project.id}
        section={{
          id: section.id,
          tag: section.tag,
          shape: section.shape,
          diameterMm: section.diameterMm,
          widthMm: section.widthMm,
          heightMm: section.heightMm,
          straightUpstreamMm: section.straightUpstreamMm,
          straightDownstreamMm: section.straightDownstreamMm,
          designFlowM3S: section.designFlowM3S,
          location: section.location,
        }}
        system={{ id: system.id, tag: system.tag, name: system.name, fanSpeedRpm: system.fanSpeedRpm, hasVfd: system.hasVfd, kind: system.kind }}
        units={units}
        altitudeM={project.altitudeM}
        standardDensityKgM3={project.standardDensityKgM3}
        nextRevision={(latest?.revision ?? 0) + 1}
        conditions={JSON.parse(JSON.stringify(conditions.map(conditionsJson))) as Conditions[]}
      />
    </main>
  );
}
