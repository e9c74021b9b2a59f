import { NextResponse } from "next/server";
import { AUDIT, recordAudit } from "@/db/queries/audit";
import { getSession } from "@/lib/auth/session";
import { acceptInvitation, INVITATION_REQUESTS_PER_MINUTE } from "@/lib/server/invitations";
import { overLimit } from "@/lib/server/limits";
import { answerPeople } from "@/lib/server/people-http";
import { clientAddress } from "@/lib/server/request";
import { BODY_LIMITS, defineRoute, jsonError, parseJsonBody } from "@/lib/server/route";
import { acceptInvitationSchema } from "@/lib/validation/people";

export const dynamic = "force-dynamic";

/**
 * Public: use an invitation link (`{name, password}`). Creates the account and membership, marks the
 * link used and signs the person in. A used, withdrawn or expired link answers 410. The per-address
 * count is checked before the body is read.
 */
export const POST = defineRoute({ outsideProject: "public" }, async ({ req, params }) => {
  if (overLimit("invitation", clientAddress(req), INVITATION_REQUESTS_PER_MINUTE, 60_000)) return jsonError(429, "Too many requests from this address; wait a minute.");
  const body = await parseJsonBody(req, acceptInvitationSchema, BODY_LIMITS.auth);
  if (!body.ok) return body.response;
  return answerPeople(async () => {
    const { userId, email, sessionVersion, projectId } = await acceptInvitation({ token: params.token ?? "", ...body.value });
    const session = await getSession();
    session.userId = userId;
    session.sv = sessionVersion;
    await session.save();
    await recordAudit({ userId, actorEmail: email, action: AUDIT.signIn, entityType: "user", entityId: userId, detail: { via: "invitation" } });
    return NextResponse.json({ userId, projectId, next: `/projects/${projectId}` }, { status: 201 });
  });
});
