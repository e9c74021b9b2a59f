import { NextResponse } from "next/server";
import { approveReport } from "@/lib/server/report-approvals";
import { answerReportFlow, readinessJson } from "@/lib/server/report-flow-http";
import { jsonError, defineRoute } from "@/lib/server/route";
import { reportApprovalSchema } from "@/lib/validation/reports";

/** The commissioning agent or the engineer of record approves the report's content as it stands now (`{comment?}`); 201 with the readiness. */
export const POST = defineRoute({ body: reportApprovalSchema, project: { param: "projectId", action: "report.approve" } }, async ({ access, user, body }) => {
  if (access.role !== "commissioning_agent" && access.role !== "engineer") return jsonError(403, "Only the project's commissioning agent and engineer of record approve its report.");
  return answerReportFlow(async () => {
    const readiness = await approveReport({ projectId: access.project.id, user, role: access.role!, comment: body.comment ?? "" });
    return NextResponse.json({ readiness: readinessJson(readiness) }, { status: 201 });
  });
});
