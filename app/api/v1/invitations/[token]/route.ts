import { NextResponse, type NextRequest } from "next/server";
import { ROLE_LABELS } from "@/lib/auth/policy";
import { findInvitation } from "@/lib/server/invitations";
import { clientAddress, overLimit } from "@/lib/server/limits";
import { jsonError } from "@/lib/server/route";

export const dynamic = "force-dynamic";

/** Public: what an invitation link is for (project, role, address, expiry), or why it no longer works. */
export async function GET(req: NextRequest, ctx: { params: Promise<{ token: string }> }) {
  try {
    if (overLimit("invitation", clientAddress(req), 60, 60_000)) return jsonError(429, "Too many requests from this address; wait a minute.");
    const found = await findInvitation((await ctx.params).token);
    if (!found.ok) return jsonError(found.status, found.message);
    const inv = found.invitation;
    return NextResponse.json(
      { invitation: { email: inv.email, role: inv.role, roleLabel: ROLE_LABELS[inv.role], project: found.projectName, site: found.siteName, invitedBy: found.invitedByName, expiresAt: inv.expiresAt } },
      { headers: { "cache-control": "no-store" } },
    );
  } catch (err) {
    console.error("[api] GET /api/v1/invitations/{token} failed", err);
    return jsonError(500, "Something went wrong on the server; try again.");
  }
}
