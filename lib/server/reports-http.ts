/** HTTP answers for issued reports: the PDF streamed from storage, and the raw signature file. */
import type { Report } from "@/db/schema";
import { jsonError } from "./route";
import { getObject, objectResponse } from "./storage";

export async function reportPdfResponse(report: Report): Promise<Response> {
  const obj = await getObject(report.objectKey);
  if (!obj) return jsonError(404, "The issued report's file is missing from storage. Tell the site administrator.");
  const res = objectResponse(obj, { contentType: "application/pdf", fileName: report.fileName, download: true });
  res.headers.set("x-airtally-report-sha256", report.sha256);
  res.headers.set("x-airtally-verification-code", report.code);
  return res;
}

/** The 64-byte Ed25519 signature, as `openssl pkeyutl -verify -sigfile` reads it. */
export function signatureResponse(report: Report): Response {
  const bytes = Buffer.from(report.signature, "base64");
  return new Response(bytes, {
    status: 200,
    headers: {
      "content-type": "application/octet-stream",
      "content-length": String(bytes.length),
      "content-disposition": `attachment; filename="${report.fileName.replace(/\.pdf$/, "")}.sig"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
}
