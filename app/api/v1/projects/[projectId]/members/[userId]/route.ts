import { NextResponse } from "next/server";
import { changeMemberRole, removeMember } from "@/lib/server/members";
import { answerPeople } from "@/lib/server/people-http";
import { BODY_LIMITS, defineRoute } from "@/lib/server/route";
import { changeRoleSchema } from "@/lib/validation/people";

/** Change a member's role (`{role}`). Engineers of record, and one's own membership, are changed by site administrators. */
export const PATCH = defineRoute({ body: changeRoleSchema, maxBodyBytes: BODY_LIMITS.form, project: { param: "projectId", action: "members.invite" } }, async ({ access, params, user, body }) =>
  answerPeople(async () => NextResponse.json({ member: await changeMemberRole({ projectId: access.project.id, userId: params.userId ?? "", role: body.role, by: user }) })),
);

/** Remove a member from the project (their account and past records stay). */
export const DELETE = defineRoute({ project: { param: "projectId", action: "members.invite" } }, async ({ access, params, user }) =>
  answerPeople(async () => {
    await removeMember({ projectId: access.project.id, userId: params.userId ?? "", by: user });
    return new Response(null, { status: 204 });
  }),
);
