import "server-only";
import { and, desc, eq, lt, not, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, users, type Project } from "@/db/schema";
import { describeAuditEntry, KIND_PATTERNS, kindOfAction } from "@/lib/review/audit-kinds";
import { AUDIT_PAGE_MAX, type AuditQuery } from "@/lib/validation/review";

export const AUDIT_PAGE_DEFAULT = 50;

function kindFilter(kind: AuditQuery["kind"]): SQL | undefined {
  if (!kind) return undefined;
  const like = (patterns: readonly string[]) => or(...patterns.map((p) => (p.endsWith("%") ? sql`${auditLog.action} like ${p}` : eq(auditLog.action, p))))!;
  if (kind !== "other") return like(KIND_PATTERNS[kind]);
  return not(like(Object.values(KIND_PATTERNS).flat()));
}

/**
 * A project's audit events, newest first: who (the name today and the e-mail as recorded), what, when,
 * and the values before and after where the entry kept them. Pages of at most 200; `before` continues
 * from an entry id; `nextBefore` is null on the last page.
 */
export async function listProjectAudit(project: Project, query: AuditQuery) {
  const limit = Math.min(query.limit ?? AUDIT_PAGE_DEFAULT, AUDIT_PAGE_MAX);
  const db = await getDb();
  const rows = await db
    .select({ entry: auditLog, name: users.name })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.userId))
    .where(and(eq(auditLog.projectId, project.id), query.before ? lt(auditLog.id, query.before) : undefined, kindFilter(query.kind)))
    .orderBy(desc(auditLog.id))
    .limit(limit + 1);
  const page = rows.slice(0, limit);
  return {
    events: page.map(({ entry, name }) => {
      const detail = entry.detail ?? {};
      const { before, after, ...rest } = detail as { before?: unknown; after?: unknown } & Record<string, unknown>;
      return {
        id: entry.id,
        at: entry.at,
        who: { userId: entry.userId, name, email: entry.actorEmail },
        action: entry.action,
        kind: kindOfAction(entry.action),
        summary: describeAuditEntry(entry.action, detail),
        entityType: entry.entityType,
        entityId: entry.entityId,
        before: before ?? null,
        after: after ?? null,
        detail: rest,
      };
    }),
    nextBefore: rows.length > limit ? (page[page.length - 1]?.entry.id ?? null) : null,
    limit,
  };
}
