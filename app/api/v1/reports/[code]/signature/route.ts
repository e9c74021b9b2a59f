import type { NextRequest } from "next/server";
import { getReportByCode } from "@/db/queries/reports";
import { normaliseVerificationCode } from "@/lib/server/report-codes";
import { signatureResponse } from "@/lib/server/reports-http";
import { jsonError } from "@/lib/server/route";

export const dynamic = "force-dynamic";

/** Public: the signature of the report issued under a verification code (it proves nothing without the file). */
export async function GET(_req: NextRequest, ctx: { params: Promise<{ code: string }> }) {
  try {
    const code = normaliseVerificationCode((await ctx.params).code);
    const found = code ? await getReportByCode({ code }) : null;
    if (!found) return jsonError(404, "No report was issued under that verification code.");
    return signatureResponse(found.report);
  } catch (err) {
    console.error("[api] GET /api/v1/reports/{code}/signature failed", err);
    return jsonError(500, "Something went wrong on the server; try again.");
  }
}
