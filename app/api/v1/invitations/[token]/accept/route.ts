import { NextResponse, type NextRequest } from "next/server";
import { recordAudit } from "@/db/queries/audit";
import { getSession } from "@/lib/auth/session";
import { acceptInvitation, PeopleError } from "@/lib/server/invitations";
import { clientAddress, overLimit } from "@/lib/server/limits";
import { readBoundedJson } from "@/lib/server/bounded-json";
import { jsonError } from "@/lib/server/route";
import { acceptInvitationSchema } from "@/lib/validation/people";
import { failFromZod } from "@/lib/validation/result";

export const dynamic = "force-dynamic";

/**
 * Public: use an invitation link (`{name, password}`). Creates the account and membership, marks the
 * link used and signs the person in. A used, withdrawn or expired link answers 410.
 */
export async function POST(req: NextRequest, ctx: { params: Promise<{ token: string }> }) {
  try {
    if (overLimit("invitation", clientAddress(req), 60, 60_000)) return jsonError(429, "Too many requests from this address; wait a minute.");
    const raw = await readBoundedJson(req, 4096);
    if (!raw.ok) return jsonError(raw.status, raw.message);
    const parsed = acceptInvitationSchema.safeParse(raw.value);
    if (!parsed.success) {
      const failure = failFromZod(parsed.error, "Your details");
      return jsonError(400, failure.error.message, failure.error.fields);
    }
    const { userId, projectId } = await acceptInvitation({ token: (await ctx.params).token, ...parsed.data });
    const session = await getSession();
    session.userId = userId;
    await session.save();
    await recordAudit({ userId, action: "auth.sign_in", entityType: "user", entityId: userId, detail: { via: "invitation" } });
    return NextResponse.json({ userId, projectId, next: `/projects/${projectId}` }, { status: 201 });
  } catch (err) {
    if (err instanceof PeopleError) return jsonError(err.status, err.message, err.fields);
    console.error("[api] POST /api/v1/invitations/{token}/accept failed", err);
    return jsonError(500, "Something went wrong on the server; nothing was created. Try again.");
  }
}
