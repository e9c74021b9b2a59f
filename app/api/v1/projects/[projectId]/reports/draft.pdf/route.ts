import { buildDraftReport } from "@/lib/server/report-approvals";
import { defineRoute } from "@/lib/server/route";

/** A draft of the closeout report from the data as they stand now (every page marked "Draft — not issued"), for every member. */
export const GET = defineRoute({ project: { param: "projectId", action: "report.download" } }, async ({ access }) => {
  const pdf = await buildDraftReport({ projectId: access.project.id });
  const day = new Date().toISOString().slice(0, 10);
  return new Response(Buffer.from(pdf), {
    status: 200,
    headers: {
      "content-type": "application/pdf",
      "content-length": String(pdf.byteLength),
      "content-disposition": `attachment; filename="airtally-report-draft-${day}.pdf"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
});
