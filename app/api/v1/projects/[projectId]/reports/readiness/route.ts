import { NextResponse } from "next/server";
import { getReportReadiness } from "@/lib/server/report-approvals";
import { readinessJson } from "@/lib/server/report-flow-http";
import { defineRoute } from "@/lib/server/route";

/** What stands between the project and an issued report, in words: approvals, the supervisor's statement, approved data. */
export const GET = defineRoute({ project: { param: "projectId", action: "report.download" } }, async ({ access }) => {
  return NextResponse.json({ readiness: readinessJson(await getReportReadiness({ projectId: access.project.id })) });
});
