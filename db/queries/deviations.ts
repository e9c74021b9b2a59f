import "server-only";
import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { getDb } from "../client";
import { acceptedDeviations, auditLog, users, type AcceptedDeviation, type DeviationSubject } from "../schema";
import { isUuid } from "./projects";

export const DEVIATION_AUDIT = { accepted: "deviation.accepted", withdrawn: "deviation.withdrawn" } as const;

/**
 * A project's accepted deviations, newest first: the standing ones, or with `includeWithdrawn` the
 * whole history. This is the query the closeout report reads: each row carries what was accepted
 * (`subject`, `entityId`, `measure`, `label`), the value and unit it was accepted at, the band it was
 * outside, the reason, who and when, and for a withdrawn one who withdrew it, when and why.
 */
export async function listDeviations({ projectId, includeWithdrawn = false }: { projectId: string; includeWithdrawn?: boolean }): Promise<AcceptedDeviation[]> {
  const db = await getDb();
  return db
    .select()
    .from(acceptedDeviations)
    .where(and(eq(acceptedDeviations.projectId, projectId), includeWithdrawn ? undefined : isNull(acceptedDeviations.withdrawnAt)))
    .orderBy(desc(acceptedDeviations.acceptedAt), desc(acceptedDeviations.id))
    .limit(5_000);
}

export async function getDeviationInProject({ projectId, deviationId }: { projectId: string; deviationId: string }): Promise<AcceptedDeviation | null> {
  if (!isUuid(deviationId)) return null;
  const db = await getDb();
  const [row] = await db
    .select()
    .from(acceptedDeviations)
    .where(and(eq(acceptedDeviations.id, deviationId), eq(acceptedDeviations.projectId, projectId)));
  return row ?? null;
}

function isUniqueViolation(err: unknown): boolean {
  for (let e: unknown = err, depth = 0; e && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    if ((e as { code?: unknown }).code === "23505") return true;
  }
  return false;
}

export interface NewDeviation {
  projectId: string;
  subject: DeviationSubject;
  entityId: string;
  measure: string;
  label: string;
  acceptedValue: number;
  valueUnit: string;
  tolerance: string;
  reason: string;
}

/**
 * Records an acceptance and its audit entry in one transaction. "standing" when the same result
 * already has an acceptance that was not withdrawn (the partial unique index decides, so two at once
 * cannot both succeed).
 */
export async function acceptDeviation({ values, userId }: { values: NewDeviation; userId: string }): Promise<AcceptedDeviation | "standing"> {
  const db = await getDb();
  try {
    return await db.transaction(async (tx) => {
      const [user] = await tx.select({ name: users.name, email: users.email }).from(users).where(eq(users.id, userId));
      const [row] = await tx
        .insert(acceptedDeviations)
        .values({ ...values, acceptedBy: userId, acceptedByName: user?.name ?? "" })
        .returning();
      await tx.insert(auditLog).values({
        userId,
        actorEmail: user?.email ?? null,
        projectId: values.projectId,
        action: DEVIATION_AUDIT.accepted,
        entityType: `deviation.${values.subject}`,
        entityId: row!.id,
        detail: { subject: values.subject, entityId: values.entityId, measure: values.measure, label: values.label, acceptedValue: values.acceptedValue, valueUnit: values.valueUnit, tolerance: values.tolerance, reason: values.reason },
      });
      return row!;
    });
  } catch (err) {
    if (isUniqueViolation(err)) return "standing";
    throw err;
  }
}

/** Withdraws a standing acceptance (kept as history) with its audit entry; "withdrawn" when it already was. */
export async function withdrawDeviation({ deviation, userId, reason }: { deviation: AcceptedDeviation; userId: string; reason: string }): Promise<AcceptedDeviation | "withdrawn"> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [user] = await tx.select({ name: users.name, email: users.email }).from(users).where(eq(users.id, userId));
    const [row] = await tx
      .update(acceptedDeviations)
      .set({ withdrawnAt: sql`now()`, withdrawnBy: userId, withdrawnByName: user?.name ?? "", withdrawReason: reason })
      .where(and(eq(acceptedDeviations.id, deviation.id), isNull(acceptedDeviations.withdrawnAt)))
      .returning();
    if (!row) return "withdrawn";
    await tx.insert(auditLog).values({
      userId,
      actorEmail: user?.email ?? null,
      projectId: deviation.projectId,
      action: DEVIATION_AUDIT.withdrawn,
      entityType: `deviation.${deviation.subject}`,
      entityId: deviation.id,
      detail: { subject: deviation.subject, entityId: deviation.entityId, measure: deviation.measure, label: deviation.label, reason, before: { acceptedValue: deviation.acceptedValue, acceptedAt: deviation.acceptedAt, acceptedByName: deviation.acceptedByName } },
    });
    return row;
  });
}
