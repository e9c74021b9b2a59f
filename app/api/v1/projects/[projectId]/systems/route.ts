import { createSystem, respond } from "@/lib/server/design";
import { defineRoute } from "@/lib/server/route";
import { DESIGN } from "@/lib/validation/design";

/** A new air system (fan or air handler) in the project. */
export const POST = defineRoute({ body: DESIGN.system, project: { param: "projectId", action: "design.edit" } }, async ({ access, user, body }) =>
  respond(await createSystem(user, access!.project, body)),
);
