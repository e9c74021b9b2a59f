import { NextResponse } from "next/server";
import { recordAudit } from "@/db/queries/audit";
import { getSystemInProject, listConditionsForSystem, recordConditions } from "@/db/queries/conditions";
import { isUuid } from "@/db/queries/projects";
import { conditionsWarnings } from "@/lib/airflow/conditions";
import { conditionsJson } from "@/lib/server/field-json";
import { BODY_LIMITS, defineRoute, jsonError, parseJsonBody } from "@/lib/server/route";
import { conditionsCreateSchema } from "@/lib/validation/conditions";

const NO_SYSTEM = "No such air system in this project.";

async function systemOf(projectId: string, systemId: string | undefined) {
  return systemId && isUuid(systemId) ? getSystemInProject({ projectId, systemId }) : null;
}

/** The system's recorded operating conditions, newest first; `current` is the newest (null when none). */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ params, access }) => {
  const system = await systemOf(access!.project.id, params.systemId);
  if (!system) return jsonError(404, NO_SYSTEM);
  const rows = (await listConditionsForSystem({ systemId: system.id })).map(conditionsJson);
  return NextResponse.json({ systemId: system.id, current: rows[0] ?? null, conditions: rows });
});

/**
 * Records the conditions the system is running under now (or at `recordedAt`, for a record made offline).
 * 201 with the record and any plausibility warnings; 200 with the stored record when the same client
 * `id` was already recorded (a retried request). Technicians only.
 */
export const POST = defineRoute({ project: { param: "projectId", action: "conditions.record" } }, async ({ req, params, user, access }) => {
  const project = access!.project;
  const system = await systemOf(project.id, params.systemId);
  if (!system) return jsonError(404, NO_SYSTEM);
  const body = await parseJsonBody(req, conditionsCreateSchema, BODY_LIMITS.form);
  if (!body.ok) return body.response;
  const { recordedAt, ...values } = body.value;
  const outcome = await recordConditions({
    systemId: system.id,
    recordedBy: user.id,
    values: { ...values, ...(recordedAt ? { recordedAt: new Date(recordedAt) } : {}) },
  });
  if (outcome.status === "conflict") return jsonError(409, "That id belongs to another record; the device should choose a new one.", { id: "is already used by another record" });
  const json = conditionsJson(outcome.row);
  const warnings = conditionsWarnings(json, system);
  if (outcome.status === "existing") return NextResponse.json({ conditions: json, warnings }, { status: 200 });
  await recordAudit({
    userId: user.id,
    projectId: project.id,
    action: "conditions.recorded",
    entityType: "operating_conditions",
    entityId: json.id,
    detail: { systemId: system.id, systemTag: system.tag, after: { ...values, recordedAt: json.recordedAt }, warnings },
  });
  return NextResponse.json({ conditions: json, warnings }, { status: 201 });
});
