import { getReport } from "@/db/queries/reports";
import { isUuid } from "@/db/queries/projects";
import { reportPdfResponse } from "@/lib/server/reports-http";
import { defineRoute, jsonError } from "@/lib/server/route";

/** One issued revision's PDF, exactly as issued. */
export const GET = defineRoute({ project: { param: "projectId", action: "report.download" } }, async ({ access, params }) => {
  const report = isUuid(params.reportId ?? "") ? await getReport({ projectId: access.project.id, reportId: params.reportId! }) : null;
  if (!report) return jsonError(404, "No such issued report in this project.");
  return reportPdfResponse(report);
});
