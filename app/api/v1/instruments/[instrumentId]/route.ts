import { NextResponse } from "next/server";
import { recordAudit } from "@/db/queries/audit";
import { deleteUnusedInstrument, findInstrumentBySerial, getInstrument, getInstrumentUsage, listRolesOfUser, updateInstrument } from "@/db/queries/instruments";
import { isUuid } from "@/db/queries/projects";
import { listCertificateObjectKeys } from "@/db/queries/uploads";
import type { Instrument } from "@/db/schema";
import { canKeepInstrumentRegister } from "@/lib/auth/policy";
import { instrumentJson } from "@/lib/server/field-json";
import { BODY_LIMITS, defineRoute, jsonError, parseJsonBody } from "@/lib/server/route";
import { deleteObjectsQuietly } from "@/lib/server/storage";
import { instrumentPatchSchema, instrumentRecordProblems } from "@/lib/validation/instruments";

const NOT_FOUND = "No such instrument in the register.";

async function load(id: string | undefined): Promise<Instrument | null> {
  return id && isUuid(id) ? getInstrument({ id }) : null;
}

/** One instrument with how often it was used for readings. */
export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ params }) => {
  const row = await load(params.instrumentId);
  if (!row) return jsonError(404, NOT_FOUND);
  return NextResponse.json({ instrument: instrumentJson(row, await getInstrumentUsage({ id: row.id })) });
});

/**
 * Changes an instrument: any subset of its fields, and `retired: true|false`. A used instrument keeps
 * its kind (its readings were reduced as that kind). Every change is in the audit log with before and after.
 */
export const PATCH = defineRoute({ outsideProject: "signed-in" }, async ({ req, params, user }) => {
  if (!canKeepInstrumentRegister(user, await listRolesOfUser({ userId: user.id })))
    return jsonError(403, "Only technicians and site administrators change the instrument register.");
  const row = await load(params.instrumentId);
  if (!row) return jsonError(404, NOT_FOUND);
  const body = await parseJsonBody(req, instrumentPatchSchema, BODY_LIMITS.form);
  if (!body.ok) return body.response;
  const { retired, ifUpdatedAt, ...patch } = body.value;
  if (ifUpdatedAt !== undefined && Date.parse(ifUpdatedAt) !== row.updatedAt.getTime())
    return NextResponse.json(
      { error: { message: "Someone changed this instrument after you opened it; nothing was saved. Compare with the current entry and try again." }, instrument: instrumentJson(row) },
      { status: 409 },
    );

  const merged = { ...row, ...patch };
  const problems = instrumentRecordProblems(merged);
  // A check on a field this request did not send still names that field: the stored value no longer fits.
  if (Object.keys(problems).length > 0) {
    const names = Object.keys(problems);
    return jsonError(400, `The instrument would not be valid: check ${names.join(", ")}.`, problems);
  }
  const usage = await getInstrumentUsage({ id: row.id });
  const used = usage.traverses + usage.terminalReadings;
  if (patch.kind !== undefined && patch.kind !== row.kind && used > 0)
    return jsonError(409, `This instrument was used for ${used} reading${used === 1 ? "" : "s"}, so its kind cannot change; add a new entry instead.`, {
      kind: `cannot change from ${row.kind} once used`,
    });
  if (patch.serial !== undefined || patch.kind !== undefined) {
    const duplicate = await findInstrumentBySerial({ kind: merged.kind, serial: merged.serial, exceptId: row.id });
    if (duplicate) return jsonError(409, `The register already has a ${merged.kind.replace(/_/g, " ")} with serial ${duplicate.serial}.`, { serial: "is already in the register" });
  }

  const retiredAt = retired === undefined ? undefined : retired ? (row.retiredAt ?? new Date()) : null;
  const updated = await updateInstrument({ id: row.id, values: { ...patch, ...(retiredAt !== undefined ? { retiredAt } : {}) } });
  if (updated === "duplicate") return jsonError(409, `The register already has a ${merged.kind.replace(/_/g, " ")} with serial ${merged.serial}.`, { serial: "is already in the register" });
  if (!updated) return jsonError(404, NOT_FOUND);

  const before: Record<string, unknown> = {};
  const after: Record<string, unknown> = {};
  for (const key of Object.keys(patch) as (keyof typeof patch)[]) {
    if (JSON.stringify(row[key]) !== JSON.stringify(updated[key])) {
      before[key] = row[key];
      after[key] = updated[key];
    }
  }
  if (retiredAt !== undefined && (row.retiredAt === null) !== (updated.retiredAt === null)) {
    before.retiredAt = row.retiredAt;
    after.retiredAt = updated.retiredAt;
  }
  if (Object.keys(after).length > 0) {
    const action = "retiredAt" in after ? (updated.retiredAt ? "instrument.retired" : "instrument.returned_to_service") : "instrument.updated";
    await recordAudit({ userId: user.id, projectId: null, action, entityType: "instrument", entityId: row.id, detail: { before, after } });
  }
  return NextResponse.json({ instrument: instrumentJson(updated, usage) });
});

/** Removes an entry made in error. One that was used for any reading is refused (409): retire it instead. */
export const DELETE = defineRoute({ outsideProject: "signed-in" }, async ({ params, user }) => {
  if (!canKeepInstrumentRegister(user, await listRolesOfUser({ userId: user.id })))
    return jsonError(403, "Only technicians and site administrators change the instrument register.");
  const row = await load(params.instrumentId);
  if (!row) return jsonError(404, NOT_FOUND);
  // Its certificates' rows go with it (cascade); their files are removed once the row is gone.
  const certificateKeys = await listCertificateObjectKeys({ instrumentId: row.id });
  const outcome = await deleteUnusedInstrument({ id: row.id });
  if (outcome === "missing") return jsonError(404, NOT_FOUND);
  if (outcome === "used") return jsonError(409, "This instrument was used for readings and stays in the register; retire it instead.");
  await deleteObjectsQuietly(certificateKeys);
  await recordAudit({ userId: user.id, projectId: null, action: "instrument.deleted", entityType: "instrument", entityId: row.id, detail: { before: row } });
  return new Response(null, { status: 204 });
});
