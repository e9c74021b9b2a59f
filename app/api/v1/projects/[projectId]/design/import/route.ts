import { NextResponse } from "next/server";
import { recordAudit } from "@/db/queries/audit";
import { applySchedule, loadExistingDesign } from "@/db/queries/design-import";
import { planSchedule, SCHEDULE_LIMITS } from "@/lib/design/schedule-csv";
import { readBodyText } from "@/lib/server/request";
import { defineRoute, jsonError } from "@/lib/server/route";
import { importModeSchema } from "@/lib/validation/design";

/**
 * A design schedule (CSV, see the README) checked row by row. `mode=preview` (the default) changes
 * nothing and lists every row with its errors; `mode=commit` applies the whole file in one
 * transaction, and only when no row has an error.
 */
export const POST = defineRoute({ project: { param: "projectId", action: "design.edit" } }, async ({ req, user, access }) => {
  const mode = importModeSchema.safeParse(req.nextUrl.searchParams.get("mode") ?? "preview");
  if (!mode.success) return jsonError(400, mode.error.issues[0]!.message, { mode: mode.error.issues[0]!.message });
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (!["text/csv", "text/plain", "application/csv", "application/vnd.ms-excel"].includes(type))
    return jsonError(415, "Send the schedule as the request body with Content-Type: text/csv.");
  const body = await readBodyText(req, SCHEDULE_LIMITS.maxBytes, {
    tooLargeMessage: `The file is larger than ${SCHEDULE_LIMITS.maxBytes / 1_048_576} MiB; split it by system.`,
    invalidUtf8Message: "The file is not UTF-8 text. Save the spreadsheet as “CSV UTF-8” and try again.",
  });
  if (!body.ok) return jsonError(body.status, body.message);
  const projectId = access!.project.id;

  if (mode.data === "preview") {
    const plan = planSchedule(body.text, await loadExistingDesign({ projectId }));
    return NextResponse.json({ preview: plan.preview });
  }
  const result = await applySchedule({ projectId, check: (existing) => planSchedule(body.text, existing) });
  if (!result.ok) {
    const { counts, fileErrors } = result.plan.preview;
    const message =
      fileErrors.length > 0
        ? `The file cannot be read: ${fileErrors[0]} Nothing was saved.`
        : `${counts.withErrors} of ${counts.rows} rows have errors; nothing was saved. Fix them and upload the file again.`;
    return NextResponse.json({ error: { message }, preview: result.plan.preview }, { status: 400 });
  }
  const { applied, plan } = result;
  await recordAudit({ userId: user.id, projectId, action: "design.imported", entityType: "project", entityId: projectId, detail: { after: { ...applied, unchanged: plan.preview.counts.unchanged, rows: plan.preview.counts.rows } } });
  return NextResponse.json({ applied, preview: plan.preview });
});
