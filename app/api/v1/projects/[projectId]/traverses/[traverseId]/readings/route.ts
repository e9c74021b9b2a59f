import { defineRoute } from "@/lib/server/route";
import { respond, saveReadings } from "@/lib/server/traverses";
import { readingsSaveSchema } from "@/lib/validation/traverses";

/**
 * Saves the whole readings grid at the traverse's current version and answers with the engine's
 * result; a stale version answers 409 with the current traverse and changes nothing. Technicians only.
 */
export const PUT = defineRoute({ body: readingsSaveSchema, project: { param: "projectId", action: "traverse.record" } }, async ({ access, user, body, params }) =>
  respond(await saveReadings(user, access!.project, params.traverseId ?? "", body)),
);
