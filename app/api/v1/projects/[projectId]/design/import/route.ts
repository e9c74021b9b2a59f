import { NextResponse } from "next/server";
import { recordAudit } from "@/db/queries/audit";
import { applySchedule, loadExistingDesign } from "@/db/queries/design-import";
import { planSchedule, SCHEDULE_LIMITS } from "@/lib/design/schedule-csv";
import { defineRoute, jsonError } from "@/lib/server/route";
import { importModeSchema } from "@/lib/validation/design";

/** Reads at most the schedule limit, so an oversized upload is refused without holding it all. */
async function readBounded(req: Request): Promise<{ ok: true; text: string } | { ok: false; status: number; message: string }> {
  const declared = Number(req.headers.get("content-length") ?? "0");
  const tooBig = { ok: false as const, status: 413, message: `The file is larger than ${SCHEDULE_LIMITS.maxBytes / 1_048_576} MiB; split it by system.` };
  if (declared > SCHEDULE_LIMITS.maxBytes) return tooBig;
  if (!req.body) return { ok: true, text: "" };
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > SCHEDULE_LIMITS.maxBytes) {
      await reader.cancel();
      return tooBig;
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(size);
  let at = 0;
  for (const c of chunks) {
    bytes.set(c, at);
    at += c.byteLength;
  }
  try {
    return { ok: true, text: new TextDecoder("utf-8", { fatal: true }).decode(bytes) };
  } catch {
    return { ok: false, status: 400, message: "The file is not UTF-8 text. Save the spreadsheet as “CSV UTF-8” and try again." };
  }
}

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
  const body = await readBounded(req);
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
