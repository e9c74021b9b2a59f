import "server-only";
import { getDb } from "../client";
import { auditLog } from "../schema";

export async function recordAudit(entry: typeof auditLog.$inferInsert): Promise<void> {
  const db = await getDb();
  await db.insert(auditLog).values(entry);
}
