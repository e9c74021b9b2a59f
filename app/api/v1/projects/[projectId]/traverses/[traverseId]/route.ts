import { defineRoute } from "@/lib/server/route";
import { getTraverse, patchTraverse, respond } from "@/lib/server/traverses";
import { traversePatchSchema } from "@/lib/validation/traverses";

/** The traverse with its readings grid, layout, the engine's input and result, and the section's revisions. Any member. */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ access, params }) =>
  respond(await getTraverse(access!.project, params.traverseId ?? "")),
);

/** Changes the air, instruments, conditions, port offset or notes of a draft (or returned) traverse, at its current version. Technicians only. */
export const PATCH = defineRoute({ body: traversePatchSchema, project: { param: "projectId", action: "traverse.record" } }, async ({ access, user, body, params }) =>
  respond(await patchTraverse(user, access!.project, params.traverseId ?? "", body)),
);
