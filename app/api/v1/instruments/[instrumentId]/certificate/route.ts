import { listUserRoles } from "@/db/queries/members";
import type { SessionUser } from "@/db/queries/users";
import { canInRegister, type Action } from "@/lib/auth/policy";
import { downloadCertificate, uploadCertificate } from "@/lib/server/certificates";
import { defineRoute, jsonError } from "@/lib/server/route";

async function allowed(user: SessionUser, action: Action): Promise<boolean> {
  return canInRegister(user, await listUserRoles({ userId: user.id }), action);
}

/** The instrument's current calibration certificate (`?thumb=1`: an image certificate's thumbnail). */
export const GET = defineRoute({}, async ({ req, user, params }) => {
  if (!(await allowed(user, "instrument.view"))) return jsonError(403, "Only members of a project may see the instrument register.");
  return downloadCertificate({ instrumentId: params.instrumentId ?? "", thumb: req.nextUrl.searchParams.get("thumb") === "1" });
});

/** Attach a calibration certificate (multipart `file`: PDF, JPEG or PNG, at most 10 MB); it becomes the current one. */
export const POST = defineRoute({}, async ({ req, user, params }) => {
  if (!(await allowed(user, "instrument.edit"))) return jsonError(403, "Technicians, engineers and site administrators keep the instrument register.");
  return uploadCertificate({ req, instrumentId: params.instrumentId ?? "", userId: user.id });
});
