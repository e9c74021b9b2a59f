import { NextResponse } from "next/server";
import { answerPeople } from "@/lib/server/people-http";
import { defineRoute } from "@/lib/server/route";
import { signCertification } from "@/lib/server/supervisor";
import { signCertificationSchema } from "@/lib/validation/people";

/** The designated TAB supervisor signs the certification statement, confirming with their password (`{password, confirm: true}`). */
export const POST = defineRoute({ body: signCertificationSchema, project: { param: "projectId", action: "supervisor.sign" } }, async ({ access, user, body }) =>
  answerPeople(async () => {
    const s = await signCertification({ projectId: access!.project.id, user, password: body.password });
    return NextResponse.json({ signature: { name: s.name, certifyingBody: s.certifyingBody, certificateNumber: s.certificateNumber, statement: s.statement, signedAt: s.signedAt } }, { status: 201 });
  }),
);
