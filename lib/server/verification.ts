import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { getProjectDesign, listTraversesForProject } from "@/db/queries/airflow";
import { recordAudit } from "@/db/queries/audit";
import { getConditions } from "@/db/queries/conditions";
import { isUuid } from "@/db/queries/projects";
import { listReadingsOfSet } from "@/db/queries/reviews";
import { getSampleInProject, listSamples, type SampleWithItems } from "@/db/queries/samples";
import type { SessionUser } from "@/db/queries/users";
import { airSystems, terminalSets, verificationSampleItems, verificationSamples, type AirSystem, type Project, type TerminalReading, type Terminal } from "@/db/schema";
import { compareConditions } from "@/lib/airflow/conditions";
import { compareFlows, drawSample, newSeed, sampleOutcome, sampleSizes, type Candidate, type SampleKind } from "@/lib/review/sample";
import type { SampleDraw, SampleReading } from "@/lib/validation/review";
import { buildAirflowView } from "./airflow-view";
import type { Outcome } from "./traverses";

const ok = (status: number, body: unknown): Outcome => ({ status, body });
function fail(status: number, message: string, fields?: Record<string, string>): Outcome {
  return { status, body: { error: fields && Object.keys(fields).length > 0 ? { message, fields } : { message } } };
}
export const NO_SAMPLE = "No such verification sample in this project.";

interface Population extends Candidate {
  technicianFlowM3S: number;
  technicianReadingId: string | null;
  technicianTraverseId: string | null;
  technicianConditionsId: string | null;
}

const isUnit = (t: Terminal) => t.type === "vav_box" || t.type === "constant_volume_box";

/** The reading of a terminal the sample compares with: its latest final reading, else its latest initial one, at design (or maximum for a box). */
function readingToCompare(rows: TerminalReading[]): TerminalReading | null {
  const usable = rows.filter((r) => r.setpoint === "design" || r.setpoint === "maximum");
  const newest = (phase: "final" | "initial") => usable.filter((r) => r.phase === phase).sort((a, b) => +b.takenAt - +a.takenAt)[0];
  return newest("final") ?? newest("initial") ?? null;
}

/**
 * What a sample of this system is drawn from: each section whose current traverse is submitted or
 * approved and reduces to an airflow, and each outlet and terminal unit read in the system's newest
 * submitted (or else approved) terminal set. `submitted` says whether anything awaits review.
 */
export async function samplePopulation(project: Project, system: AirSystem): Promise<{ population: Population[]; submitted: boolean }> {
  const [design, stored] = await Promise.all([getProjectDesign({ projectId: project.id }), listTraversesForProject({ projectId: project.id })]);
  const view = buildAirflowView(project, design, stored).find((v) => v.system.id === system.id);
  const population: Population[] = [];
  let submitted = false;
  for (const s of view?.sections ?? []) {
    if (!s.latest || (s.latest.status !== "submitted" && s.latest.status !== "approved")) continue;
    if (s.latest.status === "submitted") submitted = true;
    if (!s.reduction?.ok) continue;
    population.push({
      kind: "section",
      id: s.section.id,
      tag: s.section.tag,
      technicianFlowM3S: s.reduction.result.standardFlowM3S,
      technicianReadingId: null,
      technicianTraverseId: s.latest.id,
      technicianConditionsId: s.latest.conditionsId,
    });
  }
  const db = await getDb();
  const sets = await db.select().from(terminalSets).where(eq(terminalSets.systemId, system.id));
  const set = sets.filter((x) => x.status === "submitted").sort((a, b) => b.revision - a.revision)[0] ?? sets.filter((x) => x.status === "approved").sort((a, b) => b.revision - a.revision)[0];
  if (set) {
    if (set.status === "submitted") submitted = true;
    const rows = await listReadingsOfSet({ setId: set.id });
    const byTerminal = new Map<string, { terminal: Terminal; readings: TerminalReading[] }>();
    for (const r of rows) {
      const entry = byTerminal.get(r.terminal.id) ?? { terminal: r.terminal, readings: [] };
      entry.readings.push(r.reading);
      byTerminal.set(r.terminal.id, entry);
    }
    for (const { terminal, readings } of byTerminal.values()) {
      const reading = readingToCompare(readings);
      if (!reading) continue;
      population.push({
        kind: isUnit(terminal) ? "terminal_unit" : "outlet",
        id: terminal.id,
        tag: terminal.tag,
        technicianFlowM3S: reading.standardFlowM3S,
        technicianReadingId: reading.id,
        technicianTraverseId: null,
        technicianConditionsId: reading.conditionsId,
      });
    }
  }
  return { population, submitted };
}

