import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { recordAudit } from "@/db/queries/audit";
import { isUuid } from "@/db/queries/projects";
import { getTerminalSetInProject, listLatestTraversesOfSystem, listReadingsOfSet, listTerminalsOfSystem, terminalIdsRead, type TerminalSetInProject } from "@/db/queries/reviews";
import { getTraverseInProject, type TraverseInProject } from "@/db/queries/traverses";
import { airSystems, instruments as instrumentsTable, reviews, terminalSets, traverses, type AirSystem, type Project, type TerminalSet, type Traverse } from "@/db/schema";
import type { SessionUser } from "@/db/queries/users";
import { calibrationProblems } from "@/lib/instruments/usability";
import { traverseSubmissionProblemsOf } from "@/lib/review/submission";
import type { ReviewDecisionBody, SubmitBody, SystemReviewBody } from "@/lib/validation/review";
import type { DbOrTx } from "./mailer";
import { notifyApproved, notifyReturned, notifySubmitted, type ReviewItem } from "./notify";
import { traverseResource, type Outcome } from "./traverses";

const ok = (status: number, body: unknown): Outcome => ({ status, body });
function fail(status: number, message: string, fields?: Record<string, string>, extra?: Record<string, unknown>): Outcome {
  return { status, body: { error: fields && Object.keys(fields).length > 0 ? { message, fields } : { message }, ...extra } };
}

export const NO_TRAVERSE = "No such traverse in this project.";
export const NO_TERMINAL_SET = "No such terminal set in this project.";
export const NO_SYSTEM = "No such air system in this project.";
const SUBMITTABLE: readonly Traverse["status"][] = ["draft", "returned"];
const STATUS_WORDS: Record<Traverse["status"], string> = { draft: "in progress", submitted: "submitted for review", approved: "approved", returned: "returned for correction" };

const traverseLabel = (f: TraverseInProject) => `traverse of ${f.system.tag} / ${f.section.tag} (revision ${f.traverse.revision})`;
const setLabel = (set: TerminalSet, system: AirSystem) => `terminal readings of ${system.tag} (set ${set.revision})`;

// ── What must hold before readings are submitted ───────────────────────────────────────────────────

/**
 * Why a traverse cannot be submitted yet, by field: every point read or marked unreadable, a result
 * the engine accepts, the air at the plane recorded, the operating conditions named, and instruments
 * within calibration (or a stated reason). Empty when it can go.
 */
export async function traverseSubmissionProblems(found: TraverseInProject, project: Project): Promise<Record<string, string>> {
  return traverseSubmissionProblemsOf(await traverseResource(found, project));
}

/**
 * Why a terminal set cannot be submitted yet: at least one reading, every outlet and terminal unit of
 * the system read (in this set or an approved one), each reading's instruments within calibration (or
 * a stated reason) and its operating conditions named.
 */
export async function terminalSetSubmissionProblems(found: TerminalSetInProject): Promise<Record<string, string>> {
  const fields: Record<string, string> = {};
  const rows = await listReadingsOfSet({ setId: found.set.id });
  if (rows.length === 0) {
    fields.readings = `holds no reading: read the outlets and terminal units of ${found.system.tag} first`;
    return fields;
  }
  const [all, read] = await Promise.all([listTerminalsOfSystem({ systemId: found.system.id }), terminalIdsRead({ systemId: found.system.id, setId: found.set.id })]);
  const unread = all.filter((t) => !read.has(t.terminal.id)).map((t) => t.terminal.tag);
  if (unread.length > 0) fields.terminals = `${unread.length} of ${all.length} outlets and terminal units have no reading yet (${unread.slice(0, 8).join(", ")}${unread.length > 8 ? ", …" : ""})`;
  const ids = [...new Set(rows.flatMap((r) => [r.reading.instrumentId, r.reading.airInstrumentId]).filter((x): x is string => !!x))];
  const db = await getDb();
  const register = ids.length === 0 ? [] : await db.select().from(instrumentsTable).where(inArray(instrumentsTable.id, ids));
  const byId = new Map(register.map((i) => [i.id, i]));
  for (const { reading, terminal } of rows) {
    const uses = [reading.instrumentId, reading.airInstrumentId]
      .map((id, n) => ({ field: `readings.${terminal.tag}.${n === 0 ? "instrumentId" : "airInstrumentId"}`, instrument: id ? byId.get(id) : undefined }))
      .filter((u): u is { field: string; instrument: NonNullable<typeof u.instrument> } => !!u.instrument);
    const problems = calibrationProblems(uses, reading.takenAt, reading.overdueReason, `readings.${terminal.tag}.overdueReason`);
    if (problems) Object.assign(fields, problems);
    if (!reading.conditionsId) fields[`readings.${terminal.tag}.conditionsId`] = "is not recorded: name the operating conditions the reading was taken under";
  }
  return fields;
}

