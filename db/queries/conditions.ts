import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "../client";
import { airSystems, operatingConditions, users, type AirSystem, type OperatingConditions } from "../schema";

/** An air system of this project, or null: another project's system answers exactly like an unknown one. */
export async function getSystemInProject({ projectId, systemId }: { projectId: string; systemId: string }): Promise<AirSystem | null> {
  const db = await getDb();
  const [row] = await db
    .select()
    .from(airSystems)
    .where(and(eq(airSystems.id, systemId), eq(airSystems.projectId, projectId)));
  return row ?? null;
}

export type ConditionsRow = OperatingConditions & { recordedByName: string | null };

const columns = {
  id: operatingConditions.id,
  systemId: operatingConditions.systemId,
  fanSpeedRpm: operatingConditions.fanSpeedRpm,
  vfdHz: operatingConditions.vfdHz,
  boxes: operatingConditions.boxes,
  outsideAirDamperPct: operatingConditions.outsideAirDamperPct,
  ductStaticSetpointPa: operatingConditions.ductStaticSetpointPa,
  filterState: operatingConditions.filterState,
  notes: operatingConditions.notes,
  recordedBy: operatingConditions.recordedBy,
  recordedAt: operatingConditions.recordedAt,
  recordedByName: users.name,
};

/** A system's recorded conditions, newest first (at most `limit`). */
export async function listConditionsForSystem({ systemId, limit = 50 }: { systemId: string; limit?: number }): Promise<ConditionsRow[]> {
  const db = await getDb();
  return db
    .select(columns)
    .from(operatingConditions)
    .leftJoin(users, eq(users.id, operatingConditions.recordedBy))
    .where(eq(operatingConditions.systemId, systemId))
    .orderBy(desc(operatingConditions.recordedAt), desc(operatingConditions.id))
    .limit(limit);
}

/** The newest conditions of each system (systems without any are absent from the map). */
export async function latestConditionsBySystem({ systemIds }: { systemIds: readonly string[] }): Promise<Map<string, ConditionsRow>> {
  const out = new Map<string, ConditionsRow>();
  if (systemIds.length === 0) return out;
  const db = await getDb();
  const rows = await db
    .selectDistinctOn([operatingConditions.systemId], columns)
    .from(operatingConditions)
    .leftJoin(users, eq(users.id, operatingConditions.recordedBy))
    .where(inArray(operatingConditions.systemId, [...systemIds]))
    .orderBy(operatingConditions.systemId, desc(operatingConditions.recordedAt), desc(operatingConditions.id));
  for (const r of rows) out.set(r.systemId, r);
  return out;
}

export async function getConditions({ id }: { id: string }): Promise<ConditionsRow | null> {
  const db = await getDb();
  const [row] = await db.select(columns).from(operatingConditions).leftJoin(users, eq(users.id, operatingConditions.recordedBy)).where(eq(operatingConditions.id, id));
  return row ?? null;
}

export type NewConditions = Omit<typeof operatingConditions.$inferInsert, "systemId" | "recordedBy">;

/**
 * Records conditions. A client-chosen id that is already stored for the same system returns that row
 * (`created: false`): the device retried a create whose answer it never got. The same id on another
 * system is a conflict.
 */
export async function recordConditions({
  systemId,
  values,
  recordedBy,
}: {
  systemId: string;
  values: NewConditions;
  recordedBy: string;
}): Promise<{ status: "created" | "existing"; row: ConditionsRow } | { status: "conflict" }> {
  const db = await getDb();
  if (values.id) {
    const existing = await getConditions({ id: values.id });
    if (existing) return existing.systemId === systemId ? { status: "existing", row: existing } : { status: "conflict" };
  }
  const [inserted] = await db
    .insert(operatingConditions)
    .values({ ...values, systemId, recordedBy })
    .onConflictDoNothing({ target: operatingConditions.id })
    .returning({ id: operatingConditions.id });
  const row = await getConditions({ id: inserted?.id ?? values.id! });
  if (!row) throw new Error("conditions row vanished after insert");
  if (!inserted) return row.systemId === systemId ? { status: "existing", row } : { status: "conflict" };
  return { status: "created", row };
}
