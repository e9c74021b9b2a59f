/**
 * Photos of traverse locations: received while streaming (bounded), typed from their bytes, given a
 * thumbnail, stored in object storage, then recorded. A failed or interrupted upload leaves neither a
 * row nor an object. Route handlers call these after the project check.
 */
import crypto from "node:crypto";
import { NextResponse } from "next/server";
import { getDb } from "@/db/client";
import { recordAudit } from "@/db/queries/audit";
import { isUuid } from "@/db/queries/projects";
import { getPhoto, getProjectSection, getSectionApprovalState, listSectionPhotos } from "@/db/queries/uploads";
import { photos } from "@/db/schema";
import { eq } from "drizzle-orm";
import { withSlot } from "./limits";
import { readMultipartFile } from "./multipart";
import { jsonError } from "./route";
import { deleteObjectsQuietly, getObject, objectResponse, putObject } from "./storage";
import { describeImage, detectUploadType, EXTENSIONS, UPLOAD_LIMIT_WORDS, UPLOAD_MAX_BYTES } from "./upload-files";

const NO_SECTION = "No such duct section in this project.";
/** Uploads processed at once per server: each holds up to 10 MB and a decoded image. */
const MAX_CONCURRENT_UPLOADS = 4;
const MAX_CAPTION = 500;

export type PhotoView = Awaited<ReturnType<typeof listSectionPhotos>>[number] & { url: string; thumbUrl: string };

function view(projectId: string, p: Omit<PhotoView, "url" | "thumbUrl">): PhotoView {
  const url = `/api/v1/projects/${projectId}/sections/${p.sectionId}/photos/${p.id}`;
  return { ...p, url, thumbUrl: `${url}?thumb=1` };
}

export async function listPhotosResponse({ projectId, sectionId }: { projectId: string; sectionId: string }): Promise<Response> {
  if (!isUuid(sectionId) || !(await getProjectSection({ projectId, sectionId }))) return jsonError(404, NO_SECTION);
  const rows = await listSectionPhotos({ projectId, sectionId });
  return NextResponse.json({ photos: rows.map((p) => view(projectId, p)) });
}

export async function uploadPhoto({ req, projectId, sectionId, userId }: { req: Request; projectId: string; sectionId: string; userId: string }): Promise<Response> {
  if (!isUuid(sectionId)) return jsonError(404, NO_SECTION);
  const section = await getProjectSection({ projectId, sectionId });
  if (!section) return jsonError(404, NO_SECTION);
  return withSlot(
    "uploads",
    MAX_CONCURRENT_UPLOADS,
    () => receive({ req, projectId, sectionId, userId }),
    () => jsonError(503, "Several uploads are being processed right now; try again in a moment."),
  );
}

