import "server-only";
import { asc, eq } from "drizzle-orm";
import { getDb } from "../client";
import { projectMembers, users } from "../schema";

export async function listProjectMembers({ projectId }: { projectId: string }) {
  const db = await getDb();
  return db
    .select({ userId: users.id, name: users.name, email: users.email, role: projectMembers.role, since: projectMembers.createdAt })
    .from(projectMembers)
    .innerJoin(users, eq(users.id, projectMembers.userId))
    .where(eq(projectMembers.projectId, projectId))
    .orderBy(asc(users.name));
}