/** The sample as the API returns it, with its outcome and a check that the stored seed draws the same items again. */
export function sampleResource(found: SampleWithItems) {
  const { sample, items } = found;
  const outcome = sampleOutcome(items, sample.allowedFailures);
  const redraw = drawSample(sample.population, { pct: sample.samplePct, minCount: sample.minCount }, sample.seed);
  const byKind: Partial<Record<SampleKind, number>> = {};
  for (const p of sample.population) byKind[p.kind] = (byKind[p.kind] ?? 0) + 1;
  return {
    id: sample.id,
    systemId: sample.systemId,
    systemTag: found.systemTag,
    seed: sample.seed,
    rule: { samplePct: sample.samplePct, minCount: sample.minCount, tolerancePct: sample.tolerancePct, allowedFailures: sample.allowedFailures },
    populationCount: sample.population.length,
    populationByKind: byKind,
    sizes: sampleSizes(byKind, { pct: sample.samplePct, minCount: sample.minCount }),
    /** True when drawing again with the stored seed gives exactly these items. */
    reproduced: redraw.map((c) => c.id).join() === items.map((i) => i.terminalId ?? i.sectionId).join(),
    status: sample.status,
    drawnBy: sample.drawnBy,
    drawnByName: found.drawnByName,
    drawnAt: sample.drawnAt,
    outcome: { ...outcome, agreedCount: sample.agreedCount, disagreedCount: sample.disagreedCount },
    recommendReturn: sample.recommendReturn,
    items: items.map((i) => ({
      id: i.id,
      position: i.position,
      kind: i.kind,
      terminalId: i.terminalId,
      sectionId: i.sectionId,
      tag: i.tag,
      technician: { flowM3S: i.technicianFlowM3S, readingId: i.technicianReadingId, traverseId: i.technicianTraverseId, conditionsId: i.technicianConditionsId },
      agent:
        i.agentFlowM3S === null
          ? null
          : { method: i.agentMethod, flowM3S: i.agentFlowM3S, detail: i.agentDetail, conditionsId: i.agentConditionsId, readBy: i.readBy, readByName: i.readByName, readAt: i.readAt },
      conditionsDiffer: i.conditionsDiffer ?? [],
      differencePct: i.differencePct,
      agrees: i.agrees,
      witnessed: i.witnessed,
    })),
  };
}
export type SampleResource = ReturnType<typeof sampleResource>;

async function systemOf(project: Project, systemId: string): Promise<AirSystem | null> {
  const db = await getDb();
  const [row] = await db.select().from(airSystems).where(and(eq(airSystems.id, systemId), eq(airSystems.projectId, project.id)));
  return row ?? null;
}

/** The commissioning agent draws a sample of a submitted system with the project's rule. */
export async function drawVerificationSample(user: SessionUser, project: Project, body: SampleDraw): Promise<Outcome> {
  const system = await systemOf(project, body.systemId);
  if (!system) return fail(400, "The sample is not valid: check systemId.", { systemId: `names no air system of this project; got ${JSON.stringify(body.systemId)}` });
  const { population, submitted } = await samplePopulation(project, system);
  if (!submitted) return fail(409, `${system.tag} has nothing submitted for review: a verification sample is drawn from submitted readings.`);
  if (population.length === 0) return fail(409, `${system.tag} has no submitted readings that give an airflow to compare with.`);
  const seed = body.seed ?? newSeed();
  const rule = { pct: project.samplePct, minCount: project.sampleMinCount };
  const drawn = drawSample(population, rule, seed);
  const db = await getDb();
  const sampleId = await db.transaction(async (tx) => {
    const [sample] = await tx
      .insert(verificationSamples)
      .values({
        projectId: project.id,
        systemId: system.id,
        seed,
        samplePct: project.samplePct,
        minCount: project.sampleMinCount,
        tolerancePct: project.sampleTolerancePct,
        allowedFailures: project.sampleAllowedFailures,
        population: population.map((p) => ({ kind: p.kind, id: p.id, tag: p.tag })),
        drawnBy: user.id,
      })
      .returning({ id: verificationSamples.id });
    await tx.insert(verificationSampleItems).values(
      drawn.map((c, position) => {
        const p = c as Population;
        return {
          sampleId: sample!.id,
          position,
          kind: p.kind,
          terminalId: p.kind === "section" ? null : p.id,
          sectionId: p.kind === "section" ? p.id : null,
          tag: p.tag,
          technicianFlowM3S: p.technicianFlowM3S,
          technicianReadingId: p.technicianReadingId,
          technicianTraverseId: p.technicianTraverseId,
          technicianConditionsId: p.technicianConditionsId,
        };
      }),
    );
    await recordAudit(
      {
        userId: user.id,
        projectId: project.id,
        action: "sample.drawn",
        entityType: "verification_sample",
        entityId: sample!.id,
        detail: { systemTag: system.tag, seed, rule: { ...rule, tolerancePct: project.sampleTolerancePct, allowedFailures: project.sampleAllowedFailures }, population: population.length, items: drawn.map((c) => c.tag) },
      },
      tx,
    );
    return sample!.id;
  });
  const found = await getSampleInProject({ projectId: project.id, sampleId });
  return ok(201, { sample: sampleResource(found!) });
}

