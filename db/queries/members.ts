import "server-only";
import { and, asc, desc, eq, isNull, sql } from "drizzle-orm";
import { getDb } from "../client";
import { invitations, projectMembers, users } from "../schema";

export async function listProjectMembers({ projectId }: { projectId: string }) {
  const db = await getDb();
  return db
    .select({ userId: users.id, name: users.name, email: users.email, role: projectMembers.role, since: projectMembers.createdAt })
    .from(projectMembers)
    .innerJoin(users, eq(users.id, projectMembers.userId))
    .where(eq(projectMembers.projectId, projectId))
    .orderBy(asc(users.name));
}

export async function getMember({ projectId, userId }: { projectId: string; userId: string }) {
  const db = await getDb();
  const [row] = await db
    .select({ userId: users.id, name: users.name, email: users.email, role: projectMembers.role })
    .from(projectMembers)
    .innerJoin(users, eq(users.id, projectMembers.userId))
    .where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId)));
  return row ?? null;
}

/** Invitations of a project not yet accepted or revoked (expired ones included, marked by their date). */
export async function listOpenInvitations({ projectId }: { projectId: string }) {
  const db = await getDb();
  return db
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      createdAt: invitations.createdAt,
      expiresAt: invitations.expiresAt,
      expired: sql<boolean>`${invitations.expiresAt} <= now()`,
      invitedByName: users.name,
    })
    .from(invitations)
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(and(eq(invitations.projectId, projectId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
    .orderBy(desc(invitations.createdAt))
    .limit(500);
}
