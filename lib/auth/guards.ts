import "server-only";
import { notFound, redirect } from "next/navigation";
import { cache } from "react";
import { getUserById, type SessionUser } from "@/db/queries/users";
import { getProjectAccess, type ProjectAccess } from "@/db/queries/projects";
import { can, type Action } from "./policy";
import { getSession } from "./session";

/**
 * The signed-in user, read fresh from the database so a removed account loses access at once.
 * Cached per server render: the layout and the page ask once between them.
 */
export const currentUser = cache(async (): Promise<SessionUser | null> => {
  const session = await getSession();
  if (!session.userId) return null;
  return getUserById({ id: session.userId });
});

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
export async function checkProjectAccess(user: SessionUser, projectId: string, action: Action): Promise<AccessCheck> {
  const access = await projectAccess(user.id, projectId);
  if (!access || !can(user, access.role, "project.view")) return { status: "not_found" };
  if (!can(user, access.role, action)) return { status: "forbidden", access };
  return { status: "ok", access };
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
