import { NextResponse } from "next/server";
import { getDeviationInProject } from "@/db/queries/deviations";
import { deviationJson, withdrawDeviation } from "@/lib/server/deviations";
import { BODY_LIMITS, defineRoute, jsonError, parseJsonBody } from "@/lib/server/route";
import { deviationWithdrawSchema } from "@/lib/validation/deviations";

/** Withdraws an accepted deviation with a reason (the engineer of record); the acceptance stays as history. */
export const POST = defineRoute({ project: { param: "projectId", action: "deviation.accept" } }, async ({ req, params, user, access }) => {
  const deviation = params.deviationId ? await getDeviationInProject({ projectId: access!.project.id, deviationId: params.deviationId }) : null;
  if (!deviation) return jsonError(404, "No such accepted deviation in this project.");
  const body = await parseJsonBody(req, deviationWithdrawSchema, BODY_LIMITS.form);
  if (!body.ok) return body.response;
  const outcome = await withdrawDeviation({ deviation, userId: user.id, reason: body.value.reason });
  if (outcome === "withdrawn") return jsonError(409, `This acceptance was already withdrawn${deviation.withdrawnByName ? ` by ${deviation.withdrawnByName}` : ""}.`);
  return NextResponse.json({ deviation: deviationJson(outcome) });
});
