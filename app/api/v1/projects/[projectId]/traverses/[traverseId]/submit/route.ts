import { defineRoute } from "@/lib/server/route";
import { submitTraverse } from "@/lib/server/review";
import { respond } from "@/lib/server/traverses";
import { submitSchema } from "@/lib/validation/review";

/**
 * A technician submits a draft or returned traverse for review (409 otherwise). It must pass the
 * submission checks (every point read or marked unreadable, air and operating conditions recorded,
 * instruments within calibration or a stated reason): 400 naming each field otherwise. The project's
 * commissioning agents are told in the same transaction.
 */
export const POST = defineRoute({ body: submitSchema, project: { param: "projectId", action: "traverse.submit" } }, async ({ access, user, body, params }) =>
  respond(await submitTraverse(user, access!.project, params.traverseId ?? "", body)),
);
