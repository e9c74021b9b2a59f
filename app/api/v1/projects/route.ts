import { NextResponse } from "next/server";
import { listProjectsForUser } from "@/db/queries/projects";
import { createProject, mayCreateProject, respond } from "@/lib/server/design";
import { defineRoute, jsonError, readJson } from "@/lib/server/route";
import { DESIGN } from "@/lib/validation/design";
import { failFromZod } from "@/lib/validation/result";

/** The signed-in user's projects with their role in each. */
export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ user }) => {
  const projects = await listProjectsForUser({ userId: user.id, isAdmin: user.isAdmin });
  return NextResponse.json({ projects });
});

/**
 * A new project. Site administrators and engineers of at least one project may start one; the
 * creator becomes its engineer. Who may is checked before the body is read.
 */
export const POST = defineRoute({ outsideProject: "signed-in" }, async ({ req, user }) => {
  if (!(await mayCreateProject(user))) return jsonError(403, "Only site administrators and project engineers can start a project.");
  const raw = await readJson(req);
  if (!raw.ok) return jsonError(400, raw.message, { "(body)": raw.message });
  const parsed = DESIGN.project.safeParse(raw.value);
  if (!parsed.success) return NextResponse.json({ error: failFromZod(parsed.error, "The project").error }, { status: 400 });
  return respond(await createProject(user, parsed.data));
});
