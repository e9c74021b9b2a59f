import "server-only";
import { notFound, redirect } from "next/navigation";
import { cache } from "react";
import { getUserById, type SessionUser } from "@/db/queries/users";
import { getProjectAccess, getUserWithProjectAccess, type ProjectAccess } from "@/db/queries/projects";
import { can, type Action } from "./policy";
import { readSession, sessionIsCurrent } from "./session";

/**
 * The signed-in user, read fresh from the database so a removed account loses access at once, and
 * only while the session's version is the user's current one (sign-out everywhere and a password
 * change raise it). The version comes with the user row: no extra query.
 * Cached per server render: the layout and the page ask once between them.
 */
export const currentUser = cache(async (): Promise<SessionUser | null> => {
  const session = await readSession();
  if (!session.userId) return null;
  const user = await getUserById({ id: session.userId });
  return user && sessionIsCurrent(session, user.sessionVersion) ? user : null;
});

/**
 * For project API routes: the signed-in user and their access to one project in a single query
 * (user row, project and membership together), so a project request costs one round trip before
 * the handler runs.
 */
export async function currentUserWithProject(projectId: string): Promise<{ user: SessionUser; access: ProjectAccess | null } | null> {
  const session = await readSession();
  if (!session.userId) return null;
  const found = await getUserWithProjectAccess({ userId: session.userId, projectId });
  if (!found || !sessionIsCurrent(session, found.user.sessionVersion)) return null;
  return found;
}

const projectAccess = cache((userId: string, projectId: string) => getProjectAccess({ userId, projectId }));

/** For pages: the signed-in user, or a redirect to sign-in. */
export async function requireUser(): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  return user;
}

export type AccessCheck =
  | { status: "ok"; access: ProjectAccess }
  | { status: "not_found" }
  | { status: "forbidden"; access: ProjectAccess };

/**
 * May this user take this action in this project? A project the user cannot see at all is
 * reported as not found, so its existence is not revealed.
 */
export function judgeProjectAccess(user: SessionUser, access: ProjectAccess | null, action: Action): AccessCheck {
  if (!access || !can(user, access.role, "project.view")) return { status: "not_found" };
  if (!can(user, access.role, action)) return { status: "forbidden", access };
  return { status: "ok", access };
}

export async function checkProjectAccess(user: SessionUser, projectId: string, action: Action): Promise<AccessCheck> {
  return judgeProjectAccess(user, await projectAccess(user.id, projectId), action);
}

/**
 * For project pages: the user and their access, a 404 when the project is not theirs,
 * and `allowed: false` when their role may not do what the page does.
 */
export async function requireProjectPage(projectId: string, action: Action) {
  const user = await requireUser();
  const check = await checkProjectAccess(user, projectId, action);
  if (check.status === "not_found") notFound();
  return { user, access: check.access, allowed: check.status === "ok" };
}
