import "server-only";
import { and, asc, desc, eq, getTableColumns, inArray, max, sql } from "drizzle-orm";
import { getDb } from "../client";
import {
  airSystems,
  ductSections,
  operatingConditions,
  readings,
  terminalReadings,
  terminals,
  terminalSets,
  traverses,
  users,
  type DuctSection,
  type OperatingConditions,
  type TerminalReading,
  type TerminalSet,
} from "../schema";
import type { StoredTraverse } from "./airflow";
import { isUuid } from "./projects";

/** A stored reading with who took it, its terminal's tag and place, and the current version of the traverse it used. */
export type TerminalReadingRow = TerminalReading & {
  takenByName: string | null;
  terminalTag: string;
  sectionId: string;
  systemId: string;
  /** The version of the referenced traverse now (null: no traverse, or it was deleted). */
  traverseCurrentVersion: number | null;
};

const rowColumns = {
  ...getTableColumns(terminalReadings),
  takenByName: users.name,
  terminalTag: terminals.tag,
  sectionId: terminals.sectionId,
  systemId: ductSections.systemId,
  traverseCurrentVersion: traverses.version,
};

function selectRows(db: Awaited<ReturnType<typeof getDb>>) {
  return db
    .select(rowColumns)
    .from(terminalReadings)
    .innerJoin(terminals, eq(terminals.id, terminalReadings.terminalId))
    .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .leftJoin(users, eq(users.id, terminalReadings.takenBy))
    .leftJoin(traverses, eq(traverses.id, terminalReadings.traverseId));
}

/** The most readings one list answers with (the newest); a longer history says it was cut. */
export const MAX_LISTED_READINGS = 5_000;

/**
 * A project's terminal readings, newest first: all of them, one system's, or one terminal's.
 * Never more than `limit` (MAX_LISTED_READINGS): `truncated` says when older ones were left out.
 */
export async function listTerminalReadings({
  projectId,
  systemId,
  terminalId,
  limit = MAX_LISTED_READINGS,
}: {
  projectId: string;
  systemId?: string;
  terminalId?: string;
  limit?: number;
}): Promise<{ rows: TerminalReadingRow[]; truncated: boolean }> {
  const db = await getDb();
  const rows = await selectRows(db)
    .where(and(eq(airSystems.projectId, projectId), systemId ? eq(ductSections.systemId, systemId) : undefined, terminalId ? eq(terminalReadings.terminalId, terminalId) : undefined))
    .orderBy(desc(terminalReadings.takenAt), desc(terminalReadings.createdAt), desc(terminalReadings.id))
    .limit(limit + 1);
  return { rows: rows.slice(0, limit), truncated: rows.length > limit };
}

export async function getTerminalReading({ id }: { id: string }): Promise<TerminalReadingRow | null> {
  if (!isUuid(id)) return null;
  const db = await getDb();
  const [row] = await selectRows(db).where(eq(terminalReadings.id, id));
  return row ?? null;
}

export type NewTerminalReading = Omit<typeof terminalReadings.$inferInsert, "terminalId" | "setId" | "takenBy">;

/**
 * Stores a reading in the system's open terminal set (draft, or returned for rework), opening a new
 * draft set (the next revision) when none is open; the set's version goes up with every reading, so
 * a later review sees that its content changed. A client-chosen id already stored for the same
 * terminal returns that reading (`existing`: the device retried a create whose answer it never got);
 * the same id on another terminal is a conflict. Nothing is ever overwritten.
 */
export async function recordTerminalReading({
  systemId,
  terminalId,
  takenBy,
  values,
}: {
  systemId: string;
  terminalId: string;
  takenBy: string;
  values: NewTerminalReading;
}): Promise<{ status: "created" | "existing"; row: TerminalReadingRow } | { status: "conflict" }> {
  const db = await getDb();
  const settle = async (id: string) => {
    const row = await getTerminalReading({ id });
    if (!row) throw new Error("terminal reading vanished after insert");
    return row.terminalId === terminalId ? ({ status: "existing", row } as const) : ({ status: "conflict" } as const);
  };
  if (values.id) {
    const [existing] = await db.select({ id: terminalReadings.id }).from(terminalReadings).where(eq(terminalReadings.id, values.id));
    if (existing) return settle(existing.id);
  }
  const insertedId = await db.transaction(async (tx) => {
    // One writer per system at a time, so two readings arriving together find (or open) the same set.
    await tx.select({ id: airSystems.id }).from(airSystems).where(eq(airSystems.id, systemId)).for("update");
    let [open] = await tx
      .select()
      .from(terminalSets)
      .where(and(eq(terminalSets.systemId, systemId), inArray(terminalSets.status, ["draft", "returned"])))
      .limit(1);
    if (!open) {
      const [last] = await tx.select({ revision: max(terminalSets.revision) }).from(terminalSets).where(eq(terminalSets.systemId, systemId));
      [open] = await tx
        .insert(terminalSets)
        .values({ systemId, status: "draft", revision: (last?.revision ?? 0) + 1 })
        .returning();
    }
    const [inserted] = await tx
      .insert(terminalReadings)
      .values({ ...values, terminalId, setId: open!.id, takenBy })
      .onConflictDoNothing({ target: terminalReadings.id })
      .returning({ id: terminalReadings.id });
    if (!inserted) return null;
    await tx
      .update(terminalSets)
      .set({ version: sql`${terminalSets.version} + 1`, updatedAt: new Date() })
      .where(eq(terminalSets.id, open!.id));
    return inserted.id;
  });
  if (!insertedId) return settle(values.id!);
  const row = await getTerminalReading({ id: insertedId });
  if (!row) throw new Error("terminal reading vanished after insert");
  return { status: "created", row };
}

