import { deleteSection, respond, updateSection } from "@/lib/server/design";
import { defineRoute } from "@/lib/server/route";
import { DESIGN } from "@/lib/validation/design";

const project = { param: "projectId", action: "design.edit" } as const;

/** Edit a section, or move it under another parent of the same system (never below its own branches). */
export const PATCH = defineRoute({ body: DESIGN.sectionPatch, project }, async ({ access, user, body, params }) =>
  respond(await updateSection(user, access!.project, params.sectionId ?? "", body)),
);

/** Deletes the section with the sections and terminals below it; refused (409) while any of them holds field data. */
export const DELETE = defineRoute({ project }, async ({ access, user, params }) => respond(await deleteSection(user, access!.project, params.sectionId ?? "")));
