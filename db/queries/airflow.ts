import "server-only";
import { asc, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "../client";
import { airSystems, ductSections, readings, terminals, traverses, users } from "../schema";

/** The design side of a project: systems, their duct trees and terminals, in stable order. */
export async function getProjectDesign({ projectId }: { projectId: string }) {
  const db = await getDb();
  const systems = await db.select().from(airSystems).where(eq(airSystems.projectId, projectId)).orderBy(asc(airSystems.tag));
  const systemIds = systems.map((s) => s.id);
  if (systemIds.length === 0) return { systems, sections: [], terminals: [] };
  const sections = await db.select().from(ductSections).where(inArray(ductSections.systemId, systemIds)).orderBy(asc(ductSections.tag));
  const sectionIds = sections.map((s) => s.id);
  const terminalRows =
    sectionIds.length === 0 ? [] : await db.select().from(terminals).where(inArray(terminals.sectionId, sectionIds)).orderBy(asc(terminals.tag));
  return { systems, sections, terminals: terminalRows };
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
