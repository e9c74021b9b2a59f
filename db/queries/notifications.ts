import "server-only";
import { and, count, desc, eq, inArray, isNull, sql, type SQL } from "drizzle-orm";
import { getDb } from "../client";
import { mailMessages, notifications } from "../schema";

export async function listNotifications({ userId, unreadOnly = false, limit = 50 }: { userId: string; unreadOnly?: boolean; limit?: number }) {
  const db = await getDb();
  const where: SQL[] = [eq(notifications.userId, userId)];
  if (unreadOnly) where.push(isNull(notifications.readAt));
  return db
    .select({ id: notifications.id, projectId: notifications.projectId, kind: notifications.kind, message: notifications.message, link: notifications.link, readAt: notifications.readAt, createdAt: notifications.createdAt })
    .from(notifications)
    .where(and(...where))
    .orderBy(desc(notifications.createdAt))
    .limit(limit);
}

export async function countUnreadNotifications({ userId }: { userId: string }): Promise<number> {
  const db = await getDb();
  const [row] = await db.select({ n: count() }).from(notifications).where(and(eq(notifications.userId, userId), isNull(notifications.readAt)));
  return row?.n ?? 0;
}

/** Marks the user's own notices read (these ids, or all); returns how many changed. */
export async function markNotificationsRead({ userId, ids }: { userId: string; ids: readonly string[] | "all" }): Promise<number> {
  const db = await getDb();
  const where = [eq(notifications.userId, userId), isNull(notifications.readAt)];
  if (ids !== "all") {
    if (ids.length === 0) return 0;
    where.push(inArray(notifications.id, [...ids]));
  }
  const rows = await db.update(notifications).set({ readAt: new Date() }).where(and(...where)).returning({ id: notifications.id });
  return rows.length;
}

/** The outbox: every e-mail the app wrote, newest first, optionally to one address. */
export async function listMailMessages({ limit = 50, to }: { limit?: number; to?: string }) {
  const db = await getDb();
  return db
    .select()
    .from(mailMessages)
    .where(to ? eq(sql`lower(${mailMessages.toAddress})`, to.toLowerCase()) : undefined)
    .orderBy(desc(mailMessages.createdAt))
    .limit(limit);
}