/** The terminal sets of a project (or one system), newest revision first within each system. */
export async function listTerminalSets({ projectId, systemId }: { projectId: string; systemId?: string }): Promise<TerminalSet[]> {
  const db = await getDb();
  const rows = await db
    .select({ set: terminalSets })
    .from(terminalSets)
    .innerJoin(airSystems, eq(airSystems.id, terminalSets.systemId))
    .where(and(eq(airSystems.projectId, projectId), systemId ? eq(terminalSets.systemId, systemId) : undefined))
    .orderBy(asc(airSystems.tag), desc(terminalSets.revision));
  return rows.map((r) => r.set);
}

/**
 * A traverse of this project with its readings (the shape lib/server/airflow-view.ts reduces), its
 * section, and how many terminals that section feeds; null for an unknown id or another project's.
 */
export async function getTraverseWithSection({ projectId, traverseId }: { projectId: string; traverseId: string }): Promise<{ traverse: StoredTraverse; section: DuctSection; terminalsOnSection: number } | null> {
  if (!isUuid(traverseId)) return null;
  const db = await getDb();
  const [row] = await db
    .select({ traverse: traverses, section: ductSections, takenByName: users.name })
    .from(traverses)
    .innerJoin(ductSections, eq(ductSections.id, traverses.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .leftJoin(users, eq(users.id, traverses.takenBy))
    .where(and(eq(traverses.id, traverseId), eq(airSystems.projectId, projectId)));
  if (!row) return null;
  const [points, [count]] = await Promise.all([
    db.select().from(readings).where(eq(readings.traverseId, traverseId)).orderBy(asc(readings.line), asc(readings.point)),
    db.select({ n: sql<number>`count(*)::int` }).from(terminals).where(eq(terminals.sectionId, row.section.id)),
  ]);
  return { traverse: { ...row.traverse, takenByName: row.takenByName, readings: points }, section: row.section, terminalsOnSection: count?.n ?? 0 };
}

/**
 * The traverses a terminal reading may take its airflow from: those of sections that feed exactly
 * one terminal (the terminal's own duct), newest first, with their readings.
 */
export async function listTraversesOfSingleTerminalSections({ projectId }: { projectId: string }): Promise<StoredTraverse[]> {
  const db = await getDb();
  const single = db
    .select({ sectionId: terminals.sectionId })
    .from(terminals)
    .groupBy(terminals.sectionId)
    .having(sql`count(*) = 1`);
  const rows = await db
    .select({ traverse: traverses, takenByName: users.name })
    .from(traverses)
    .innerJoin(ductSections, eq(ductSections.id, traverses.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .leftJoin(users, eq(users.id, traverses.takenBy))
    .where(and(eq(airSystems.projectId, projectId), inArray(traverses.sectionId, single)))
    .orderBy(desc(traverses.createdAt));
  const ids = rows.map((r) => r.traverse.id);
  const points = ids.length === 0 ? [] : await db.select().from(readings).where(inArray(readings.traverseId, ids)).orderBy(asc(readings.line), asc(readings.point));
  const byTraverse = new Map<string, typeof points>();
  for (const p of points) byTraverse.set(p.traverseId, [...(byTraverse.get(p.traverseId) ?? []), p]);
  return rows.map((r) => ({ ...r.traverse, takenByName: r.takenByName, readings: byTraverse.get(r.traverse.id) ?? [] }));
}

/** Operating conditions by id (any system); the caller checks they belong where they are used. */
export async function listConditionsByIds({ ids }: { ids: readonly string[] }): Promise<(OperatingConditions & { recordedByName: string | null })[]> {
  const wanted = [...new Set(ids)].filter(isUuid);
  if (wanted.length === 0) return [];
  const db = await getDb();
  return db
    .select({ ...getTableColumns(operatingConditions), recordedByName: users.name })
    .from(operatingConditions)
    .leftJoin(users, eq(users.id, operatingConditions.recordedBy))
    .where(inArray(operatingConditions.id, wanted));
}
