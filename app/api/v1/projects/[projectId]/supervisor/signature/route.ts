import { NextResponse } from "next/server";
import { answerPeople } from "@/lib/server/people-http";
import { clientAddress } from "@/lib/server/request";
import { BODY_LIMITS, defineRoute } from "@/lib/server/route";
import { signCertification } from "@/lib/server/supervisor";
import { signCertificationSchema } from "@/lib/validation/people";

/** The designated TAB supervisor signs the certification statement, confirming with their password (`{password, confirm: true}`). */
export const POST = defineRoute(
  { body: signCertificationSchema, maxBodyBytes: BODY_LIMITS.auth, project: { param: "projectId", action: "supervisor.sign" } },
  async ({ req, access, user, body }) =>
    answerPeople(async () => {
      const s = await signCertification({ projectId: access.project.id, user, password: body.password, client: clientAddress(req) });
      return NextResponse.json({ signature: { name: s.name, certifyingBody: s.certifyingBody, certificateNumber: s.certificateNumber, statement: s.statement, signedAt: s.signedAt } }, { status: 201 });
    }),
);
