import { defineRoute } from "@/lib/server/route";
import { respond } from "@/lib/server/traverses";
import { recordSampleReading } from "@/lib/server/verification";
import { sampleReadingSchema } from "@/lib/validation/review";

/**
 * The commissioning agent's own reading of a sampled item, compared with the technician's within the
 * sample's tolerance (not judged when the operating conditions differ; the answer says how). A second
 * reading replaces the first; both are in the audit trail.
 */
export const PUT = defineRoute({ body: sampleReadingSchema, project: { param: "projectId", action: "traverse.review" } }, async ({ access, user, body, params }) =>
  respond(await recordSampleReading(user, access!.project, params.sampleId ?? "", params.itemId ?? "", body)),
);
