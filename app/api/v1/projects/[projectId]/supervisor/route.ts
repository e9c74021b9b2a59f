import { NextResponse } from "next/server";
import { answerPeople } from "@/lib/server/people-http";
import { BODY_LIMITS, defineRoute } from "@/lib/server/route";
import { clearSupervisor, designateSupervisor, getSupervisorState } from "@/lib/server/supervisor";
import { supervisorSchema } from "@/lib/validation/people";

function view(state: Awaited<ReturnType<typeof getSupervisorState>>) {
  return {
    supervisor: state.designation,
    statement: state.statement,
    signature: state.signature && { name: state.signature.name, certifyingBody: state.signature.certifyingBody, certificateNumber: state.signature.certificateNumber, statement: state.signature.statement, signedAt: state.signature.signedAt },
  };
}

/** The project's TAB supervisor, the statement they sign, and their current signature (if signed). */
export const GET = defineRoute({ project: { param: "projectId", action: "members.view" } }, async ({ access }) => NextResponse.json(view(await getSupervisorState({ projectId: access.project.id }))));

/** Designate a technician member as the certified TAB supervisor (`{userId, certifyingBody, certificateNumber}`). */
export const PUT = defineRoute({ body: supervisorSchema, maxBodyBytes: BODY_LIMITS.form, project: { param: "projectId", action: "members.invite" } }, async ({ access, user, body }) =>
  answerPeople(async () => NextResponse.json(view(await designateSupervisor({ projectId: access.project.id, ...body, by: user })))),
);

/** End the designation (past signatures stay on record). */
export const DELETE = defineRoute({ project: { param: "projectId", action: "members.invite" } }, async ({ access, user }) =>
  answerPeople(async () => {
    await clearSupervisor({ projectId: access.project.id, by: user });
    return new Response(null, { status: 204 });
  }),
);
