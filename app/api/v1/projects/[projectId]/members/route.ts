import { NextResponse } from "next/server";
import { listOpenInvitations, listProjectMembers } from "@/db/queries/members";
import { can } from "@/lib/auth/policy";
import { defineRoute } from "@/lib/server/route";
import { getSupervisorState } from "@/lib/server/supervisor";

/** The project's members with their roles, its TAB supervisor, and (for those who invite) open invitations. */
export const GET = defineRoute({ project: { param: "projectId", action: "members.view" } }, async ({ access, user }) => {
  const projectId = access.project.id;
  const [members, supervisor] = await Promise.all([listProjectMembers({ projectId }), getSupervisorState({ projectId })]);
  const invitations = can(user, access.role, "members.invite") ? await listOpenInvitations({ projectId }) : undefined;
  return NextResponse.json({
    members,
    supervisor: supervisor.designation && {
      ...supervisor.designation,
      statement: supervisor.statement,
      signedAt: supervisor.signature?.signedAt ?? null,
    },
    ...(invitations ? { invitations } : {}),
  });
});