export async function getVerificationSample(project: Project, sampleId: string): Promise<Outcome> {
  const found = isUuid(sampleId) ? await getSampleInProject({ projectId: project.id, sampleId }) : null;
  return found ? ok(200, { sample: sampleResource(found) }) : fail(404, NO_SAMPLE);
}

export async function listVerificationSamples(project: Project, systemId: string | null): Promise<Outcome> {
  if (systemId !== null && !isUuid(systemId)) return fail(400, "The query is not valid: check systemId.", { systemId: `must be the id of an air system; got ${JSON.stringify(systemId)}` });
  const rows = await listSamples({ projectId: project.id, ...(systemId ? { systemId } : {}) });
  const samples = [];
  for (const r of rows) {
    const found = await getSampleInProject({ projectId: project.id, sampleId: r.sample.id });
    if (found) samples.push(sampleResource(found));
  }
  return ok(200, { samples });
}

/** Keeps the sample's outcome columns in step with its items (inside the caller's transaction). */
async function refreshOutcome(tx: Parameters<Parameters<Awaited<ReturnType<typeof getDb>>["transaction"]>[0]>[0], sampleId: string, allowedFailures: number) {
  const items = await tx.select({ agrees: verificationSampleItems.agrees }).from(verificationSampleItems).where(eq(verificationSampleItems.sampleId, sampleId));
  const o = sampleOutcome(items, allowedFailures);
  await tx
    .update(verificationSamples)
    .set({ agreedCount: o.agreed, disagreedCount: o.disagreed, recommendReturn: o.recommendReturn, status: o.notRead === 0 ? "closed" : "open" })
    .where(eq(verificationSamples.id, sampleId));
  return o;
}

/**
 * The agent's own reading of a sampled item. Outlets and terminal units: a capture hood's standard
 * airflow (after its correction factor), or the mean of anemometer velocities at standard air × the
 * effective area. Sections: a spot traverse's standard airflow. Compared with the technician's
 * standard airflow within the sample's tolerance, unless the operating conditions differ: then the
 * reading is kept, the differences are named, and the item is not judged.
 */
