import "server-only";
import { and, count, eq, gt, sql } from "drizzle-orm";
import { getDb } from "../client";
import { auditLog } from "../schema";

export async function recordAudit(entry: typeof auditLog.$inferInsert): Promise<void> {
  const db = await getDb();
  await db.insert(auditLog).values(entry);
}

export const FAILED_SIGN_IN = "auth.sign_in_failed";

/** Failed sign-ins for an e-mail (any case) since a moment; kept in the database so every app server sees them. */
export async function countFailedSignIns({ email, since }: { email: string; since: Date }): Promise<number> {
  const db = await getDb();
  const [row] = await db
    .select({ n: count() })
    .from(auditLog)
    .where(and(eq(auditLog.action, FAILED_SIGN_IN), gt(auditLog.at, since), eq(sql`${auditLog.detail}->>'email'`, email.trim().toLowerCase())));
  return row?.n ?? 0;
}
