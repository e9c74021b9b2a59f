import { defineRoute } from "@/lib/server/route";
import { createTraverse, respond } from "@/lib/server/traverses";
import { traverseCreateSchema } from "@/lib/validation/traverses";

/**
 * Starts a traverse of a duct section: its layout (counts as given, or the engine's recommendation),
 * the air at the plane, the instruments and the operating conditions. A section that already has a
 * traverse gets the next revision; the earlier ones stay as history. A client-chosen `id` makes the
 * request safe to retry (200 with the stored traverse). Technicians only.
 */
export const POST = defineRoute({ body: traverseCreateSchema, project: { param: "projectId", action: "traverse.record" } }, async ({ access, user, body }) =>
  respond(await createTraverse(user, access!.project, body)),
);
