import { and, asc, eq, inArray } from "drizzle-orm";
import { drawSample, sampleOutcome, compareFlows } from "@/lib/review/sample";
import { engineResultFor, engineSourceOf, gridOfRows } from "@/lib/traverse/engine-input";
import * as s from "../schema";
import type { Tx } from "./index";

/**
 * The review story of the demo, consistent with its traverses: all four AHU-1 traverses were
 * submitted; while the two reading-room branches (S1.1, S1.2) were the only ones submitted, the
 * commissioning agent drew a verification sample of them, spot-traversed both under the same
 * operating conditions (within 3 % and 4 % of the technician's: invented), witnessed them, and
 * approved them (their reviews are written with the traverses). The trunk and the children's branch
 * await review. Every step is in the audit trail at the time it happened.
 */
export async function seedReviewStory(tx: Tx, { projectId, technicianId, reviewerId }: { projectId: string; technicianId: string; reviewerId: string }) {
  const [project] = await tx.select().from(s.projects).where(eq(s.projects.id, projectId));
  const [ahu] = await tx.select().from(s.airSystems).where(and(eq(s.airSystems.projectId, projectId), eq(s.airSystems.tag, "AHU-1")));
  const sections = await tx.select().from(s.ductSections).where(eq(s.ductSections.systemId, ahu!.id));
  const bySection = new Map(sections.map((x) => [x.id, x]));
  const traverses = await tx.select().from(s.traverses).where(inArray(s.traverses.sectionId, sections.map((x) => x.id)));
  const users = await tx.select({ id: s.users.id, email: s.users.email }).from(s.users).where(inArray(s.users.id, [technicianId, reviewerId]));
  const email = (id: string) => users.find((u) => u.id === id)!.email;
  const tagOf = (t: (typeof traverses)[number]) => bySection.get(t.sectionId)!.tag;

  const audit: (typeof s.auditLog.$inferInsert)[] = [];
  for (const t of traverses) {
    audit.push({
      at: t.submittedAt!,
      userId: technicianId,
      actorEmail: email(technicianId),
      projectId,
      action: "traverse.submitted",
      entityType: "traverse",
      entityId: t.id,
      detail: { systemTag: "AHU-1", sectionTag: tagOf(t), revision: t.revision, version: t.version, before: { status: "draft" }, after: { status: "submitted" } },
    });
  }

  // The sample: drawn from the two submitted branches at the time, under the project's rule.
  const branches = traverses.filter((t) => t.status === "approved").sort((a, b) => tagOf(a).localeCompare(tagOf(b)));
  const population = branches.map((t) => ({ kind: "section" as const, id: t.sectionId, tag: tagOf(t) }));
  const seed = 2026112401;
  const drawn = drawSample(population, { pct: project!.samplePct, minCount: project!.sampleMinCount }, seed);
  const drawnAt = new Date(Math.max(...branches.map((t) => t.submittedAt!.getTime())) + 25 * 60_000);
  const agentDelta: Record<string, number> = { "S1.1": 0.031, "S1.2": -0.042 };
  const items = drawn.map((c, position) => {
    const t = branches.find((b) => b.sectionId === c.id)!;
    return { c, t, position };
  });
  const rows = [];
  for (const { c, t, position } of items) {
    const points = await tx.select().from(s.readings).where(eq(s.readings.traverseId, t.id)).orderBy(asc(s.readings.line), asc(s.readings.point));
    const { readings } = gridOfRows(t.lines, t.pointsPerLine, points);
    const reduced = engineResultFor(engineSourceOf(t, bySection.get(t.sectionId)!, project!), readings);
    if (!reduced.ok) throw new Error(`demo traverse ${c.tag} does not reduce: ${reduced.message}`);
    const technicianFlowM3S = reduced.result.standardFlowM3S;
    // Rounded as the agent would note a spot traverse's result: to the litre per second.
    const agentFlowM3S = Math.round(technicianFlowM3S * (1 + (agentDelta[c.tag] ?? 0)) * 1000) / 1000;
    const compared = compareFlows(technicianFlowM3S, agentFlowM3S, project!.sampleTolerancePct);
    rows.push({
      position,
      kind: "section" as const,
      sectionId: c.id,
      tag: c.tag,
      technicianTraverseId: t.id,
      technicianFlowM3S,
      technicianConditionsId: t.conditionsId,
      agentMethod: "spot_traverse",
      agentDetail: { standardFlowM3S: agentFlowM3S, notes: "Spot traverse, one diameter, same ports, same probe marks." },
      agentFlowM3S,
      agentConditionsId: t.conditionsId,
      conditionsDiffer: [],
      differencePct: compared.differencePct,
      agrees: compared.agrees,
      witnessed: true,
      readBy: reviewerId,
      readAt: new Date(drawnAt.getTime() + (position + 1) * 15 * 60_000),
    });
  }
  const outcome = sampleOutcome(rows, project!.sampleAllowedFailures);
  const [sample] = await tx
    .insert(s.verificationSamples)
    .values({
      projectId,
      systemId: ahu!.id,
      seed,
      samplePct: project!.samplePct,
      minCount: project!.sampleMinCount,
      tolerancePct: project!.sampleTolerancePct,
      allowedFailures: project!.sampleAllowedFailures,
      population,
      status: outcome.notRead === 0 ? "closed" : "open",
      agreedCount: outcome.agreed,
      disagreedCount: outcome.disagreed,
      recommendReturn: outcome.recommendReturn,
      drawnBy: reviewerId,
      drawnAt,
    })
    .returning();
  await tx.insert(s.verificationSampleItems).values(rows.map((r) => ({ ...r, sampleId: sample!.id })));
  audit.push({
    at: drawnAt,
    userId: reviewerId,
    actorEmail: email(reviewerId),
    projectId,
    action: "sample.drawn",
    entityType: "verification_sample",
    entityId: sample!.id,
    detail: { systemTag: "AHU-1", seed, population: population.length, items: rows.map((r) => r.tag) },
  });
  for (const r of rows)
    audit.push({
      at: r.readAt,
      userId: reviewerId,
      actorEmail: email(reviewerId),
      projectId,
      action: "sample.reading_recorded",
      entityType: "verification_sample",
      entityId: sample!.id,
      detail: { sampleId: sample!.id, systemTag: "AHU-1", tag: r.tag, method: r.agentMethod, after: { flowM3S: r.agentFlowM3S, agrees: r.agrees, differencePct: r.differencePct }, technicianFlowM3S: r.technicianFlowM3S },
    });
  const approvedAt = new Date(drawnAt.getTime() + (rows.length + 1) * 15 * 60_000);
  for (const t of branches) {
    await tx.update(s.reviews).set({ createdAt: approvedAt }).where(eq(s.reviews.traverseId, t.id));
    audit.push({
      at: approvedAt,
      userId: reviewerId,
      actorEmail: email(reviewerId),
      projectId,
      action: "traverse.approved",
      entityType: "traverse",
      entityId: t.id,
      detail: { systemTag: "AHU-1", sectionTag: tagOf(t), revision: t.revision, version: t.version, before: { status: "submitted" }, after: { status: "approved" }, comment: "Witnessed two points on each line; readings repeat within 2 %.", witnessed: true },
    });
  }
  await tx.insert(s.auditLog).values(audit.sort((a, b) => +a.at! - +b.at!));
}
