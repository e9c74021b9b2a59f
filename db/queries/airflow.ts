import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { cachedRead, getDb } from "../client";
import { airSystems, ductSections, readings, reviews, terminals, traverses, users } from "../schema";

/** The design side of a project: systems, their duct trees and terminals, in stable order. */
export async function getProjectDesign({ projectId }: { projectId: string }) {
  return cachedRead(`design:${projectId}`, () => loadProjectDesign(projectId));
}

async function loadProjectDesign(projectId: string) {
  const db = await getDb();
  // Three independent queries keyed by the project, issued together: no round trip waits on another.
  const [systems, sectionRows, terminalRows] = await Promise.all([
    db.select().from(airSystems).where(eq(airSystems.projectId, projectId)).orderBy(asc(airSystems.tag)),
    db
      .select({ section: ductSections })
      .from(ductSections)
      .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
      .where(eq(airSystems.projectId, projectId))
      .orderBy(asc(ductSections.tag)),
    db
      .select({ terminal: terminals })
      .from(terminals)
      .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
      .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
      .where(eq(airSystems.projectId, projectId))
      .orderBy(asc(terminals.tag)),
  ]);
  return { systems, sections: sectionRows.map((r) => r.section), terminals: terminalRows.map((r) => r.terminal) };
}

/** Every traverse in the project with its readings and who took it, newest first. */
export async function listTraversesForProject({ projectId }: { projectId: string }) {
  const db = await getDb();
  const rows = await db
    .select({ traverse: traverses, takenByName: users.name })
    .from(traverses)
    .innerJoin(ductSections, eq(ductSections.id, traverses.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .leftJoin(users, eq(users.id, traverses.takenBy))
    .where(eq(airSystems.projectId, projectId))
    .orderBy(desc(traverses.createdAt));
  const ids = rows.map((r) => r.traverse.id);
  const points =
    ids.length === 0
      ? []
      : await db.select().from(readings).where(inArray(readings.traverseId, ids)).orderBy(asc(readings.line), asc(readings.point));
  const byTraverse = new Map<string, typeof points>();
  for (const p of points) {
    const list = byTraverse.get(p.traverseId) ?? [];
    list.push(p);
    byTraverse.set(p.traverseId, list);
  }
  return rows.map((r) => ({ ...r.traverse, takenByName: r.takenByName, readings: byTraverse.get(r.traverse.id) ?? [] }));
}

export type StoredTraverse = Awaited<ReturnType<typeof listTraversesForProject>>[number];
export type ProjectDesign = Awaited<ReturnType<typeof getProjectDesign>>;

/** The newest approval of each given traverse, with who gave it and when (for the owner's dashboard and the report). */
export async function listTraverseApprovals({ traverseIds }: { traverseIds: readonly string[] }) {
  if (traverseIds.length === 0) return new Map<string, { reviewerName: string | null; at: Date }>();
  const db = await getDb();
  const rows = await db
    .select({ traverseId: reviews.traverseId, reviewerName: users.name, at: reviews.createdAt })
    .from(reviews)
    .leftJoin(users, eq(users.id, reviews.reviewerId))
    .where(and(inArray(reviews.traverseId, [...traverseIds]), eq(reviews.decision, "approved")))
    .orderBy(desc(reviews.createdAt));
  const out = new Map<string, { reviewerName: string | null; at: Date }>();
  for (const r of rows) if (r.traverseId !== null && !out.has(r.traverseId)) out.set(r.traverseId, { reviewerName: r.reviewerName, at: r.at });
  return out;
}