function summarize(fields: Record<string, string>, what: string): string {
  const names = Object.keys(fields);
  return `The ${what} cannot be submitted yet: check ${names.slice(0, 3).join(", ")}${names.length > 3 ? ` and ${names.length - 3} more` : ""}.`;
}

// ── Traverses ──────────────────────────────────────────────────────────────────────────────────────

async function findTraverse(project: Project, traverseId: string): Promise<TraverseInProject | null> {
  return isUuid(traverseId) ? getTraverseInProject({ projectId: project.id, traverseId }) : null;
}

async function traverseBody(project: Project, traverseId: string) {
  const found = await getTraverseInProject({ projectId: project.id, traverseId });
  return found ? { traverse: await traverseResource(found, project, undefined, { history: true }) } : null;
}

/** A technician submits a draft or returned traverse for review, after the submission checks. */
export async function submitTraverse(user: SessionUser, project: Project, traverseId: string, body: SubmitBody): Promise<Outcome> {
  const found = await findTraverse(project, traverseId);
  if (!found) return fail(404, NO_TRAVERSE);
  const t = found.traverse;
  if (!SUBMITTABLE.includes(t.status))
    return fail(409, `Traverse ${found.section.tag} revision ${t.revision} is ${STATUS_WORDS[t.status]}; only a traverse in progress or returned for correction can be submitted.`, undefined, { status: t.status });
  const problems = await traverseSubmissionProblems(found, project);
  if (Object.keys(problems).length > 0) return fail(400, summarize(problems, `traverse of ${found.section.tag}`), problems);
  const db = await getDb();
  const done = await db.transaction(async (tx) => {
    const [row] = await tx
      .update(traverses)
      .set({ status: "submitted", submittedAt: new Date(), updatedAt: new Date(), ...(body.notes ? { notes: body.notes } : {}) })
      .where(and(eq(traverses.id, t.id), eq(traverses.version, t.version), inArray(traverses.status, ["draft", "returned"])))
      .returning();
    if (!row) return false;
    await recordAudit(
      {
        userId: user.id,
        projectId: project.id,
        action: t.status === "returned" ? "traverse.resubmitted" : "traverse.submitted",
        entityType: "traverse",
        entityId: t.id,
        detail: { systemTag: found.system.tag, sectionTag: found.section.tag, revision: t.revision, version: t.version, before: { status: t.status }, after: { status: "submitted" }, ...(body.notes ? { notes: body.notes } : {}) },
      },
      tx,
    );
    await notifySubmitted({ projectId: project.id, item: { type: "traverse", id: t.id, label: traverseLabel(found) }, by: user, tx });
    return true;
  });
  if (!done) return fail(409, "The traverse changed while it was being submitted (another save or submission came first); nothing was submitted. Reload and try again.");
  return ok(200, await traverseBody(project, t.id));
}

interface Decision {
  decision: "approve" | "return";
  comment?: string;
  witnessed?: boolean;
}

/** Applies one decision to a submitted traverse inside `tx`; false when it is no longer submitted. */
async function decideTraverse(tx: DbOrTx, user: SessionUser, project: Project, found: TraverseInProject, d: Decision, systemWide: boolean): Promise<boolean> {
  const t = found.traverse;
  const status = d.decision === "approve" ? "approved" : "returned";
  const [row] = await tx
    .update(traverses)
    .set({ status, updatedAt: new Date() })
    .where(and(eq(traverses.id, t.id), eq(traverses.status, "submitted")))
    .returning({ version: traverses.version });
  if (!row) return false;
  const comment = d.comment?.trim() ?? "";
  await tx.insert(reviews).values({ traverseId: t.id, reviewerId: user.id, decision: status, reason: comment, witnessed: d.witnessed ?? false, traverseVersion: row.version, systemWide });
  await recordAudit(
    {
      userId: user.id,
      projectId: project.id,
      action: `traverse.${status}`,
      entityType: "traverse",
      entityId: t.id,
      detail: { systemTag: found.system.tag, sectionTag: found.section.tag, revision: t.revision, version: row.version, before: { status: "submitted" }, after: { status }, comment, witnessed: d.witnessed ?? false, systemWide },
    },
    tx,
  );
  const item: ReviewItem = { type: "traverse", id: t.id, label: traverseLabel(found) };
  if (status === "approved") await notifyApproved({ projectId: project.id, item, by: user, tx });
  else if (t.takenBy) await notifyReturned({ projectId: project.id, item, technicianUserId: t.takenBy, by: user, comment, tx });
  return true;
}

