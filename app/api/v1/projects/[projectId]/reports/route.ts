import { NextResponse } from "next/server";
import { listReports } from "@/db/queries/reports";
import { issueProjectReport } from "@/lib/server/report-approvals";
import { answerReportFlow } from "@/lib/server/report-flow-http";
import { defineRoute } from "@/lib/server/route";
import { reportIssueSchema } from "@/lib/validation/reports";
import type { Report } from "@/db/schema";

/** Every issued revision of the project's closeout report, newest first, with its download and check links. */
export const GET = defineRoute({ project: { param: "projectId", action: "report.download" } }, async ({ access }) => {
  const projectId = access.project.id;
  const reports = await listReports({ projectId });
  return NextResponse.json({
    reports: reports.map((r) => reportJson(projectId, r)),
  });
});

/**
 * Issues the next revision from approved data (`{reason?}`, required from revision 2 on): 201
 * `{report}`; 409 with `blockers` while approvals or the supervisor's statement are missing.
 */
export const POST = defineRoute({ body: reportIssueSchema, project: { param: "projectId", action: "report.issue" } }, async ({ access, user, body }) =>
  answerReportFlow(async () => {
    const report = await issueProjectReport({ projectId: access.project.id, user, reason: body.reason ?? "" });
    return NextResponse.json({ report: reportJson(access.project.id, report) }, { status: 201 });
  }),
);

function reportJson(projectId: string, r: Report) {
  return {
      id: r.id,
      revision: r.revision,
      status: r.status,
      code: r.code,
      sha256: r.sha256,
      keyId: r.keyId,
      bytes: r.bytes,
      fileName: r.fileName,
      issuedAt: r.issuedAt,
      issuedBy: r.issuedByName,
      signers: r.signers.map((s) => ({ name: s.name, role: s.role, at: s.at })),
      reason: r.reason,
      superseded: r.supersededBy !== null,
      supersededAt: r.supersededAt,
      pdfUrl: `/api/v1/projects/${projectId}/reports/${r.id}/pdf`,
      signatureUrl: `/api/v1/projects/${projectId}/reports/${r.id}/signature`,
      verifyPath: `/verify/${r.code}`,
  };
}
