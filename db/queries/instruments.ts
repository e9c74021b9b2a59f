import "server-only";
import { and, asc, count, desc, eq, inArray, isNull, max, or, sql } from "drizzle-orm";
import { getDb } from "../client";
import { airSystems, ductSections, instruments, projectMembers, terminalReadings, terminals, traverses, type Instrument, type InstrumentKind, type MemberRole } from "../schema";

export type InstrumentValues = Omit<typeof instruments.$inferInsert, "id" | "createdAt" | "updatedAt" | "createdBy" | "retiredAt">;

/** The register, ordered by kind then serial; retired instruments only when asked for. */
export async function listInstruments({ kinds, includeRetired = false }: { kinds?: readonly InstrumentKind[]; includeRetired?: boolean } = {}): Promise<Instrument[]> {
  const db = await getDb();
  const conditions = [
    ...(kinds && kinds.length > 0 ? [inArray(instruments.kind, [...kinds])] : []),
    ...(includeRetired ? [] : [isNull(instruments.retiredAt)]),
  ];
  return db
    .select()
    .from(instruments)
    .where(conditions.length > 0 ? and(...conditions) : undefined)
    .orderBy(asc(instruments.kind), asc(sql`lower(${instruments.serial})`));
}

export async function getInstrument({ id }: { id: string }): Promise<Instrument | null> {
  const db = await getDb();
  const [row] = await db.select().from(instruments).where(eq(instruments.id, id));
  return row ?? null;
}

/** Another instrument of the same kind with this serial (serials compare without case). */
export async function findInstrumentBySerial({ kind, serial, exceptId }: { kind: InstrumentKind; serial: string; exceptId?: string }): Promise<Instrument | null> {
  const db = await getDb();
  const rows = await db
    .select()
    .from(instruments)
    .where(and(eq(instruments.kind, kind), eq(sql`lower(${instruments.serial})`, serial.trim().toLowerCase())));
  return rows.find((r) => r.id !== exceptId) ?? null;
}

/** A unique index refused the row (PostgreSQL 23505), however the driver wraps the error. */
function isUniqueViolation(err: unknown): boolean {
  for (let e: unknown = err, depth = 0; e && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    if ((e as { code?: unknown }).code === "23505") return true;
  }
  return false;
}

/** Adds an instrument; "duplicate" when another of the same kind has this serial (checked by the unique index, so two tablets at once cannot both add it). */
export async function createInstrument({ values, createdBy }: { values: InstrumentValues; createdBy: string }): Promise<Instrument | "duplicate"> {
  const db = await getDb();
  try {
    const [row] = await db.insert(instruments).values({ ...values, createdBy }).returning();
    return row!;
  } catch (err) {
    if (isUniqueViolation(err)) return "duplicate";
    throw err;
  }
}

export async function updateInstrument({ id, values }: { id: string; values: Partial<InstrumentValues> & { retiredAt?: Date | null } }): Promise<Instrument | null | "duplicate"> {
  const db = await getDb();
  try {
    const [row] = await db
      .update(instruments)
      .set({ ...values, updatedAt: new Date() })
      .where(eq(instruments.id, id))
      .returning();
    return row ?? null;
  } catch (err) {
    if (isUniqueViolation(err)) return "duplicate";
    throw err;
  }
}

export interface InstrumentUsage {
  traverses: number;
  terminalReadings: number;
  lastUsedAt: Date | null;
}

/** How often an instrument was used for readings, in any project. */
export async function getInstrumentUsage({ id }: { id: string }): Promise<InstrumentUsage> {
  const db = await getDb();
  const [t] = await db
    .select({ n: count(), last: max(traverses.takenAt) })
    .from(traverses)
    .where(or(eq(traverses.instrumentId, id), eq(traverses.probeInstrumentId, id), eq(traverses.airInstrumentId, id)));
  const [r] = await db.select({ n: count(), last: max(terminalReadings.takenAt) }).from(terminalReadings).where(eq(terminalReadings.instrumentId, id));
  const dates = [t?.last, r?.last].filter((d): d is Date => d instanceof Date);
  return {
    traverses: t?.n ?? 0,
    terminalReadings: r?.n ?? 0,
    lastUsedAt: dates.length > 0 ? new Date(Math.max(...dates.map((d) => d.getTime()))) : null,
  };
}

/**
 * Deletes an instrument that was never used for a reading, in one transaction with the check, so a
 * reading recorded meanwhile cannot lose its instrument. Used ones are retired instead.
 */
export async function deleteUnusedInstrument({ id }: { id: string }): Promise<"deleted" | "used" | "missing"> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [row] = await tx.select({ id: instruments.id }).from(instruments).where(eq(instruments.id, id)).for("update");
    if (!row) return "missing";
    const [t] = await tx
      .select({ n: count() })
      .from(traverses)
      .where(or(eq(traverses.instrumentId, id), eq(traverses.probeInstrumentId, id), eq(traverses.airInstrumentId, id)));
    const [r] = await tx.select({ n: count() }).from(terminalReadings).where(eq(terminalReadings.instrumentId, id));
    if ((t?.n ?? 0) + (r?.n ?? 0) > 0) return "used";
    await tx.delete(instruments).where(eq(instruments.id, id));
    return "deleted";
  });
}

/** The roles a user holds across all projects (each once): the register's keepers are technicians on any project. */
export async function listRolesOfUser({ userId }: { userId: string }): Promise<MemberRole[]> {
  const db = await getDb();
  const rows = await db.selectDistinct({ role: projectMembers.role }).from(projectMembers).where(eq(projectMembers.userId, userId));
  return rows.map((r) => r.role);
}

export interface InstrumentInUse {
  instrument: Instrument;
  lastUsedAt: Date | null;
  uses: number;
}

/** The instruments used for this project's traverses and terminal readings, most recently used first. */
export async function listInstrumentsUsedInProject({ projectId }: { projectId: string }): Promise<InstrumentInUse[]> {
  const db = await getDb();
  const traverseRows = await db
    .select({ a: traverses.instrumentId, b: traverses.probeInstrumentId, c: traverses.airInstrumentId, at: traverses.takenAt })
    .from(traverses)
    .innerJoin(ductSections, eq(ductSections.id, traverses.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(eq(airSystems.projectId, projectId));
  const terminalRows = await db
    .select({ a: terminalReadings.instrumentId, at: terminalReadings.takenAt })
    .from(terminalReadings)
    .innerJoin(terminals, eq(terminals.id, terminalReadings.terminalId))
    .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(eq(airSystems.projectId, projectId));
  const usage = new Map<string, { uses: number; last: Date | null }>();
  const note = (id: string | null, at: Date | null) => {
    if (!id) return;
    const u = usage.get(id) ?? { uses: 0, last: null };
    u.uses += 1;
    if (at && (!u.last || at > u.last)) u.last = at;
    usage.set(id, u);
  };
  for (const r of traverseRows) for (const id of new Set([r.a, r.b, r.c])) note(id, r.at);
  for (const r of terminalRows) note(r.a, r.at);
  if (usage.size === 0) return [];
  const rows = await db.select().from(instruments).where(inArray(instruments.id, [...usage.keys()])).orderBy(desc(instruments.updatedAt));
  return rows
    .map((instrument) => ({ instrument, uses: usage.get(instrument.id)!.uses, lastUsedAt: usage.get(instrument.id)!.last }))
    .sort((x, y) => (y.lastUsedAt?.getTime() ?? 0) - (x.lastUsedAt?.getTime() ?? 0) || x.instrument.kind.localeCompare(y.instrument.kind));
}
