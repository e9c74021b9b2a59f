import { defineRoute } from "@/lib/server/route";
import { reviewSystem } from "@/lib/server/review";
import { respond } from "@/lib/server/traverses";
import { systemReviewSchema } from "@/lib/validation/review";

/**
 * One decision for every submitted item of a system (each section's current traverse and the terminal
 * set), in one transaction: all of them or none. 409 when nothing is submitted.
 */
export const POST = defineRoute({ body: systemReviewSchema, project: { param: "projectId", action: "traverse.review" } }, async ({ access, user, body, params }) =>
  respond(await reviewSystem(user, access!.project, params.systemId ?? "", body)),
);
