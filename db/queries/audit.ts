import "server-only";
import { sql } from "drizzle-orm";
import { getDb, type Database } from "../client";
import { auditLog, users } from "../schema";

/** The database or a transaction of it: an entry written in the caller's transaction is rolled back with it. */
type DbOrTx = Database | Parameters<Parameters<Database["transaction"]>[0]>[0];

export type AuditEntry = Omit<typeof auditLog.$inferInsert, "id" | "at">;

/**
 * Appends one entry to the audit log (the table refuses updates and deletes). The actor's e-mail is
 * kept as it is now: pass `actorEmail`, or give `userId` and it is copied from the user row within
 * the same INSERT (no extra round trip).
 */
export async function recordAudit(entry: AuditEntry, tx?: DbOrTx): Promise<void> {
  const db = tx ?? (await getDb());
  const actorEmail =
    entry.actorEmail ?? (entry.userId ? sql`(select ${users.email} from ${users} where ${users.id} = ${entry.userId})` : null);
  await db.insert(auditLog).values({ ...entry, actorEmail });
}

/** Auditing a refusal must never turn the refusal into a 500: failures are logged and swallowed. */
export async function recordAuditQuietly(entry: AuditEntry): Promise<void> {
  try {
    await recordAudit(entry);
  } catch (err) {
    console.error("[audit] could not record", entry.action, err);
  }
}

export const AUDIT = {
  signIn: "auth.sign_in",
  signInFailed: "auth.sign_in_failed",
  signOut: "auth.sign_out",
  signOutEverywhere: "auth.sign_out_everywhere",
  passwordChanged: "auth.password_changed",
  preferencesChanged: "user.preferences_changed",
  requestDenied: "request.denied",
} as const;

/** @deprecated kept for callers of the first version; use AUDIT.signInFailed. */
export const FAILED_SIGN_IN = AUDIT.signInFailed;
