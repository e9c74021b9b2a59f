import { NextResponse } from "next/server";
import { listReports } from "@/db/queries/reports";
import { defineRoute } from "@/lib/server/route";

/** Every issued revision of the project's closeout report, newest first, with its download and check links. */
export const GET = defineRoute({ project: { param: "projectId", action: "report.download" } }, async ({ access }) => {
  const projectId = access.project.id;
  const reports = await listReports({ projectId });
  return NextResponse.json({
    reports: reports.map((r) => ({
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
    })),
  });
});
