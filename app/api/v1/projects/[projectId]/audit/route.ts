import { NextResponse } from "next/server";
import { listProjectAudit } from "@/lib/server/audit-feed";
import { defineRoute, jsonError } from "@/lib/server/route";
import { zodFieldErrors } from "@/lib/validation/result";
import { auditQuerySchema } from "@/lib/validation/review";

/**
 * The project's audit events, newest first, `?before=<id>&limit=` (at most 200) and `?kind=`.
 * Commissioning agents, engineers and site administrators.
 */
export const GET = defineRoute({ project: { param: "projectId", action: "audit.view" } }, async ({ req, access }) => {
  const raw = Object.fromEntries([...req.nextUrl.searchParams.entries()].slice(0, 10).map(([k, v]) => [k.slice(0, 40), v.slice(0, 40)]));
  const parsed = auditQuerySchema.safeParse(raw);
  if (!parsed.success) {
    const fields = zodFieldErrors(parsed.error);
    return jsonError(400, `The query is not valid: check ${Object.keys(fields).join(", ")}.`, fields);
  }
  return NextResponse.json(await listProjectAudit(access!.project, parsed.data));
});
