import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "../client";
import { airSystems, ductSections, reviews, terminalReadings, terminals, terminalSets, traverses, users, type AirSystem, type Review, type TerminalSet } from "../schema";

export interface ReviewRow extends Review {
  reviewerName: string | null;
  reviewerEmail: string | null;
}

/** Every decision on these traverses or terminal sets, newest first. */
export async function listReviewsOf({ traverseIds = [], terminalSetIds = [] }: { traverseIds?: readonly string[]; terminalSetIds?: readonly string[] }): Promise<ReviewRow[]> {
  if (traverseIds.length === 0 && terminalSetIds.length === 0) return [];
  const db = await getDb();
  const conditions = [];
  if (traverseIds.length > 0) conditions.push(inArray(reviews.traverseId, [...traverseIds]));
  if (terminalSetIds.length > 0) conditions.push(inArray(reviews.terminalSetId, [...terminalSetIds]));
  return db
    .select({ ...reviewColumns(), reviewerName: users.name, reviewerEmail: users.email })
    .from(reviews)
    .leftJoin(users, eq(users.id, reviews.reviewerId))
    .where(conditions.length === 1 ? conditions[0] : sql`(${conditions[0]} or ${conditions[1]})`)
    .orderBy(desc(reviews.createdAt));
}

function reviewColumns() {
  return {
    id: reviews.id,
    traverseId: reviews.traverseId,
    terminalSetId: reviews.terminalSetId,
    reviewerId: reviews.reviewerId,
    decision: reviews.decision,
    reason: reviews.reason,
    witnessed: reviews.witnessed,
    traverseVersion: reviews.traverseVersion,
    systemWide: reviews.systemWide,
    createdAt: reviews.createdAt,
  };
}

export interface TerminalSetInProject {
  set: TerminalSet;
  system: AirSystem;
  submittedByName: string | null;
}

/** A terminal set of this project with its system; another project's set answers like an unknown one. */
export async function getTerminalSetInProject({ projectId, setId }: { projectId: string; setId: string }): Promise<TerminalSetInProject | null> {
  const db = await getDb();
  const [row] = await db
    .select({ set: terminalSets, system: airSystems, submittedByName: users.name })
    .from(terminalSets)
    .innerJoin(airSystems, eq(airSystems.id, terminalSets.systemId))
    .leftJoin(users, eq(users.id, terminalSets.submittedBy))
    .where(and(eq(terminalSets.id, setId), eq(airSystems.projectId, projectId)));
  return row ?? null;
}

/** The newest terminal set of a system (its current one), or null when none was opened. */
export async function getLatestTerminalSet({ systemId }: { systemId: string }): Promise<TerminalSet | null> {
  const db = await getDb();
  const [row] = await db.select().from(terminalSets).where(eq(terminalSets.systemId, systemId)).orderBy(desc(terminalSets.revision)).limit(1);
  return row ?? null;
}

/** The readings of a terminal set with their terminals, oldest first. */
export async function listReadingsOfSet({ setId }: { setId: string }) {
  const db = await getDb();
  return db
    .select({ reading: terminalReadings, terminal: terminals, takenByName: users.name })
    .from(terminalReadings)
    .innerJoin(terminals, eq(terminals.id, terminalReadings.terminalId))
    .leftJoin(users, eq(users.id, terminalReadings.takenBy))
    .where(eq(terminalReadings.setId, setId))
    .orderBy(asc(terminalReadings.takenAt));
}

/** The terminals of a system (through its sections). */
export async function listTerminalsOfSystem({ systemId }: { systemId: string }) {
  const db = await getDb();
  return db
    .select({ terminal: terminals, section: ductSections })
    .from(terminals)
    .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
    .where(eq(ductSections.systemId, systemId))
    .orderBy(asc(terminals.tag));
}

/** Terminal ids of a system that have at least one reading in an approved set or in the given set. */
export async function terminalIdsRead({ systemId, setId }: { systemId: string; setId: string }): Promise<Set<string>> {
  const db = await getDb();
  const rows = await db
    .selectDistinct({ id: terminalReadings.terminalId })
    .from(terminalReadings)
    .innerJoin(terminalSets, eq(terminalSets.id, terminalReadings.setId))
    .where(and(eq(terminalSets.systemId, systemId), sql`(${terminalSets.id} = ${setId} or ${terminalSets.status} = 'approved')`));
  return new Set(rows.map((r) => r.id));
}

/** Each section's newest traverse of one system (the current one; earlier revisions are history). */
export async function listLatestTraversesOfSystem({ systemId }: { systemId: string }) {
  const db = await getDb();
  return db
    .selectDistinctOn([traverses.sectionId], { traverse: traverses, section: ductSections })
    .from(traverses)
    .innerJoin(ductSections, eq(ductSections.id, traverses.sectionId))
    .where(eq(ductSections.systemId, systemId))
    .orderBy(traverses.sectionId, desc(traverses.revision), desc(traverses.createdAt));
}
