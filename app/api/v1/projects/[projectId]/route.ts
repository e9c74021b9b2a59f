import { NextResponse } from "next/server";
import { getProjectDesign } from "@/db/queries/airflow";
import { terminalResource } from "@/lib/design/resources";
import { respond, updateProject } from "@/lib/server/design";
import { defineRoute } from "@/lib/server/route";
import { DESIGN } from "@/lib/validation/design";

/** One project with the caller's role and its design side: air systems, duct sections and terminals (SI units). */
export const GET = defineRoute({ project: { param: "projectId", action: "design.view" } }, async ({ access }) => {
  const { project, role } = access;
  const design = await getProjectDesign({ projectId: project.id });
  return NextResponse.json({ project, role, ...design, terminals: design.terminals.map(terminalResource) });
});

/** The project's settings: site, address, altitude, units, standard air, tolerances. */
export const PATCH = defineRoute({ body: DESIGN.projectPatch, project: { param: "projectId", action: "project.edit" } }, async ({ access, user, body }) =>
  respond(await updateProject(user, access!.project, body)),
);
