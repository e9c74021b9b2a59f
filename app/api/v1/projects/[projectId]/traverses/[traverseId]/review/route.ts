import { defineRoute } from "@/lib/server/route";
import { reviewTraverse } from "@/lib/server/review";
import { respond } from "@/lib/server/traverses";
import { reviewDecisionSchema } from "@/lib/validation/review";

/**
 * The commissioning agent approves or returns a submitted traverse (409 on any other); a return needs
 * a comment (400 naming `comment`). The decision is a row in `reviews` with the traverse's version, an
 * audit entry, and a notice (the technician on return, the engineer and owner on approval).
 */
export const POST = defineRoute({ body: reviewDecisionSchema, project: { param: "projectId", action: "traverse.review" } }, async ({ access, user, body, params }) =>
  respond(await reviewTraverse(user, access!.project, params.traverseId ?? "", body)),
);