export async function recordSampleReading(user: SessionUser, project: Project, sampleId: string, itemId: string, body: SampleReading): Promise<Outcome> {
  const found = isUuid(sampleId) ? await getSampleInProject({ projectId: project.id, sampleId }) : null;
  if (!found) return fail(404, NO_SAMPLE);
  const item = isUuid(itemId) ? found.items.find((i) => i.id === itemId) : undefined;
  if (!item) return fail(404, "No such item in this verification sample.");
  const fields: Record<string, string> = {};
  if (item.kind === "section" && body.method !== "spot_traverse") fields.method = `${item.tag} is a duct section: read it by "spot_traverse"; got "${body.method}"`;
  if (item.kind !== "section" && body.method === "spot_traverse") fields.method = `${item.tag} is ${item.kind === "outlet" ? "an outlet" : "a terminal unit"}: read it by "hood" or "velocity_area"; got "spot_traverse"`;
  let conditions = null;
  if (body.conditionsId) {
    conditions = await getConditions({ id: body.conditionsId });
    if (!conditions || conditions.systemId !== found.sample.systemId) fields.conditionsId = `names no operating conditions recorded for ${found.systemTag}; got ${JSON.stringify(body.conditionsId)}`;
  }
  if (Object.keys(fields).length > 0) return fail(400, `The sample reading is not valid: check ${Object.keys(fields).join(", ")}.`, fields);
  const flow =
    body.method === "velocity_area" ? (body.velocitiesMS!.reduce((a, b) => a + b, 0) / body.velocitiesMS!.length) * body.effectiveAreaM2! : body.standardFlowM3S!;
  const technicianConditions = item.technicianConditionsId ? await getConditions({ id: item.technicianConditionsId }) : null;
  const differences = compareConditions(technicianConditions, conditions, { labels: ["the technician's reading", "the agent's reading"] });
  const comparable = differences.length === 0;
  const compared = item.technicianFlowM3S !== null ? compareFlows(item.technicianFlowM3S, flow, found.sample.tolerancePct) : null;
  const detail =
    body.method === "velocity_area"
      ? { velocitiesMS: body.velocitiesMS, effectiveAreaM2: body.effectiveAreaM2, basis: "standard", notes: body.notes ?? "" }
      : { standardFlowM3S: body.standardFlowM3S, notes: body.notes ?? "" };
  const db = await getDb();
  const outcome = await db.transaction(async (tx) => {
    await tx
      .update(verificationSampleItems)
      .set({
        agentMethod: body.method,
        agentDetail: detail,
        agentFlowM3S: flow,
        agentConditionsId: conditions?.id ?? null,
        conditionsDiffer: differences.map((d) => d.message),
        differencePct: compared?.differencePct ?? null,
        agrees: comparable && compared ? compared.agrees : null,
        ...(body.witnessed !== undefined ? { witnessed: body.witnessed } : {}),
        readBy: user.id,
        readAt: new Date(),
      })
      .where(eq(verificationSampleItems.id, item.id));
    const o = await refreshOutcome(tx, found.sample.id, found.sample.allowedFailures);
    await recordAudit(
      {
        userId: user.id,
        projectId: project.id,
        action: "sample.reading_recorded",
        entityType: "verification_sample_item",
        entityId: item.id,
        detail: {
          sampleId: found.sample.id,
          systemTag: found.systemTag,
          tag: item.tag,
          method: body.method,
          before: item.agentFlowM3S === null ? null : { flowM3S: item.agentFlowM3S, agrees: item.agrees },
          after: { flowM3S: flow, agrees: comparable && compared ? compared.agrees : null, differencePct: compared?.differencePct ?? null },
          technicianFlowM3S: item.technicianFlowM3S,
          conditionsDiffer: differences.map((d) => d.message),
          recommendReturn: o.recommendReturn,
        },
      },
      tx,
    );
    return o;
  });
  const again = await getSampleInProject({ projectId: project.id, sampleId });
  const resource = sampleResource(again!);
  return ok(200, { sample: resource, item: resource.items.find((i) => i.id === item.id), outcome, ...(comparable ? {} : { warnings: differences.map((d) => d.message) }) });
}

/** The agent marks a sampled item as witnessed (present while it was read), or takes the mark back. */
export async function markSampleItemWitnessed(user: SessionUser, project: Project, sampleId: string, itemId: string, witnessed: boolean): Promise<Outcome> {
  const found = isUuid(sampleId) ? await getSampleInProject({ projectId: project.id, sampleId }) : null;
  if (!found) return fail(404, NO_SAMPLE);
  const item = isUuid(itemId) ? found.items.find((i) => i.id === itemId) : undefined;
  if (!item) return fail(404, "No such item in this verification sample.");
  if (item.witnessed !== witnessed) {
    const db = await getDb();
    await db.transaction(async (tx) => {
      await tx.update(verificationSampleItems).set({ witnessed }).where(eq(verificationSampleItems.id, item.id));
      await recordAudit(
        {
          userId: user.id,
          projectId: project.id,
          action: "sample.witnessed",
          entityType: "verification_sample_item",
          entityId: item.id,
          detail: { sampleId, systemTag: found.systemTag, tag: item.tag, before: { witnessed: item.witnessed }, after: { witnessed } },
        },
        tx,
      );
    });
  }
  const again = await getSampleInProject({ projectId: project.id, sampleId });
  return ok(200, { sample: sampleResource(again!) });
}
