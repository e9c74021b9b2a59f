import { NextResponse } from "next/server";
import { AUDIT, recordAudit } from "@/db/queries/audit";
import { getSession } from "@/lib/auth/session";
import { defineRoute } from "@/lib/server/route";

/** Ends this device's session. Public so that a stale or revoked cookie can always be cleared. */
export const POST = defineRoute({ outsideProject: "public" }, async ({ getUser }) => {
  const user = await getUser();
  const session = await getSession();
  session.destroy();
  if (user) await recordAudit({ userId: user.id, actorEmail: user.email, action: AUDIT.signOut, entityType: "user", entityId: user.id });
  return new NextResponse(null, { status: 204 });
});
