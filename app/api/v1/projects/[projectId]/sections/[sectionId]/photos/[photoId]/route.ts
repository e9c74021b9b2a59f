import { downloadPhoto, removePhoto } from "@/lib/server/photos";
import { defineRoute } from "@/lib/server/route";

/** The photo as taken (`?thumb=1`: its thumbnail), through the project check; never a bucket URL. */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ req, access, params }) =>
  downloadPhoto({ projectId: access.project.id, sectionId: params.sectionId ?? "", photoId: params.photoId ?? "", thumb: req.nextUrl.searchParams.get("thumb") === "1" }),
);

/** The technician who took it removes it, while the section's readings are not approved. */
export const DELETE = defineRoute({ project: { param: "projectId", action: "photo.add" } }, async ({ access, params, user }) =>
  removePhoto({ projectId: access.project.id, sectionId: params.sectionId ?? "", photoId: params.photoId ?? "", userId: user.id }),
);
