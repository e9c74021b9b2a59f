import "server-only";
import type { AcceptedDeviation, Project } from "@/db/schema";
import { acceptDeviation, withdrawDeviation } from "@/db/queries/deviations";
import type { DeviationAcceptBody } from "@/lib/validation/deviations";
import { allResults, loadSystemDetails, resultKey } from "./system-view";

/** A deviation as the API answers it (camelCase, ISO dates). */
export function deviationJson(d: AcceptedDeviation) {
  return {
    id: d.id,
    subject: d.subject,
    entityId: d.entityId,
    measure: d.measure,
    label: d.label,
    acceptedValue: d.acceptedValue,
    valueUnit: d.valueUnit,
    tolerance: d.tolerance,
    reason: d.reason,
    acceptedBy: d.acceptedBy,
    acceptedByName: d.acceptedByName,
    acceptedAt: d.acceptedAt.toISOString(),
    withdrawn: d.withdrawnAt !== null,
    withdrawnBy: d.withdrawnBy,
    withdrawnByName: d.withdrawnByName,
    withdrawnAt: d.withdrawnAt?.toISOString() ?? null,
    withdrawReason: d.withdrawReason,
  };
}

export type AcceptOutcome =
  | { status: 201; deviation: AcceptedDeviation }
  | { status: 404 | 409; message: string; fields?: Record<string, string> };

/**
 * Accepts a result that is outside its band now: the value accepted is the server's own (the result
 * as every screen shows it), never a value the client sends. An item of another project is unknown (404).
 */
export async function acceptResult({ project, userId, body }: { project: Project; userId: string; body: DeviationAcceptBody }): Promise<AcceptOutcome> {
  const results = allResults(await loadSystemDetails(project));
  const result = results.find((r) => r.key === resultKey(body.subject, body.entityId, body.measure));
  if (!result) {
    const known = results.some((r) => r.subject === body.subject && r.entityId === body.entityId);
    return known
      ? { status: 404, message: `This ${body.subject} has no "${body.measure}" result.`, fields: { measure: `has no result "${body.measure}" for this ${body.subject}` } }
      : { status: 404, message: `No such ${body.subject} in this project.` };
  }
  if (result.status === "not_measured") return { status: 409, message: `${result.label} is not measured yet (missing: ${result.missing ?? "readings"}), so there is no deviation to accept.` };
  if (result.status === "within") return { status: 409, message: `${result.label} is within its band (${result.tolerance}) at ${result.value!.toFixed(1)} ${result.unit}: there is no deviation to accept.` };
  if (result.deviation) return { status: 409, message: `${result.label} was already accepted by ${result.deviation.acceptedByName}; withdraw that acceptance first to record another.` };
  const saved = await acceptDeviation({
    userId,
    values: {
      projectId: project.id,
      subject: result.subject,
      entityId: result.entityId,
      measure: result.measure,
      label: result.label,
      acceptedValue: result.value!,
      valueUnit: result.unit,
      tolerance: result.tolerance,
      reason: body.reason,
    },
  });
  if (saved === "standing") return { status: 409, message: `${result.label} was accepted a moment ago by someone else; reload to see it.` };
  return { status: 201, deviation: saved };
}

export { withdrawDeviation };