/** The commissioning agent approves or returns a submitted traverse. */
export async function reviewTraverse(user: SessionUser, project: Project, traverseId: string, body: ReviewDecisionBody): Promise<Outcome> {
  const found = await findTraverse(project, traverseId);
  if (!found) return fail(404, NO_TRAVERSE);
  if (found.traverse.status !== "submitted")
    return fail(409, `Traverse ${found.section.tag} revision ${found.traverse.revision} is ${STATUS_WORDS[found.traverse.status]}; only a submitted traverse can be approved or returned.`, undefined, { status: found.traverse.status });
  const db = await getDb();
  const done = await db.transaction((tx) => decideTraverse(tx, user, project, found, body, false));
  if (!done) return fail(409, "Someone decided on this traverse first; nothing was changed. Reload the queue.");
  return ok(200, await traverseBody(project, found.traverse.id));
}

// ── Terminal sets ──────────────────────────────────────────────────────────────────────────────────

/** A terminal set as the API returns it. */
export async function terminalSetResource(found: TerminalSetInProject) {
  const rows = await listReadingsOfSet({ setId: found.set.id });
  return {
    id: found.set.id,
    systemId: found.system.id,
    systemTag: found.system.tag,
    status: found.set.status,
    version: found.set.version,
    revision: found.set.revision,
    notes: found.set.notes,
    submittedBy: found.set.submittedBy,
    submittedByName: found.submittedByName,
    submittedAt: found.set.submittedAt,
    readingCount: rows.length,
    terminalCount: new Set(rows.map((r) => r.terminal.id)).size,
    createdAt: found.set.createdAt,
    updatedAt: found.set.updatedAt,
  };
}

async function setBody(project: Project, setId: string) {
  const found = await getTerminalSetInProject({ projectId: project.id, setId });
  return found ? { terminalSet: await terminalSetResource(found) } : null;
}

async function findSet(project: Project, setId: string) {
  return isUuid(setId) ? getTerminalSetInProject({ projectId: project.id, setId }) : null;
}

/** A technician submits a system's open terminal set for review, after the submission checks. */
export async function submitTerminalSet(user: SessionUser, project: Project, setId: string, body: SubmitBody): Promise<Outcome> {
  const found = await findSet(project, setId);
  if (!found) return fail(404, NO_TERMINAL_SET);
  const set = found.set;
  if (!SUBMITTABLE.includes(set.status))
    return fail(409, `The terminal readings of ${found.system.tag} (set ${set.revision}) are ${STATUS_WORDS[set.status]}; only a set in progress or returned for correction can be submitted.`, undefined, { status: set.status });
  const problems = await terminalSetSubmissionProblems(found);
  if (Object.keys(problems).length > 0) return fail(400, summarize(problems, `terminal readings of ${found.system.tag}`), problems);
  const db = await getDb();
  const done = await db.transaction(async (tx) => {
    const [row] = await tx
      .update(terminalSets)
      .set({ status: "submitted", submittedBy: user.id, submittedAt: new Date(), updatedAt: new Date(), ...(body.notes ? { notes: body.notes } : {}) })
      .where(and(eq(terminalSets.id, set.id), eq(terminalSets.version, set.version), inArray(terminalSets.status, ["draft", "returned"])))
      .returning();
    if (!row) return false;
    await recordAudit(
      {
        userId: user.id,
        projectId: project.id,
        action: set.status === "returned" ? "terminal_set.resubmitted" : "terminal_set.submitted",
        entityType: "terminal_set",
        entityId: set.id,
        detail: { systemTag: found.system.tag, revision: set.revision, version: set.version, before: { status: set.status }, after: { status: "submitted" }, ...(body.notes ? { notes: body.notes } : {}) },
      },
      tx,
    );
    await notifySubmitted({ projectId: project.id, item: { type: "terminal_set", id: set.id, label: setLabel(set, found.system) }, by: user, tx });
    return true;
  });
  if (!done) return fail(409, "A reading joined the set while it was being submitted; nothing was submitted. Reload and try again.");
  return ok(200, await setBody(project, set.id));
}

async function decideSet(tx: DbOrTx, user: SessionUser, project: Project, found: TerminalSetInProject, d: Decision, systemWide: boolean): Promise<boolean> {
  const set = found.set;
  const status = d.decision === "approve" ? "approved" : "returned";
  const [row] = await tx
    .update(terminalSets)
    .set({ status, updatedAt: new Date() })
    .where(and(eq(terminalSets.id, set.id), eq(terminalSets.status, "submitted")))
    .returning({ version: terminalSets.version });
  if (!row) return false;
  const comment = d.comment?.trim() ?? "";
  await tx.insert(reviews).values({ terminalSetId: set.id, reviewerId: user.id, decision: status, reason: comment, witnessed: d.witnessed ?? false, traverseVersion: row.version, systemWide });
  await recordAudit(
    {
      userId: user.id,
      projectId: project.id,
      action: `terminal_set.${status}`,
      entityType: "terminal_set",
      entityId: set.id,
      detail: { systemTag: found.system.tag, revision: set.revision, version: row.version, before: { status: "submitted" }, after: { status }, comment, witnessed: d.witnessed ?? false, systemWide },
    },
    tx,
  );
  const item: ReviewItem = { type: "terminal_set", id: set.id, label: setLabel(set, found.system) };
  if (status === "approved") await notifyApproved({ projectId: project.id, item, by: user, tx });
  else if (set.submittedBy) await notifyReturned({ projectId: project.id, item, technicianUserId: set.submittedBy, by: user, comment, tx });
  return true;
}

