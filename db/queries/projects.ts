import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { cachedRead, getDb, type Frozen } from "../client";
import { airSystems, ductSections, projectMembers, projects, traverses, users, type MemberRole, type Project, type TraverseStatus } from "../schema";
import { getUserById, sessionColumns, type SessionUser } from "./users";

export interface ProjectAccess {
  project: Project;
  /** The user's role in the project; null for a site administrator who is not a member. */
  role: MemberRole | null;
}

export async function getProjectAccess({ userId, projectId }: { userId: string; projectId: string }): Promise<ProjectAccess | null> {
  if (!isUuid(projectId)) return null;
  const db = await getDb();
  const [row] = await db
    .select({ project: projects, role: projectMembers.role })
    .from(projects)
    .leftJoin(projectMembers, and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, userId)))
    .where(eq(projects.id, projectId));
  return row ?? null;
}

/**
 * The user (as getUserById) and their access to one project, in one query: the request path of
 * every project API route. Null when the user does not exist; `access` null when the project does
 * not exist (or the id is not a UUID).
 */
export async function getUserWithProjectAccess({ userId, projectId }: { userId: string; projectId: string }): Promise<Frozen<{ user: SessionUser; access: ProjectAccess | null }> | null> {
  if (!isUuid(projectId)) {
    const user = await getUserById({ id: userId });
    return user ? { user, access: null } : null;
  }
  return cachedRead(`user-project:${userId}:${projectId}`, async () => {
    const db = await getDb();
    const [row] = await db
      .select({
        ...sessionColumns,
        project: projects,
        role: projectMembers.role,
      })
      .from(users)
      .leftJoin(projects, eq(projects.id, projectId))
      .leftJoin(projectMembers, and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, users.id)))
      .where(eq(users.id, userId));
    if (!row) return null;
    const { project, role, ...user } = row;
    return { user, access: project ? { project, role } : null };
  });
}

/** The projects a user is a member of, with the role: one indexed lookup (GET /api/auth/me). */
export async function listMembershipsForUser({ userId }: { userId: string }): Promise<readonly { readonly projectId: string; readonly role: MemberRole }[]> {
  return cachedRead(`memberships:${userId}`, async () => {
    const db = await getDb();
    return db
      .select({ projectId: projectMembers.projectId, role: projectMembers.role })
      .from(projectMembers)
      .innerJoin(projects, eq(projects.id, projectMembers.projectId))
      .where(eq(projectMembers.userId, userId))
      .orderBy(asc(projects.name));
  });
}

export interface ProjectSummary {
  id: string;
  name: string;
  siteName: string;
  unitSystem: "IP" | "SI";
  role: MemberRole | null;
  systemCount: number;
  sectionCount: number;
  /** Sections whose latest traverse has been approved. */
  approvedSectionCount: number;
  /** Sections whose latest traverse awaits review. */
  submittedTraverseCount: number;
}

/**
 * Duct sections of the project whose newest traverse has this status: the same rule the screens use
 * (lib/server/airflow-view.ts takes each section's latest revision), so the list and the pages agree.
 */
function sectionsWhoseLatestTraverseIs(status: TraverseStatus) {
  return sql<number>`(select count(*)::int from (
    select distinct on (${traverses.sectionId}) ${traverses.status} as status
    from ${traverses}
    join ${ductSections} on ${ductSections.id} = ${traverses.sectionId}
    join ${airSystems} on ${airSystems.id} = ${ductSections.systemId}
    where ${airSystems.projectId} = ${projects.id}
    order by ${traverses.sectionId}, ${traverses.revision} desc, ${traverses.createdAt} desc
  ) latest where latest.status = ${status})`;
}

/**
 * The projects a user belongs to with their role in each; site administrators see every project
 * (role null where they are not a member).
 */
export async function listProjectsForUser({ userId, isAdmin }: { userId: string; isAdmin: boolean }): Promise<Frozen<ProjectSummary[]>> {
  return cachedRead(`projects:${userId}:${isAdmin}`, () => loadProjectsForUser(userId, isAdmin));
}

async function loadProjectsForUser(userId: string, isAdmin: boolean): Promise<ProjectSummary[]> {
  const db = await getDb();
  const membership = and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, userId));
  const base = db
    .select({
      id: projects.id,
      name: projects.name,
      siteName: projects.siteName,
      unitSystem: projects.unitSystem,
      role: projectMembers.role,
      systemCount: sql<number>`(select count(*)::int from ${airSystems} where ${airSystems.projectId} = ${projects.id})`,
      sectionCount: sql<number>`(select count(*)::int from ${ductSections} join ${airSystems} on ${airSystems.id} = ${ductSections.systemId} where ${airSystems.projectId} = ${projects.id})`,
      approvedSectionCount: sectionsWhoseLatestTraverseIs("approved"),
      submittedTraverseCount: sectionsWhoseLatestTraverseIs("submitted"),
    })
    .from(projects);
  const rows = isAdmin
    ? await base.leftJoin(projectMembers, membership).orderBy(asc(projects.name))
    : await base.innerJoin(projectMembers, membership).orderBy(asc(projects.name));
  return rows;
}


const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export function isUuid(value: string): boolean {
  return UUID.test(value);
}
