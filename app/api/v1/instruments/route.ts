import { NextResponse } from "next/server";
import { recordAudit } from "@/db/queries/audit";
import { createInstrument, findInstrumentBySerial, listInstruments, listRolesOfUser } from "@/db/queries/instruments";
import { canKeepInstrumentRegister } from "@/lib/auth/policy";
import { instrumentJson } from "@/lib/server/field-json";
import { BODY_LIMITS, jsonError, defineRoute, parseJsonBody } from "@/lib/server/route";
import { instrumentCreateSchema, instrumentListQuerySchema } from "@/lib/validation/instruments";
import { failFromZod } from "@/lib/validation/result";

/**
 * The deployment's instrument register, read by every signed-in user. `?kind=manometer,pitot_tube`
 * narrows it; `?includeRetired=true` adds retired instruments.
 */
export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ req }) => {
  const query = instrumentListQuerySchema.safeParse(Object.fromEntries(req.nextUrl.searchParams));
  if (!query.success) return NextResponse.json({ error: failFromZod(query.error, "The query").error }, { status: 400 });
  const rows = await listInstruments({ kinds: query.data.kind, includeRetired: query.data.includeRetired === "true" });
  const today = new Date();
  return NextResponse.json({ instruments: rows.map((r) => instrumentJson(r, undefined, today)) });
});

/** Adds an instrument. Technicians (on any project) and site administrators keep the register. */
export const POST = defineRoute({ outsideProject: "signed-in" }, async ({ req, user }) => {
  if (!canKeepInstrumentRegister(user, await listRolesOfUser({ userId: user.id })))
    return jsonError(403, "Only technicians and site administrators add instruments to the register.");
  const body = await parseJsonBody(req, instrumentCreateSchema, BODY_LIMITS.form);
  if (!body.ok) return body.response;
  const values = body.value;
  const duplicate = await findInstrumentBySerial({ kind: values.kind, serial: values.serial });
  if (duplicate)
    return jsonError(409, `The register already has a ${values.kind.replace(/_/g, " ")} with serial ${duplicate.serial}.`, {
      serial: `is already in the register (${duplicate.serial}); edit that entry instead`,
    });
  const row = await createInstrument({ values, createdBy: user.id });
  if (row === "duplicate")
    return jsonError(409, `The register already has a ${values.kind.replace(/_/g, " ")} with serial ${values.serial}.`, { serial: "is already in the register; edit that entry instead" });
  await recordAudit({ userId: user.id, projectId: null, action: "instrument.created", entityType: "instrument", entityId: row.id, detail: { after: values } });
  return NextResponse.json({ instrument: instrumentJson(row) }, { status: 201 });
});
