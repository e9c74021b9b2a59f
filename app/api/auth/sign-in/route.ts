import { NextResponse, type NextRequest } from "next/server";
import { getUserForSignIn } from "@/db/queries/users";
import { recordAudit } from "@/db/queries/audit";
import { verifyPassword } from "@/lib/auth/password";
import { getSession } from "@/lib/auth/session";
import { jsonError, readJson } from "@/lib/server/route";
import { signInSchema } from "@/lib/validation/auth";
import { failFromZod } from "@/lib/validation/result";

export async function POST(req: NextRequest) {
  const raw = await readJson(req);
  if (!raw.ok) return jsonError(400, raw.message);
  const parsed = signInSchema.safeParse(raw.value);
  if (!parsed.success) return NextResponse.json({ error: failFromZod(parsed.error, "Sign-in").error }, { status: 400 });

  const user = await getUserForSignIn({ email: parsed.data.email });
  const valid = await verifyPassword(user?.passwordHash ?? null, parsed.data.password);
  if (!user || !valid) return jsonError(401, "That e-mail and password do not match an account.");

  const session = await getSession();
  session.userId = user.id;
  await session.save();
  await recordAudit({ userId: user.id, action: "auth.sign_in", entityType: "user", entityId: user.id });
  return new NextResponse(null, { status: 204 });
}
