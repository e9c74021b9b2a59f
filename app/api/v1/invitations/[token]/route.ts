import { NextResponse } from "next/server";
import { ROLE_LABELS } from "@/lib/auth/policy";
import { findInvitation, INVITATION_REQUESTS_PER_MINUTE } from "@/lib/server/invitations";
import { overLimit } from "@/lib/server/limits";
import { clientAddress } from "@/lib/server/request";
import { defineRoute, jsonError } from "@/lib/server/route";

export const dynamic = "force-dynamic";

/** Public: what an invitation link is for (project, role, address, expiry), or why it no longer works. */
export const GET = defineRoute({ outsideProject: "public" }, async ({ req, params }) => {
  if (overLimit("invitation", clientAddress(req), INVITATION_REQUESTS_PER_MINUTE, 60_000)) return jsonError(429, "Too many requests from this address; wait a minute.");
  const found = await findInvitation(params.token ?? "");
  if (!found.ok) return jsonError(found.status, found.message);
  const inv = found.invitation;
  return NextResponse.json({
    invitation: { email: inv.email, role: inv.role, roleLabel: ROLE_LABELS[inv.role], project: found.projectName, site: found.siteName, invitedBy: found.invitedByName, expiresAt: inv.expiresAt },
  });
});
