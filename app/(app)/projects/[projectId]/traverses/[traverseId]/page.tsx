import { AcceptedDeviationsNote } from "@/components/engineer/accepted-deviations-note";
import { listDeviations } from "@/db/queries/deviations";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ductSize } from "@/components/airflow/format";
import { SyncStatusBanner } from "@/components/offline/sync-status-banner";
import { CrossSection } from "@/components/traverse/cross-section";
import { InsertionDepths } from "@/components/traverse/insertion-depths";
import { LiveResults } from "@/components/traverse/live-results";
import { resultsHeadingId } from "@/components/traverse/results-heading";
import { TraverseScreen } from "@/components/traverse/traverse-screen";
import { hasVelocities, VelocityViews } from "@/components/traverse/velocity-views";
import { buttonClasses } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Cautions } from "@/components/ui/caution";
import { LocalTime } from "@/components/ui/local-time";
import { StatusBadge } from "@/components/ui/status";
import { SectionPhotosLater } from "@/components/uploads/section-photos-later";
import { isUuid } from "@/db/queries/projects";
import { getTraverseInProject } from "@/db/queries/traverses";
import type { Traverse } from "@/lib/api-client/traverses";
import { requireProjectPage } from "@/lib/auth/guards";
import { can } from "@/lib/auth/policy";
import { toleranceFor } from "@/lib/airflow/tolerance";
import { fieldRoutes } from "@/lib/field-routes";
import { traverseResource } from "@/lib/server/traverses";
import { formatQuantity, unitSystemFor } from "@/lib/units";

export const metadata: Metadata = { title: "Traverse" };

