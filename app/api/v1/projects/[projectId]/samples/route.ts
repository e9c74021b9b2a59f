import { defineRoute } from "@/lib/server/route";
import { respond } from "@/lib/server/traverses";
import { drawVerificationSample, listVerificationSamples } from "@/lib/server/verification";
import { jsonError } from "@/lib/server/route";
import { sampleDrawSchema } from "@/lib/validation/review";

/** The project's verification samples (or one system's, `?systemId=`), newest first, with their items and outcomes. Any member. */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ req, access }) => {
  const query = req.nextUrl.searchParams;
  for (const key of query.keys()) if (key !== "systemId") return jsonError(400, `Unknown query parameter ${key.slice(0, 40)}.`, { [key.slice(0, 40)]: "is not a parameter of this list; only systemId is" });
  return respond(await listVerificationSamples(access!.project, query.get("systemId")));
});

/** The commissioning agent draws a sample of a submitted system with the project's rule (and a seed, or a fresh one that is stored). */
export const POST = defineRoute({ body: sampleDrawSchema, project: { param: "projectId", action: "traverse.review" } }, async ({ access, user, body }) =>
  respond(await drawVerificationSample(user, access!.project, body)),
);
