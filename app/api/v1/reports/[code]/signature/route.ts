import { getReportByCode } from "@/db/queries/reports";
import { normaliseVerificationCode } from "@/lib/server/report-codes";
import { signatureResponse } from "@/lib/server/reports-http";
import { defineRoute, jsonError } from "@/lib/server/route";

export const dynamic = "force-dynamic";

/** Public: the signature of the report issued under a verification code (it proves nothing without the file). */
export const GET = defineRoute({ outsideProject: "public" }, async ({ params }) => {
  const code = normaliseVerificationCode(params.code ?? "");
  const found = code ? await getReportByCode({ code }) : null;
  if (!found) return jsonError(404, "No report was issued under that verification code.");
  return signatureResponse(found.report);
});
