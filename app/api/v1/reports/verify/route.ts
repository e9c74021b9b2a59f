import { NextResponse } from "next/server";
import { overLimit, withSlot } from "@/lib/server/limits";
import { readMultipartFile } from "@/lib/server/multipart";
import { MAX_REPORT_BYTES } from "@/lib/server/report-issue";
import { verifyReportFile } from "@/lib/server/report-verify";
import { clientAddress } from "@/lib/server/request";
import { defineRoute, jsonError } from "@/lib/server/route";

export const dynamic = "force-dynamic";

/** Checks from one address per minute, and checks running at once: the route is public. */
const PER_MINUTE = 30;
const AT_ONCE = 3;

/**
 * Public: is this file a report this deployment issued? Multipart, field `file`, read while it
 * streams and cut off past the largest report Airtally issues (413).
 * Answers {valid, reason?, report?}; a file that matches nothing is `valid: false`, not an error.
 */
export const POST = defineRoute({ outsideProject: "public" }, async ({ req }) => {
  if (overLimit("verify", clientAddress(req), PER_MINUTE, 60_000)) return jsonError(429, "Too many checks from this address; wait a minute and try again.");
  return withSlot(
    "verify",
    AT_ONCE,
    async () => {
      const body = await readMultipartFile(req, { maxFileBytes: MAX_REPORT_BYTES, limitWords: `${MAX_REPORT_BYTES / 1048576} MB, which is larger than any report Airtally issues` });
      if (!body.ok) return jsonError(body.status, body.message, body.field ? { [body.field]: body.message } : undefined);
      if (!body.file) return jsonError(400, 'Attach the report in the field "file".', { file: "Choose the report's PDF file." });
      return NextResponse.json(await verifyReportFile(body.file.bytes));
    },
    () => jsonError(503, "Several files are being checked right now; try again in a moment."),
  );
});
