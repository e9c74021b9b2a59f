import { NextResponse } from "next/server";
import { AUDIT, recordAudit } from "@/db/queries/audit";
import { bumpSessionVersion } from "@/db/queries/users";
import { getSession } from "@/lib/auth/session";
import { defineRoute } from "@/lib/server/route";

/** Ends every session of the caller, on every device, this one included (a lost tablet, a shared login). */
export const POST = defineRoute({ outsideProject: "signed-in" }, async ({ user }) => {
  await bumpSessionVersion({ id: user.id });
  const session = await getSession();
  session.destroy();
  await recordAudit({ userId: user.id, actorEmail: user.email, action: AUDIT.signOutEverywhere, entityType: "user", entityId: user.id });
  return new NextResponse(null, { status: 204 });
});
