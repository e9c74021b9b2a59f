import { NextResponse } from "next/server";
import { AUDIT, recordAudit } from "@/db/queries/audit";
import { getPasswordHash, setUserPassword } from "@/db/queries/users";
import { hashPassword, PasswordHashingBusyError, verifyPassword } from "@/lib/auth/password";
import { getSession } from "@/lib/auth/session";
import { BODY_LIMITS, defineRoute, jsonError } from "@/lib/server/route";
import { passwordChangeSchema } from "@/lib/validation/auth";

/** A new password for the caller. Every other session of theirs ends; this one continues. */
export const POST = defineRoute(
  { outsideProject: "signed-in", body: passwordChangeSchema, maxBodyBytes: BODY_LIMITS.auth },
  async ({ user, body }) => {
    try {
      const valid = await verifyPassword(await getPasswordHash({ id: user.id }), body.current_password);
      if (!valid) return jsonError(400, "The current password is not right.", { current_password: "The current password is not right." });
      const version = await setUserPassword({ id: user.id, passwordHash: await hashPassword(body.new_password) });
      const session = await getSession();
      session.sv = version ?? undefined;
      await session.save();
    } catch (err) {
      if (err instanceof PasswordHashingBusyError) return jsonError(503, err.message, undefined, { "Retry-After": "5" });
      throw err;
    }
    await recordAudit({ userId: user.id, actorEmail: user.email, action: AUDIT.passwordChanged, entityType: "user", entityId: user.id });
    return new NextResponse(null, { status: 204 });
  },
);
