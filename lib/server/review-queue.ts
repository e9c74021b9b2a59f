import "server-only";
import { desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { getProjectDesign, listTraversesForProject } from "@/db/queries/airflow";
import { listConditionsByIds } from "@/db/queries/terminal-readings";
import { listReviewsOf, type ReviewRow } from "@/db/queries/reviews";
import { airSystems, terminalReadings, terminalSets, users, type Project, type Terminal, type TraverseStatus } from "@/db/schema";
import { withinTolerance } from "@/lib/airflow/balancing";
import { toleranceFor } from "@/lib/airflow/tolerance";
import { formatExpandedUncertainty } from "@/lib/airflow/uncertainty";
import { buildAirflowView } from "./airflow-view";
import { conditionsJson } from "./field-json";

const REVIEWED: readonly TraverseStatus[] = ["submitted", "returned", "approved"];

function lastDecision(rows: ReviewRow[]) {
  const r = rows[0];
  return r ? { decision: r.decision, comment: r.reason, witnessed: r.witnessed, systemWide: r.systemWide, reviewerName: r.reviewerName, at: r.createdAt, version: r.traverseVersion } : null;
}

const isUnit = (t: Terminal) => t.type === "vav_box" || t.type === "constant_volume_box";

/**
 * The commissioning agent's queue: each section's current traverse and each system's current terminal
 * set that was submitted, returned or approved, with the numbers to judge them by (flows, % of design,
 * the uncertainty with its k, the plane's verdict, warnings, operating conditions, the technician's
 * notes) and the last decision; plus counts per status. Uses the same "newest traverse per section"
 * rule as every other screen (lib/server/airflow-view.ts).
 */
export async function reviewQueue(project: Project) {
  const [design, stored] = await Promise.all([getProjectDesign({ projectId: project.id }), listTraversesForProject({ projectId: project.id })]);
  const views = buildAirflowView(project, design, stored);
  const db = await getDb();
  const sets = await db
    .select({ set: terminalSets, submittedByName: users.name })
    .from(terminalSets)
    .innerJoin(airSystems, eq(airSystems.id, terminalSets.systemId))
    .leftJoin(users, eq(users.id, terminalSets.submittedBy))
    .where(eq(airSystems.projectId, project.id))
    .orderBy(desc(terminalSets.revision));
  const currentSet = new Map<string, (typeof sets)[number]>();
  for (const s of sets) if (!currentSet.has(s.set.systemId)) currentSet.set(s.set.systemId, s);

  const traverseRows = views.flatMap((v) => v.sections.filter((s) => s.latest && REVIEWED.includes(s.latest.status)).map((s) => ({ view: v, s })));
  const setRows = [...currentSet.values()].filter((s) => REVIEWED.includes(s.set.status));
  const [decisions, conditions, setReadings] = await Promise.all([
    listReviewsOf({ traverseIds: traverseRows.map((r) => r.s.latest!.id), terminalSetIds: setRows.map((s) => s.set.id) }),
    listConditionsByIds({ ids: traverseRows.flatMap((r) => (r.s.latest!.conditionsId ? [r.s.latest!.conditionsId] : [])) }),
    setRows.length === 0 ? [] : db.select().from(terminalReadings).where(inArray(terminalReadings.setId, setRows.map((s) => s.set.id))),
  ]);
  const conditionsById = new Map(conditions.map((c) => [c.id, conditionsJson(c)]));
  const terminalsById = new Map(design.terminals.map((t) => [t.id, t]));
  const sectionSystem = new Map(design.sections.map((s) => [s.id, s.systemId]));

  const traverseItems = traverseRows.map(({ view, s }) => {
    const t = s.latest!;
    const r = s.reduction?.ok ? s.reduction.result : null;
    return {
      type: "traverse" as const,
      id: t.id,
      systemId: view.system.id,
      systemTag: view.system.tag,
      tag: s.section.tag,
      label: `${view.system.tag} / ${s.section.tag}`,
      location: s.section.location,
      status: t.status,
      revision: t.revision,
      version: t.version,
      takenByName: t.takenByName,
      takenAt: t.takenAt,
      submittedAt: t.submittedAt,
      notes: t.notes,
      designFlowM3S: s.section.designFlowM3S,
      flowM3S: r?.flowM3S ?? null,
      standardFlowM3S: r?.standardFlowM3S ?? null,
      massFlowKgS: r?.massFlowKgS ?? null,
      pctOfDesign: s.pctOfDesign,
      withinTolerance: s.withinTolerance,
      uncertaintyPct: r ? 100 * r.uncertainty.expanded : null,
      uncertaintyShown: r ? formatExpandedUncertainty(r.uncertainty.expanded) : null,
      quality: r ? { verdict: r.quality.verdict, reasons: r.quality.reasons } : null,
      warnings: r ? r.warnings : s.reduction && !s.reduction.ok ? [s.reduction.message] : [],
      terminals: null as { read: number; of: number; within: number; outside: number; readings: number } | null,
      conditions: t.conditionsId ? (conditionsById.get(t.conditionsId) ?? null) : null,
      lastReview: lastDecision(decisions.filter((d) => d.traverseId === t.id)),
    };
  });

  const setItems = setRows.map(({ set, submittedByName }) => {
    const system = design.systems.find((x) => x.id === set.systemId)!;
    const readings = setReadings.filter((r) => r.setId === set.id);
    // Per terminal, the latest final reading (else initial) at design or maximum, judged against its band.
    const latest = new Map<string, (typeof readings)[number]>();
    for (const r of readings) {
      if (r.setpoint !== "design" && r.setpoint !== "maximum") continue;
      const seen = latest.get(r.terminalId);
      const rank = (x: typeof r) => (x.phase === "final" ? 1 : 0);
      if (!seen || rank(r) > rank(seen) || (rank(r) === rank(seen) && +r.takenAt > +seen.takenAt)) latest.set(r.terminalId, r);
    }
    let within = 0;
    let outside = 0;
    let designSum = 0;
    let measuredSum = 0;
    for (const r of latest.values()) {
      const terminal = terminalsById.get(r.terminalId);
      if (!terminal) continue;
      designSum += terminal.designFlowM3S;
      measuredSum += r.standardFlowM3S;
      if (withinTolerance(r.standardFlowM3S, terminal.designFlowM3S, toleranceFor(project, isUnit(terminal) ? "terminalUnit" : "outlet"))) within++;
      else outside++;
    }
    const terminalCount = design.terminals.filter((t) => sectionSystem.get(t.sectionId) === set.systemId).length;
    return {
      type: "terminal_set" as const,
      id: set.id,
      systemId: set.systemId,
      systemTag: system.tag,
      tag: `Terminals (set ${set.revision})`,
      label: `${system.tag} terminal readings`,
      location: "",
      status: set.status,
      revision: set.revision,
      version: set.version,
      takenByName: submittedByName,
      takenAt: null,
      submittedAt: set.submittedAt,
      notes: set.notes,
      designFlowM3S: designSum || null,
      flowM3S: null,
      standardFlowM3S: measuredSum || null,
      massFlowKgS: null,
      pctOfDesign: designSum > 0 ? (100 * measuredSum) / designSum : null,
      withinTolerance: latest.size > 0 ? outside === 0 : null,
      uncertaintyPct: null,
      uncertaintyShown: null,
      quality: null,
      warnings: [
        ...(latest.size < terminalCount ? [`${terminalCount - latest.size} of ${terminalCount} terminals have no reading in this set.`] : []),
        ...(outside > 0 ? [`${outside} of ${latest.size} terminals read outside their tolerance.`] : []),
      ],
      terminals: { read: latest.size, of: terminalCount, within, outside, readings: readings.length } as { read: number; of: number; within: number; outside: number; readings: number } | null,
      conditions: null,
      lastReview: lastDecision(decisions.filter((d) => d.terminalSetId === set.id)),
    };
  });

  const items = [...traverseItems, ...setItems];
  const counts = { submitted: 0, returned: 0, approved: 0 } as Record<"submitted" | "returned" | "approved", number>;
  for (const i of items) if (i.status !== "draft") counts[i.status]++;
  return { items, counts, systems: design.systems.map((s) => ({ id: s.id, tag: s.tag, name: s.name })) };
}
export type ReviewQueue = Awaited<ReturnType<typeof reviewQueue>>;
export type ReviewQueueItem = ReviewQueue["items"][number];
