import { NextResponse } from "next/server";
import { AUDIT, recordAudit } from "@/db/queries/audit";
import { beginSignInAttempt, finishSignInAttempt, pruneSignInAttempts } from "@/db/queries/sign-in-attempts";
import { getUserForSignIn } from "@/db/queries/users";
import { PasswordHashingBusyError, verifyPassword } from "@/lib/auth/password";
import { getSession } from "@/lib/auth/session";
import { clientAddress } from "@/lib/server/request";
import { BODY_LIMITS, defineRoute, jsonError } from "@/lib/server/route";
import { signInSchema } from "@/lib/validation/auth";

/**
 * The attempt is recorded before the password is checked (parallel guesses count against each
 * other), throttled per e-mail and address with a growing wait instead of a lock-out, and answered
 * the same way, in about the same time, whether or not the e-mail has an account.
 */
export const POST = defineRoute({ outsideProject: "public", body: signInSchema, maxBodyBytes: BODY_LIMITS.auth }, async ({ req, body }) => {
  const email = body.email.toLowerCase();
  const ticket = await beginSignInAttempt({ email, client: clientAddress(req) });
  if (ticket.retryAfterSeconds > 0) {
    const s = ticket.retryAfterSeconds;
    return jsonError(429, `Too many sign-in attempts for this e-mail. Wait ${s} second${s === 1 ? "" : "s"} and try again.`, undefined, {
      "Retry-After": String(s),
    });
  }

  let valid: boolean;
  const user = await getUserForSignIn({ email });
  try {
    valid = await verifyPassword(user?.passwordHash ?? null, body.password);
  } catch (err) {
    if (!(err instanceof PasswordHashingBusyError)) throw err;
    await finishSignInAttempt({ id: ticket.id, outcome: "failed" });
    return jsonError(503, err.message, undefined, { "Retry-After": "5" });
  }
  if (!user || !valid) {
    await finishSignInAttempt({ id: ticket.id, outcome: "failed" });
    await recordAudit({ userId: user?.id ?? null, actorEmail: email, action: AUDIT.signInFailed, entityType: "user", entityId: user?.id ?? null, detail: { email } });
    await pruneSignInAttempts();
    return jsonError(401, "That e-mail and password do not match an account.");
  }

  await finishSignInAttempt({ id: ticket.id, outcome: "succeeded" });
  const session = await getSession();
  session.userId = user.id;
  session.sv = user.sessionVersion;
  await session.save();
  await recordAudit({ userId: user.id, actorEmail: user.email, action: AUDIT.signIn, entityType: "user", entityId: user.id });
  await pruneSignInAttempts();
  return new NextResponse(null, { status: 204 });
});
