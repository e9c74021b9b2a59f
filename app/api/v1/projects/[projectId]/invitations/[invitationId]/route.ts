import { revokeInvitation } from "@/lib/server/invitations";
import { answerPeople } from "@/lib/server/people-http";
import { defineRoute } from "@/lib/server/route";

/** Withdraw an open invitation; its link stops working. */
export const DELETE = defineRoute({ project: { param: "projectId", action: "members.invite" } }, async ({ access, params, user }) =>
  answerPeople(async () => {
    await revokeInvitation({ projectId: access.project.id, invitationId: params.invitationId ?? "", by: user });
    return new Response(null, { status: 204 });
  }),
);
