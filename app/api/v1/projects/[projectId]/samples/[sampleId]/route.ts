import { defineRoute } from "@/lib/server/route";
import { respond } from "@/lib/server/traverses";
import { getVerificationSample } from "@/lib/server/verification";

/** One verification sample: the seed and rule it was drawn with, its items, the agent's readings and the outcome. Any member. */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ access, params }) => respond(await getVerificationSample(access!.project, params.sampleId ?? "")));