/** The commissioning agent approves or returns a submitted terminal set. */
export async function reviewTerminalSet(user: SessionUser, project: Project, setId: string, body: ReviewDecisionBody): Promise<Outcome> {
  const found = await findSet(project, setId);
  if (!found) return fail(404, NO_TERMINAL_SET);
  if (found.set.status !== "submitted")
    return fail(409, `The terminal readings of ${found.system.tag} (set ${found.set.revision}) are ${STATUS_WORDS[found.set.status]}; only a submitted set can be approved or returned.`, undefined, { status: found.set.status });
  const db = await getDb();
  const done = await db.transaction((tx) => decideSet(tx, user, project, found, body, false));
  if (!done) return fail(409, "Someone decided on these terminal readings first; nothing was changed. Reload the queue.");
  return ok(200, await setBody(project, found.set.id));
}

// ── A whole system at once ─────────────────────────────────────────────────────────────────────────

/**
 * One decision for every submitted item of a system (each section's current traverse that is
 * submitted, and its submitted terminal set), in one transaction: all of them or none.
 */
export async function reviewSystem(user: SessionUser, project: Project, systemId: string, body: SystemReviewBody): Promise<Outcome> {
  if (!isUuid(systemId)) return fail(404, NO_SYSTEM);
  const db = await getDb();
  const [system] = await db.select().from(airSystems).where(and(eq(airSystems.id, systemId), eq(airSystems.projectId, project.id)));
  if (!system) return fail(404, NO_SYSTEM);
  const latest = await listLatestTraversesOfSystem({ systemId });
  const submittedTraverses = latest.filter((r) => r.traverse.status === "submitted");
  const sets = await db.select().from(terminalSets).where(and(eq(terminalSets.systemId, systemId), eq(terminalSets.status, "submitted")));
  if (submittedTraverses.length === 0 && sets.length === 0) return fail(409, `${system.tag} has nothing submitted for review; nothing was changed.`);
  const outcome = await db
    .transaction(async (tx) => {
      for (const r of submittedTraverses) {
        const found: TraverseInProject = { traverse: r.traverse, section: r.section, system, takenByName: null };
        if (!(await decideTraverse(tx, user, project, found, body, true))) throw new Conflict();
      }
      for (const set of sets) if (!(await decideSet(tx, user, project, { set, system, submittedByName: null }, body, true))) throw new Conflict();
      await recordAudit(
        {
          userId: user.id,
          projectId: project.id,
          action: body.decision === "approve" ? "system.approved" : "system.returned",
          entityType: "air_system",
          entityId: system.id,
          detail: { systemTag: system.tag, comment: body.comment?.trim() ?? "", traverses: submittedTraverses.map((r) => r.section.tag), terminalSets: sets.map((s) => s.revision) },
        },
        tx,
      );
      return true;
    })
    .catch((err) => {
      if (err instanceof Conflict) return false;
      throw err;
    });
  if (!outcome) return fail(409, `Something in ${system.tag} was decided or changed meanwhile; nothing was changed. Reload the queue.`);
  return ok(200, {
    system: { id: system.id, tag: system.tag },
    decision: body.decision,
    traverses: submittedTraverses.map((r) => ({ id: r.traverse.id, sectionTag: r.section.tag, revision: r.traverse.revision, status: body.decision === "approve" ? "approved" : "returned" })),
    terminalSets: sets.map((s) => ({ id: s.id, revision: s.revision, status: body.decision === "approve" ? "approved" : "returned" })),
  });
}

class Conflict extends Error {}

/** Whether a system's readings are locked for new terminal readings: its newest set is submitted. */
export async function submittedSetOfSystem(systemId: string): Promise<TerminalSet | null> {
  const db = await getDb();
  const [row] = await db
    .select()
    .from(terminalSets)
    .where(and(eq(terminalSets.systemId, systemId), eq(terminalSets.status, "submitted")))
    .orderBy(sql`${terminalSets.revision} desc`)
    .limit(1);
  return row ?? null;
}
