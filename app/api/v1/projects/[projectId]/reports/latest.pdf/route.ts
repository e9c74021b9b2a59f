import { getLatestReport } from "@/db/queries/reports";
import { reportPdfResponse } from "@/lib/server/reports-http";
import { defineRoute, jsonError } from "@/lib/server/route";

/** The current issued closeout report (PDF), for every member. */
export const GET = defineRoute({ project: { param: "projectId", action: "report.download" } }, async ({ access }) => {
  const report = await getLatestReport({ projectId: access.project.id });
  if (!report) return jsonError(404, "No closeout report has been issued for this project yet. It can be issued once the commissioning agent and the engineer of record have approved the data.");
  return reportPdfResponse(report);
});