export default async function TraversePage({ params }: { params: Promise<{ projectId: string; traverseId: string }> }) {
  const { projectId, traverseId } = await params;
  const { user, access } = await requireProjectPage(projectId, "project.view");
  const { project, role } = access;
  const found = isUuid(traverseId) ? await getTraverseInProject({ projectId: project.id, traverseId }) : null;
  if (!found) notFound();
  const resource = JSON.parse(JSON.stringify(await traverseResource(found, project, undefined, { history: true }))) as Traverse & {
    revisions: { id: string; revision: number; status: "draft" | "submitted" | "approved" | "returned"; method: string; createdAt: string; takenByName: string | null; readCount: number }[];
  };
  const units = unitSystemFor(user, project);
  const canRecord = can(user, role, "traverse.record");
  const { section, system } = found;
  const tol = toleranceFor(project, "section");
  const latest = resource.revisions[0];
  const round = resource.section.shape === "round";
  const duct = round
    ? { shape: "round" as const, diameterMm: resource.section.diameterMm ?? 0 }
    : { shape: "rectangular" as const, widthMm: resource.section.widthMm ?? 0, heightMm: resource.section.heightMm ?? 0 };
  const deviations = (await listDeviations({ projectId: project.id })).filter((d) => (d.subject === "section" || d.subject === "junction") && d.entityId === section.id);
  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <AcceptedDeviationsNote deviations={deviations} />
      <nav aria-label="Breadcrumb" className="text-sm">
        {canRecord ? (
          <Link href={fieldRoutes.hub(project.id)} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
            ← Field work
          </Link>
        ) : (
          <Link href={`/projects/${project.id}`} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
            ← Overview
          </Link>
        )}
      </nav>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h1 className="text-2xl">
            Traverse of {section.tag} <span className="font-normal text-ink-soft">· {system.tag} · revision {found.traverse.revision}</span>
          </h1>
          <p className="num text-ink-soft">
            {ductSize(section, units)} · {resource.layout?.rule ?? found.traverse.method} · {found.traverse.lines} × {found.traverse.pointsPerLine} points · design {formatQuantity(units, "flow", section.designFlowM3S)} ·{" "}
            {section.location || "location not recorded"}
          </p>
          <div className="mt-1 flex flex-wrap items-center gap-3">
            <StatusBadge status={found.traverse.status} />
            {found.takenByName && <span className="text-sm text-ink-soft">Started by {found.takenByName}</span>}
          </div>
        </div>
        {canRecord && latest && latest.id === resource.id && found.traverse.status !== "draft" && found.traverse.status !== "returned" && (
          <Link prefetch={false} href={fieldRoutes.newTraverse(project.id, section.id)} className={buttonClasses("secondary")}>
            Re-traverse {section.tag}
          </Link>
        )}
      </div>
      {canRecord && <SyncStatusBanner />}
      {canRecord && <Cautions layout="tiles" />}

      <TraverseScreen
        projectId={project.id}
        initial={resource}
        units={units}
        canRecord={canRecord}
        tolerance={{ minusPct: tol.minusPct, plusPct: tol.plusPct }}
        plane={resource.layout && <CrossSection duct={duct} layout={resource.layout} title={`Cross-section of ${resource.sectionTag} with the numbered traverse points and ports`} />}
        insertionDepths={resource.layout && <InsertionDepths layout={resource.layout} units={units} portOffsetMm={resource.portOffsetMm} round={round} />}
        initialViews={
          resource.layout &&
          resource.result &&
          hasVelocities(resource.result.points) && (
            <VelocityViews
              points={resource.result.points}
              unreadable={resource.unreadable}
              layout={resource.layout}
              duct={duct}
              units={units}
              sectionTag={resource.sectionTag}
              lines={resource.lines}
              round={round}
            />
          )
        }
        initialResults={
          resource.result && (
            <LiveResults
              result={resource.result}
              units={units}
              designFlowM3S={section.designFlowM3S}
              tolerance={{ minusPct: tol.minusPct, plusPct: tol.plusPct }}
              source={{ kind: "server", version: resource.version }}
              headingId={resultsHeadingId(resource.id)}
            />
          )
        }
      />

      <div className="grid gap-gutter lg:grid-cols-2">
        <Card title={`Instruments`}>
          <ul className="grid gap-2">
            {(
              [
                ["Reading", resource.instrument.reading],
                ["Pitot tube", resource.instrument.probe],
                ["Thermo-hygrometer", resource.instrument.airMeter],
                ["Barometer", resource.instrument.barometer],
              ] as const
            ).map(([label, i]) => (
              <li key={label}>
                <span className="font-semibold">{label}:</span> {i ? `${i.name} · ${i.calibrationStatus.message}` : <span className="text-ink-soft">not recorded</span>}
              </li>
            ))}
          </ul>
          {resource.instrument.calibrationProblems && (
            <ul className="mt-2 rounded-card border-2 border-caution bg-caution-soft p-3 text-sm">
              {Object.values(resource.instrument.calibrationProblems).map((m) => (
                <li key={m}>▲ {m}</li>
              ))}
            </ul>
          )}
          {resource.instrument.overdueReason && <p className="mt-2 text-sm">Reason given: {resource.instrument.overdueReason}</p>}
        </Card>
        <Card title={`History of ${section.tag}`}>
          <ol className="grid gap-2">
            {resource.revisions.map((r) => (
              <li key={r.id} className="flex flex-wrap items-center gap-3">
                {r.id === resource.id ? (
                  <span className="font-semibold">Revision {r.revision} (this one)</span>
                ) : (
                  <Link href={fieldRoutes.traverse(project.id, r.id)} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
                    Revision {r.revision}
                  </Link>
                )}
                <StatusBadge status={r.status} />
                <span className="text-sm text-ink-soft">
                  <LocalTime iso={r.createdAt} />
                  {r.takenByName ? ` · ${r.takenByName}` : ""} · {r.readCount} points read
                </span>
              </li>
            ))}
          </ol>
          {resource.revisions.length === 1 && <p className="mt-2 text-sm text-ink-soft">No earlier traverses: a re-traverse keeps this one as history.</p>}
        </Card>
      </div>

      <Card title={`Photos of ${section.tag}'s test ports and traverse plane`}>
        <SectionPhotosLater
          projectId={project.id}
          sectionId={section.id}
          sectionTag={section.tag}
          currentUserId={user.id}
          canAdd={can(user, role, "photo.add")}
          locked={latest?.status === "approved"}
        />
      </Card>
    </main>
  );
}
