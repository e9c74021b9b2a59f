import { defineRoute } from "@/lib/server/route";
import { submitTerminalSet } from "@/lib/server/review";
import { respond } from "@/lib/server/traverses";
import { submitSchema } from "@/lib/validation/review";

/** A technician submits a system's open terminal set (draft or returned; 409 otherwise), after the submission checks (400 naming the fields). */
export const POST = defineRoute({ body: submitSchema, project: { param: "projectId", action: "traverse.submit" } }, async ({ access, user, body, params }) =>
  respond(await submitTerminalSet(user, access!.project, params.setId ?? "", body)),
);
