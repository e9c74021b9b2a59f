import { listPhotosResponse, uploadPhoto } from "@/lib/server/photos";
import { defineRoute } from "@/lib/server/route";

/** The photos of a traverse location (duct section), oldest first, with their file and thumbnail links. */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ access, params }) =>
  listPhotosResponse({ projectId: access.project.id, sectionId: params.sectionId ?? "" }),
);

/** A technician attaches a photo (multipart: `file`, optional `caption`, `traverseId`): JPEG or PNG, at most 10 MB. */
export const POST = defineRoute({ project: { param: "projectId", action: "photo.add" } }, async ({ req, access, params, user }) =>
  uploadPhoto({ req, projectId: access.project.id, sectionId: params.sectionId ?? "", userId: user.id }),
);
