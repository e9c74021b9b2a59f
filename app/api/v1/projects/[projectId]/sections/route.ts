import { createSection, respond } from "@/lib/server/design";
import { defineRoute } from "@/lib/server/route";
import { DESIGN } from "@/lib/validation/design";

/** A new duct section: a trunk (no parentId) or a branch below another section of the same system. */
export const POST = defineRoute({ body: DESIGN.section, project: { param: "projectId", action: "design.edit" } }, async ({ access, user, body }) =>
  respond(await createSection(user, access!.project, body)),
);
