import { AcceptedDeviationsNote } from "@/components/engineer/accepted-deviations-note";
import { listDeviations } from "@/db/queries/deviations";
import type { Metadata } from "next";
import Link from "next/link";
import { SyncStatusBanner } from "@/components/offline/sync-status-banner";
import { TerminalsBoard } from "@/components/terminals/terminals-board";
import type { BoardBranch, BoardSystem, BoardTraverse } from "@/components/terminals/model";
import { Cautions } from "@/components/ui/caution";
import { getProjectDesign } from "@/db/queries/airflow";
import { listConditionsForSystem } from "@/db/queries/conditions";
import { listConditionsByIds, listTerminalReadings, listTerminalSets, listTraversesOfSingleTerminalSections } from "@/db/queries/terminal-readings";
import type { DuctSection } from "@/db/schema";
import type { Conditions } from "@/lib/api-client/field";
import type { ProjectReadings } from "@/lib/api-client/terminals";
import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import { requireProjectPage } from "@/lib/auth/guards";
import { can } from "@/lib/auth/policy";
import { fieldRoutes } from "@/lib/field-routes";
import { reduceStoredTraverse } from "@/lib/server/airflow-view";
import { conditionsJson } from "@/lib/server/field-json";
import { formatFor, terminalReadingJson } from "@/lib/server/terminal-reading-json";
import { instrumentMap } from "@/lib/server/terminal-readings";
import { formatQuantity, unitSystemFor } from "@/lib/units";
import { buttonClasses } from "@/components/ui/button";
import { TerminalSetSubmit, type TerminalSetSubmitProps } from "@/components/review/terminal-set-submit";
import { listReviewsOf } from "@/db/queries/reviews";
import { terminalSetSubmissionProblems } from "@/lib/server/review";

export const metadata: Metadata = { title: "Terminals" };

/** Plain JSON, as the client receives it from the API (dates as ISO strings). */
const plain = <T,>(value: unknown): T => JSON.parse(JSON.stringify(value)) as T;

