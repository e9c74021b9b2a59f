/**
 * Changing and removing project members. The project's engineer and site administrators manage
 * people; appointing or removing an engineer of record, and any change to oneself, stays with site
 * administrators, so no one can lock others out or promote themselves.
 */
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { recordAudit } from "@/db/queries/audit";
import { getMember } from "@/db/queries/members";
import { isUuid } from "@/db/queries/projects";
import { projectMembers, projectSupervisors, type MemberRole } from "@/db/schema";
import { PeopleError } from "./invitations";

interface Actor {
  id: string;
  isAdmin: boolean;
}

async function target(projectId: string, userId: string) {
  const member = isUuid(userId) ? await getMember({ projectId, userId }) : null;
  if (!member) throw new PeopleError(404, "No such member of this project.");
  return member;
}

function guard(actor: Actor, member: { userId: string; role: MemberRole }, newRole?: MemberRole) {
  if (actor.isAdmin) return;
  if (member.userId === actor.id) throw new PeopleError(403, "You cannot change your own membership; ask a site administrator.");
  if (member.role === "engineer" || newRole === "engineer") throw new PeopleError(403, "Only a site administrator can appoint or remove an engineer of record.");
}

export async function changeMemberRole({ projectId, userId, role, by }: { projectId: string; userId: string; role: MemberRole; by: Actor }) {
  const member = await target(projectId, userId);
  guard(by, member, role);
  if (member.role === role) return { ...member, role };
  const db = await getDb();
  let supervisorCleared = false;
  await db.transaction(async (tx) => {
    await tx.update(projectMembers).set({ role }).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId)));
    // The TAB supervisor is a technician of the project; another role ends the designation.
    if (role !== "technician") {
      const cleared = await tx.delete(projectSupervisors).where(and(eq(projectSupervisors.projectId, projectId), eq(projectSupervisors.userId, userId))).returning();
      supervisorCleared = cleared.length > 0;
    }
  });
  await recordAudit({ userId: by.id, projectId, action: "member.role_changed", entityType: "user", entityId: userId, detail: { email: member.email, before: member.role, after: role, supervisorCleared } });
  return { ...member, role };
}

export async function removeMember({ projectId, userId, by }: { projectId: string; userId: string; by: Actor }) {
  const member = await target(projectId, userId);
  guard(by, member);
  const db = await getDb();
  await db.transaction(async (tx) => {
    await tx.delete(projectSupervisors).where(and(eq(projectSupervisors.projectId, projectId), eq(projectSupervisors.userId, userId)));
    await tx.delete(projectMembers).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId)));
  });
  await recordAudit({ userId: by.id, projectId, action: "member.removed", entityType: "user", entityId: userId, detail: { email: member.email, role: member.role } });
}
