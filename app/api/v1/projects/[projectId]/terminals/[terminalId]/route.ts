import { deleteTerminal, respond, updateTerminal } from "@/lib/server/design";
import { defineRoute } from "@/lib/server/route";
import { DESIGN } from "@/lib/validation/design";

const project = { param: "projectId", action: "design.edit" } as const;

export const PATCH = defineRoute({ body: DESIGN.terminalPatch, project }, async ({ access, user, body, params }) =>
  respond(await updateTerminal(user, access!.project, params.terminalId ?? "", body)),
);

/** Refused (409) while the terminal has readings. */
export const DELETE = defineRoute({ project }, async ({ access, user, params }) => respond(await deleteTerminal(user, access!.project, params.terminalId ?? "")));