async function receive({ req, projectId, sectionId, userId }: { req: Request; projectId: string; sectionId: string; userId: string }): Promise<Response> {
  const body = await readMultipartFile(req, { maxFileBytes: UPLOAD_MAX_BYTES, limitWords: UPLOAD_LIMIT_WORDS, fieldNames: ["caption", "traverseId"], maxFieldChars: MAX_CAPTION });
  if (!body.ok) return jsonError(body.status, body.message, body.field ? { [body.field]: body.message } : undefined);
  if (!body.file) return jsonError(400, 'Attach the photo in the field "file".', { file: "Choose a photo." });
  const traverseId = body.fields.traverseId?.trim() || null;
  if (traverseId) {
    const state = isUuid(traverseId) ? await getSectionApprovalState({ sectionId, traverseId }) : { traverseFound: false };
    if (!state.traverseFound) return jsonError(400, "That traverse is not one of this section's.", { traverseId: `No traverse ${traverseId.slice(0, 40)} on this section.` });
  }
  const type = await detectUploadType(body.file.bytes, ["image/jpeg", "image/png"]);
  if (!type.ok) return jsonError(400, type.message, { file: type.message });
  let facts;
  try {
    facts = await describeImage(body.file.bytes);
  } catch {
    const message = "The image could not be read: it may be damaged, or larger than 60 megapixels. Nothing was saved.";
    return jsonError(400, message, { file: message });
  }

  const id = crypto.randomUUID();
  const base = `projects/${projectId}/sections/${sectionId}/photos/${id}`;
  const objectKey = `${base}.${EXTENSIONS[type.type]}`;
  const thumbKey = `${base}.thumb.jpg`;
  const written: string[] = [];
  let row;
  try {
    await putObject({ key: objectKey, body: body.file.bytes, contentType: type.type });
    written.push(objectKey);
    await putObject({ key: thumbKey, body: facts.thumbnail, contentType: "image/jpeg" });
    written.push(thumbKey);
    const db = await getDb();
    [row] = await db
      .insert(photos)
      .values({
        id,
        projectId,
        sectionId,
        traverseId,
        objectKey,
        thumbKey,
        contentType: type.type,
        bytes: body.file.bytes.byteLength,
        width: facts.width,
        height: facts.height,
        fileName: body.file.fileName,
        caption: (body.fields.caption ?? "").trim(),
        takenBy: userId,
      })
      .returning();
  } catch (err) {
    await deleteObjectsQuietly(written);
    throw err;
  }
  await recordAudit({ userId, projectId, action: "photo.added", entityType: "photo", entityId: id, detail: { sectionId, traverseId, bytes: row!.bytes, contentType: type.type, fileName: row!.fileName } });
  const [listed] = (await listSectionPhotos({ projectId, sectionId })).filter((p) => p.id === id);
  return NextResponse.json({ photo: view(projectId, listed!) }, { status: 201 });
}

export async function downloadPhoto({ projectId, sectionId, photoId, thumb }: { projectId: string; sectionId: string; photoId: string; thumb: boolean }): Promise<Response> {
  if (!isUuid(sectionId) || !isUuid(photoId)) return jsonError(404, "No such photo in this project.");
  const photo = await getPhoto({ projectId, sectionId, photoId });
  if (!photo) return jsonError(404, "No such photo in this project.");
  const key = thumb && photo.thumbKey ? photo.thumbKey : photo.objectKey;
  const obj = await getObject(key);
  if (!obj) return jsonError(404, "The photo's file is missing from storage.");
  const name = photo.fileName || `photo.${photo.contentType === "image/png" ? "png" : "jpg"}`;
  return objectResponse(obj, { contentType: thumb && photo.thumbKey ? "image/jpeg" : photo.contentType, fileName: thumb ? `thumbnail-${name.replace(/\.\w+$/, "")}.jpg` : name });
}

/** The technician who took a photo may remove it while the section's data are not approved. */
export async function removePhoto({ projectId, sectionId, photoId, userId }: { projectId: string; sectionId: string; photoId: string; userId: string }): Promise<Response> {
  if (!isUuid(sectionId) || !isUuid(photoId)) return jsonError(404, "No such photo in this project.");
  const photo = await getPhoto({ projectId, sectionId, photoId });
  if (!photo) return jsonError(404, "No such photo in this project.");
  if (photo.takenBy !== userId) return jsonError(403, "Only the technician who took this photo can remove it.");
  const state = await getSectionApprovalState({ sectionId, traverseId: photo.traverseId });
  if (state.latestStatus === "approved" || state.traverseStatus === "approved") {
    return jsonError(409, "This section's readings are approved, so its photos are part of the record and stay. A re-traverse opens it again.");
  }
  const db = await getDb();
  // Row first: an object without a row is harmless, a row without its object is not.
  await db.delete(photos).where(eq(photos.id, photo.id));
  await deleteObjectsQuietly([photo.objectKey, ...(photo.thumbKey ? [photo.thumbKey] : [])]);
  await recordAudit({ userId, projectId, action: "photo.removed", entityType: "photo", entityId: photo.id, detail: { sectionId, fileName: photo.fileName } });
  return new Response(null, { status: 204 });
}
