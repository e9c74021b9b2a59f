import { deleteSystem, respond, updateSystem } from "@/lib/server/design";
import { defineRoute } from "@/lib/server/route";
import { DESIGN } from "@/lib/validation/design";

const project = { param: "projectId", action: "design.edit" } as const;

export const PATCH = defineRoute({ body: DESIGN.systemPatch, project }, async ({ access, user, body, params }) =>
  respond(await updateSystem(user, access!.project, params.systemId ?? "", body)),
);

/** Refused (409) while any traverse, terminal reading or operating-conditions record belongs to the system. */
export const DELETE = defineRoute({ project }, async ({ access, user, params }) => respond(await deleteSystem(user, access!.project, params.systemId ?? "")));
