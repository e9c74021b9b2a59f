import { NextResponse } from "next/server";
import { listTerminalsOfProject } from "@/db/queries/design";
import { isUuid } from "@/db/queries/projects";
import { terminalResource } from "@/lib/design/resources";
import { createTerminal, respond } from "@/lib/server/design";
import { defineRoute, jsonError } from "@/lib/server/route";
import { DESIGN } from "@/lib/validation/design";

/** The project's outlets, inlets and terminal units; `systemId` or `sectionId` narrow the list. */
export const GET = defineRoute({ project: { param: "projectId", action: "design.view" } }, async ({ access, req }) => {
  const systemId = req.nextUrl.searchParams.get("systemId") ?? undefined;
  const sectionId = req.nextUrl.searchParams.get("sectionId") ?? undefined;
  for (const [name, value] of [["systemId", systemId], ["sectionId", sectionId]] as const)
    if (value !== undefined && !isUuid(value)) return jsonError(400, `${name} is not an id.`, { [name]: `"${value.slice(0, 40)}" is not an id.` });
  const terminals = await listTerminalsOfProject({ projectId: access!.project.id, systemId, sectionId });
  return NextResponse.json({ terminals: terminals.map(terminalResource) });
});

/** A new outlet, inlet or terminal unit on a duct section. */
export const POST = defineRoute({ body: DESIGN.terminal, project: { param: "projectId", action: "design.edit" } }, async ({ access, user, body }) =>
  respond(await createTerminal(user, access!.project, body)),
);