export default async function TerminalsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, access } = await requireProjectPage(projectId, "project.view");
  const { project } = access;
  const units = unitSystemFor(user, project);
  const canRecord = can(user, access.role, "terminal.record");
  const format = formatFor(user, project);

  const [design, { rows, truncated }, sets, traverses, instruments, deviations] = await Promise.all([
    getProjectDesign({ projectId: project.id }),
    listTerminalReadings({ projectId: project.id }),
    listTerminalSets({ projectId: project.id }),
    listTraversesOfSingleTerminalSections({ projectId: project.id }),
    instrumentMap(),
    listDeviations({ projectId: project.id }),
  ]);
  const [conditionLists, referenced] = await Promise.all([
    Promise.all(design.systems.map(async (s) => [s.id, plain<Conditions[]>((await listConditionsForSystem({ systemId: s.id, limit: 10 })).map(conditionsJson))] as const)),
    listConditionsByIds({ ids: rows.flatMap((r) => (r.conditionsId ? [r.conditionsId] : [])) }),
  ]);
  const conditionsBySystem = new Map(conditionLists);

  const terminalsById = new Map(design.terminals.map((t) => [t.id, t]));
  const terminalsPerSection: Record<string, number> = {};
  for (const t of design.terminals) terminalsPerSection[t.sectionId] = (terminalsPerSection[t.sectionId] ?? 0) + 1;

  const systems: BoardSystem[] = design.systems.map((system) => {
    const sections = design.sections.filter((s) => s.systemId === system.id);
    const children = new Map<string | null, DuctSection[]>();
    for (const s of sections) children.set(s.parentId, [...(children.get(s.parentId) ?? []), s]);
    // Fan to outlets: each section after its parent, in tag order within a parent.
    const ordered: DuctSection[] = [];
    const visit = (s: DuctSection) => {
      ordered.push(s);
      for (const c of children.get(s.id) ?? []) visit(c);
    };
    for (const root of children.get(null) ?? []) visit(root);
    const branches: BoardBranch[] = ordered.map((s) => ({
      id: s.id,
      tag: s.tag,
      location: s.location,
      designFlowM3S: s.designFlowM3S,
      terminals: design.terminals
        .filter((t) => t.sectionId === s.id)
        .map((t) => ({
          id: t.id,
          tag: t.tag,
          kind: t.type,
          service: t.service,
          room: t.room,
          device: t.device,
          sectionId: t.sectionId,
          designFlowM3S: t.designFlowM3S,
          designMinFlowM3S: t.designMinFlowM3S,
          designHeatingFlowM3S: t.designHeatingFlowM3S,
          effectiveAreaM2: t.effectiveAreaM2,
          controllerFlowFactor: t.controllerFlowFactor,
        })),
    }));
    return {
      id: system.id,
      tag: system.tag,
      name: system.name,
      kind: system.kind,
      location: system.location,
      fanSpeedRpm: system.fanSpeedRpm,
      hasVfd: system.hasVfd,
      branches,
      conditions: conditionsBySystem.get(system.id) ?? [],
    };
  });

  const sectionsById = new Map(design.sections.map((s) => [s.id, s]));
  const boardTraverses: BoardTraverse[] = traverses.flatMap((t) => {
    const section = sectionsById.get(t.sectionId);
    if (!section) return [];
    const reduced = reduceStoredTraverse(t, section, project);
    return [
      {
        id: t.id,
        sectionId: t.sectionId,
        revision: t.revision,
        version: t.version,
        status: t.status,
        takenAt: t.takenAt?.toISOString() ?? null,
        flowM3S: reduced.ok ? reduced.result.flowM3S : null,
        standardFlowM3S: reduced.ok ? reduced.result.standardFlowM3S : null,
        densityKgM3: reduced.ok ? reduced.result.densityKgM3 : null,
        conditionsId: t.conditionsId,
        problem: reduced.ok ? null : reduced.message,
      },
    ];
  });

  // Each system's current terminal set, with what stands in the way of submitting it and its last decision.
  const submissions: TerminalSetSubmitProps[] = [];
  if (canRecord)
    for (const system of design.systems) {
      const set = sets.find((x) => x.systemId === system.id);
      if (!set) continue;
      const [problems, decisions] = await Promise.all([
        set.status === "draft" || set.status === "returned" ? terminalSetSubmissionProblems({ set, system, submittedByName: null }) : Promise.resolve({}),
        listReviewsOf({ terminalSetIds: [set.id] }),
      ]);
      const last = decisions[0];
      const sectionIds = new Set(design.sections.filter((x) => x.systemId === system.id).map((x) => x.id));
      submissions.push({
        systemTag: system.tag,
        set: { id: set.id, status: set.status, revision: set.revision },
        terminalIds: design.terminals.filter((t) => sectionIds.has(t.sectionId)).map((t) => t.id),
        problems,
        lastReview: last ? { decision: last.decision, comment: last.reason, reviewerName: last.reviewerName, at: last.createdAt.toISOString() } : null,
      });
    }

  const initialReadings = plain<ProjectReadings>({
    systemId: null,
    sets: sets.map((s) => ({ id: s.id, systemId: s.systemId, status: s.status, version: s.version, revision: s.revision, updatedAt: s.updatedAt })),
    readings: rows.flatMap((r) => {
      const terminal = terminalsById.get(r.terminalId);
      return terminal ? [terminalReadingJson(r, { terminal, project, instruments, format })] : [];
    }),
    conditions: referenced.map(conditionsJson),
    truncated,
  });

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      {canRecord && <SyncStatusBanner />}
      <AcceptedDeviationsNote deviations={deviations.filter((d) => d.subject === "terminal")} />
      <section aria-labelledby="terminals-title" className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="terminals-title">Outlets and terminal units</h2>
          <p className="num text-ink-soft">
            Airflows at standard air ({formatQuantity(units, "density", project.standardDensityKgM3)}). Allowed: outlets {formatTolerance(toleranceFor(project, "outlet"))}, terminal units{" "}
            {formatTolerance(toleranceFor(project, "terminalUnit"))} of design.
          </p>
        </div>
        {canRecord && (
          <Link prefetch={false} href={fieldRoutes.hub(project.id)} className={buttonClasses("secondary")}>
            Back to Field work
          </Link>
        )}
      </section>
      <Cautions layout="tiles" />
      {canRecord && submissions.length > 0 && (
        <section aria-labelledby="terminal-submit-title" className="grid gap-3">
          <h2 id="terminal-submit-title">Submit for review</h2>
          <div className="grid gap-3 lg:grid-cols-2">
            {submissions.map((s) => (
              <div key={s.set.id} className="grid gap-1">
                <h3>{s.systemTag}</h3>
                <TerminalSetSubmit projectId={project.id} {...s} />
              </div>
            ))}
          </div>
        </section>
      )}
      <TerminalsBoard
        projectId={project.id}
        project={{
          id: project.id,
          unitSystem: project.unitSystem,
          altitudeM: project.altitudeM,
          standardDensityKgM3: project.standardDensityKgM3,
          outletToleranceMinusPct: project.outletToleranceMinusPct,
          outletTolerancePlusPct: project.outletTolerancePlusPct,
          terminalUnitToleranceMinusPct: project.terminalUnitToleranceMinusPct,
          terminalUnitTolerancePlusPct: project.terminalUnitTolerancePlusPct,
          fanToleranceMinusPct: project.fanToleranceMinusPct,
          fanTolerancePlusPct: project.fanTolerancePlusPct,
          sectionToleranceMinusPct: project.sectionToleranceMinusPct,
          sectionTolerancePlusPct: project.sectionTolerancePlusPct,
          outsideAirToleranceMinusPct: project.outsideAirToleranceMinusPct,
          outsideAirTolerancePlusPct: project.outsideAirTolerancePlusPct,
        }}
        units={units}
        canRecord={canRecord}
        userName={user.name}
        systems={systems}
        traverses={boardTraverses}
        terminalsPerSection={terminalsPerSection}
        initialReadings={initialReadings}
      />
    </main>
  );
}
