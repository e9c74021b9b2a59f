import { NextResponse } from "next/server";
import { listOpenInvitations } from "@/db/queries/members";
import { inviteToProject } from "@/lib/server/invitations";
import { answerPeople } from "@/lib/server/people-http";
import { BODY_LIMITS, defineRoute } from "@/lib/server/route";
import { inviteSchema } from "@/lib/validation/people";

/** Open invitations of the project (not used, not withdrawn), newest first. */
export const GET = defineRoute({ project: { param: "projectId", action: "members.invite" } }, async ({ access }) =>
  NextResponse.json({ invitations: await listOpenInvitations({ projectId: access.project.id }) }),
);

/**
 * Invite an e-mail address with a role (`{email, role}`): a single-use link valid for 72 hours goes out by
 * e-mail. An address that already has an account is added at once (`member` instead of `invitation`).
 */
export const POST = defineRoute({ body: inviteSchema, maxBodyBytes: BODY_LIMITS.form, project: { param: "projectId", action: "members.invite" } }, async ({ access, user, body }) =>
  answerPeople(async () => NextResponse.json(await inviteToProject({ projectId: access.project.id, email: body.email, role: body.role, by: user }), { status: 201 })),
);
