import { defineRoute } from "@/lib/server/route";
import { reviewTerminalSet } from "@/lib/server/review";
import { respond } from "@/lib/server/traverses";
import { reviewDecisionSchema } from "@/lib/validation/review";

/** The commissioning agent approves or returns a submitted terminal set, with the same rules as a traverse. */
export const POST = defineRoute({ body: reviewDecisionSchema, project: { param: "projectId", action: "traverse.review" } }, async ({ access, user, body, params }) =>
  respond(await reviewTerminalSet(user, access!.project, params.setId ?? "", body)),
);
