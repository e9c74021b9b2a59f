import { defineRoute } from "@/lib/server/route";
import { respond } from "@/lib/server/traverses";
import { markSampleItemWitnessed } from "@/lib/server/verification";
import { sampleWitnessSchema } from "@/lib/validation/review";

/** The commissioning agent marks a sampled item witnessed (present while it was read), or takes the mark back. */
export const PATCH = defineRoute({ body: sampleWitnessSchema, project: { param: "projectId", action: "traverse.review" } }, async ({ access, user, body, params }) =>
  respond(await markSampleItemWitnessed(user, access!.project, params.sampleId ?? "", params.itemId ?? "", body.witnessed)),
);
