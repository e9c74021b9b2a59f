import { listRolesOfUser } from "@/db/queries/instruments";
import { canKeepInstrumentRegister } from "@/lib/auth/policy";
import { downloadCertificate, uploadCertificate } from "@/lib/server/certificates";
import { defineRoute, jsonError } from "@/lib/server/route";

/**
 * The instrument's current calibration certificate (`?thumb=1`: an image certificate's thumbnail).
 * The register is the whole deployment's: everyone signed in reads it, certificates included.
 */
export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ req, params }) =>
  downloadCertificate({ instrumentId: params.instrumentId ?? "", thumb: req.nextUrl.searchParams.get("thumb") === "1" }),
);

/**
 * Attach a calibration certificate (multipart `file`: PDF, JPEG or PNG, at most 10 MB); it becomes the
 * current one. Those who keep the register (technicians on any project, site administrators) only,
 * checked before the body is read.
 */
export const POST = defineRoute({ outsideProject: "signed-in" }, async ({ req, user, params }) => {
  if (!canKeepInstrumentRegister(user, await listRolesOfUser({ userId: user.id })))
    return jsonError(403, "Only technicians and site administrators change the instrument register.");
  return uploadCertificate({ req, instrumentId: params.instrumentId ?? "", userId: user.id });
});
