import "server-only";
import { and, asc, desc, eq, getTableColumns, inArray, sql } from "drizzle-orm";
import { cachedRead, getDb, type Frozen } from "../client";
import { airSystems, ductSections, readings, traverses, users, type AirSystem, type DuctSection, type Reading, type Traverse } from "../schema";

export interface TraverseInProject {
  traverse: Traverse;
  section: DuctSection;
  system: AirSystem;
  takenByName: string | null;
}

/** A traverse's columns but the two every save changes: its version and its update time. */
export type TraverseSettings = Omit<Traverse, "version" | "updatedAt">;

export interface TraverseToEdit extends Omit<TraverseInProject, "traverse"> {
  traverse: TraverseSettings;
}

function settingsOnly(): Omit<ReturnType<typeof getTableColumns<typeof traverses>>, "version" | "updatedAt"> {
  const { version, updatedAt, ...columns } = getTableColumns(traverses);
  void version;
  void updatedAt;
  return columns;
}
const SETTINGS_COLUMNS = settingsOnly();

/** The traverse (these of its columns) with its section, system and who took it, if it is in the project. */
async function traverseWithPlace<C extends typeof traverses | typeof SETTINGS_COLUMNS>(columns: C, { projectId, traverseId }: { projectId: string; traverseId: string }) {
  const db = await getDb();
  const [row] = await db
    .select({ traverse: columns, section: ductSections, system: airSystems, takenByName: users.name })
    .from(traverses)
    .innerJoin(ductSections, eq(ductSections.id, traverses.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .leftJoin(users, eq(users.id, traverses.takenBy))
    .where(and(eq(traverses.id, traverseId), eq(airSystems.projectId, projectId)));
  return row ?? null;
}

/** A traverse of this project with its section and system, or null: another project's traverse answers like an unknown one. */
export async function getTraverseInProject(q: { projectId: string; traverseId: string }): Promise<TraverseInProject | null> {
  return traverseWithPlace(traverses, q);
}

/**
 * getTraverseInProject without the traverse's version and update time, remembered between calls: the
 * read cache keeps it while nothing it selects is written, and a readings save writes only those two
 * columns (and the settings it changes). A save judges by it and learns the version from its own
 * guarded UPDATE, so a tablet's stream of saves does not read the traverse, section and system again
 * each time.
 */
export async function getTraverseToEdit(q: { projectId: string; traverseId: string }): Promise<Frozen<TraverseToEdit> | null> {
  return cachedRead(`traverse-to-edit:${q.projectId}:${q.traverseId}`, () => traverseWithPlace(SETTINGS_COLUMNS, q));
}

/** A traverse by id in any project (to recognise a client id already used). */
export async function getTraverseById({ traverseId }: { traverseId: string }): Promise<Traverse | null> {
  const db = await getDb();
  const [row] = await db.select().from(traverses).where(eq(traverses.id, traverseId));
  return row ?? null;
}

export async function listReadingsOfTraverse({ traverseId }: { traverseId: string }): Promise<Reading[]> {
  const db = await getDb();
  return db.select().from(readings).where(eq(readings.traverseId, traverseId)).orderBy(asc(readings.line), asc(readings.point));
}

export interface RevisionRow {
  id: string;
  revision: number;
  status: Traverse["status"];
  method: Traverse["method"];
  createdAt: Date;
  takenAt: Date | null;
  takenByName: string | null;
  readCount: number;
}

/** Every traverse of a section, latest revision first: the history a re-traverse keeps. */
export async function listRevisionsOfSection({ sectionId }: { sectionId: string }): Promise<RevisionRow[]> {
  const db = await getDb();
  return db
    .select({
      id: traverses.id,
      revision: traverses.revision,
      status: traverses.status,
      method: traverses.method,
      createdAt: traverses.createdAt,
      takenAt: traverses.takenAt,
      takenByName: users.name,
      readCount: sql<number>`(select count(*)::int from ${readings} where ${readings.traverseId} = ${traverses.id} and ${readings.value} is not null)`,
    })
    .from(traverses)
    .leftJoin(users, eq(users.id, traverses.takenBy))
    .where(eq(traverses.sectionId, sectionId))
    .orderBy(desc(traverses.revision));
}

export type NewTraverse = Omit<typeof traverses.$inferInsert, "revision" | "version" | "status">;

/**
 * Starts a traverse on a section as its next revision (1 for the first); the earlier ones stay as
 * history. Two starts at once cannot take the same revision (unique index): the loser takes the next.
 */
export async function insertTraverseRevision(values: NewTraverse): Promise<Traverse> {
  const db = await getDb();
  for (let attempt = 0; ; attempt++) {
    try {
      return await db.transaction(async (tx) => {
        const [{ next } = { next: 1 }] = await tx
          .select({ next: sql<number>`coalesce(max(${traverses.revision}), 0)::int + 1` })
          .from(traverses)
          .where(eq(traverses.sectionId, values.sectionId));
        const [row] = await tx.insert(traverses).values({ ...values, revision: next, status: "draft", version: 1 }).returning();
        return row!;
      });
    } catch (err) {
      const code = (err as { cause?: { code?: string }; code?: string }).cause?.code ?? (err as { code?: string }).code;
      if (code !== "23505" || attempt >= 3) throw err;
      // A client id already used is the caller's to recognise; only a revision race is retried here.
      if (values.id && (await getTraverseById({ traverseId: values.id }))) throw err;
    }
  }
}

/** One point as stored: 1-based line and point; a value, or unreadable with no value. */
export interface PointValue {
  line: number;
  point: number;
  value: number | null;
  unreadable: boolean;
}

export interface ReadingChange {
  line: number;
  point: number;
  before: { value: number | null; unreadable: boolean } | null;
  after: { value: number | null; unreadable: boolean } | null;
}

/** The statuses in which a traverse's readings and settings may change. */
export const EDITABLE_STATUSES: readonly Traverse["status"][] = ["draft", "returned"];

/**
 * Saves a traverse's readings (and any other columns given) if its version is still `version` and it
 * is still open for readings (a draft or returned): the version goes up by one, points whose value
 * changed get a new row time, points no longer in the grid are removed, unchanged ones keep their
 * time. One transaction: all of it or nothing. Returns "stale" without changing anything when someone
 * else saved first or the traverse was submitted meanwhile.
 */
export async function saveTraverseReadings({
  traverseId,
  version,
  points,
  values,
}: {
  traverseId: string;
  version: number;
  /** Every point that has a value or is unreadable; points absent are not read. Null: leave the readings as they are. */
  points: PointValue[] | null;
  values: Partial<typeof traverses.$inferInsert>;
}): Promise<{ status: "saved"; traverse: Traverse; changes: ReadingChange[]; rows: Reading[] | null } | { status: "stale" }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [updated] = await tx
      .update(traverses)
      .set({ ...values, version: sql`${traverses.version} + 1`, updatedAt: new Date() })
      // Only a traverse still open for readings: one submitted since the caller looked is not changed.
      .where(and(eq(traverses.id, traverseId), eq(traverses.version, version), inArray(traverses.status, EDITABLE_STATUSES)))
      .returning();
    if (!updated) return { status: "stale" as const };
    const changes: ReadingChange[] = [];
    // The readings as they stand after the save, so the answer needs no second read of them.
    let rows: Reading[] | null = null;
    if (points) {
      const existing = await tx.select().from(readings).where(eq(readings.traverseId, traverseId));
      const key = (line: number, point: number) => `${line}:${point}`;
      const before = new Map(existing.map((r) => [key(r.line, r.point), r]));
      const now = new Date();
      const upserts: (typeof readings.$inferInsert)[] = [];
      for (const p of points) {
        const old = before.get(key(p.line, p.point));
        before.delete(key(p.line, p.point));
        if (old && old.value === p.value && old.unreadable === p.unreadable) continue;
        upserts.push({ traverseId, line: p.line, point: p.point, value: p.value, unreadable: p.unreadable, recordedAt: now });
        changes.push({ line: p.line, point: p.point, before: old ? { value: old.value, unreadable: old.unreadable } : null, after: { value: p.value, unreadable: p.unreadable } });
      }
      for (const gone of before.values()) {
        await tx.delete(readings).where(eq(readings.id, gone.id));
        changes.push({ line: gone.line, point: gone.point, before: { value: gone.value, unreadable: gone.unreadable }, after: null });
      }
      const kept = new Map(existing.filter((r) => !before.has(key(r.line, r.point))).map((r) => [key(r.line, r.point), r]));
      if (upserts.length > 0) {
        const written = await tx
          .insert(readings)
          .values(upserts)
          .onConflictDoUpdate({
            target: [readings.traverseId, readings.line, readings.point],
            set: { value: sql`excluded.value`, unreadable: sql`excluded.unreadable`, recordedAt: sql`excluded.recorded_at` },
          })
          .returning();
        for (const r of written) kept.set(key(r.line, r.point), r);
      }
      rows = [...kept.values()].sort((a, b) => a.line - b.line || a.point - b.point);
    }
    return { status: "saved" as const, traverse: updated, changes, rows };
  });
}
