import { NextResponse, type NextRequest } from "next/server";
import { countFailedSignIns, FAILED_SIGN_IN, recordAudit } from "@/db/queries/audit";
import { getUserForSignIn } from "@/db/queries/users";
import { verifyPassword } from "@/lib/auth/password";
import { getSession } from "@/lib/auth/session";
import { jsonError, readJson } from "@/lib/server/route";
import { signInSchema } from "@/lib/validation/auth";
import { failFromZod } from "@/lib/validation/result";

/** Guessing is slowed to this many wrong passwords per e-mail in the window (common practice for login throttling). */
const MAX_FAILED_SIGN_INS = 10;
const WINDOW_MINUTES = 15;

export async function POST(req: NextRequest) {
  const raw = await readJson(req);
  if (!raw.ok) return jsonError(400, raw.message);
  const parsed = signInSchema.safeParse(raw.value);
  if (!parsed.success) return NextResponse.json({ error: failFromZod(parsed.error, "Sign-in").error }, { status: 400 });
  const email = parsed.data.email.toLowerCase();

  const since = new Date(Date.now() - WINDOW_MINUTES * 60_000);
  if ((await countFailedSignIns({ email, since })) >= MAX_FAILED_SIGN_INS) {
    return jsonError(429, `Too many wrong passwords for this e-mail. Wait ${WINDOW_MINUTES} minutes, or ask your administrator to check the account.`);
  }

  const user = await getUserForSignIn({ email });
  const valid = await verifyPassword(user?.passwordHash ?? null, parsed.data.password);
  if (!user || !valid) {
    await recordAudit({ userId: user?.id ?? null, action: FAILED_SIGN_IN, entityType: "user", entityId: user?.id ?? null, detail: { email } });
    return jsonError(401, "That e-mail and password do not match an account.");
  }

  const session = await getSession();
  session.userId = user.id;
  await session.save();
  await recordAudit({ userId: user.id, action: "auth.sign_in", entityType: "user", entityId: user.id });
  return new NextResponse(null, { status: 204 });
}
