import { NextResponse } from "next/server";
import { listDeviations } from "@/db/queries/deviations";
import { acceptResult, deviationJson } from "@/lib/server/deviations";
import { BODY_LIMITS, defineRoute, jsonError } from "@/lib/server/route";
import { deviationAcceptSchema } from "@/lib/validation/deviations";

/** The project's accepted deviations, newest first; `?includeWithdrawn=true` adds the withdrawn ones with who withdrew them and why. */
export const GET = defineRoute({ project: { param: "projectId", action: "design.view" } }, async ({ req, access }) => {
  const flag = new URL(req.url).searchParams.get("includeWithdrawn");
  if (flag !== null && flag !== "true" && flag !== "false") return jsonError(400, "includeWithdrawn must be true or false.", { includeWithdrawn: `must be "true" or "false"; got "${flag.slice(0, 40)}"` });
  const rows = await listDeviations({ projectId: access!.project.id, includeWithdrawn: flag === "true" });
  return NextResponse.json({ deviations: rows.map(deviationJson) });
});

/** Accepts a result outside its band, with a reason (the engineer of record): 201 `{deviation}`. */
export const POST = defineRoute(
  { body: deviationAcceptSchema, maxBodyBytes: BODY_LIMITS.form, project: { param: "projectId", action: "deviation.accept" } },
  async ({ body, user, access }) => {
    const outcome = await acceptResult({ project: access!.project, userId: user.id, body });
    if (outcome.status !== 201) return jsonError(outcome.status, outcome.message, outcome.fields);
    return NextResponse.json({ deviation: deviationJson(outcome.deviation) }, { status: 201 });
  },
);
