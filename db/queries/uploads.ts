import "server-only";
import { and, asc, desc, eq } from "drizzle-orm";
import { getDb } from "../client";
import { airSystems, ductSections, instrumentCertificates, photos, traverses, users } from "../schema";

/** A duct section of this project (null for another project's section or an unknown id). */
export async function getProjectSection({ projectId, sectionId }: { projectId: string; sectionId: string }) {
  const db = await getDb();
  const [row] = await db
    .select({ id: ductSections.id, tag: ductSections.tag, systemTag: airSystems.tag })
    .from(ductSections)
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(and(eq(ductSections.id, sectionId), eq(airSystems.projectId, projectId)));
  return row ?? null;
}

/** Status of a section's newest traverse (null when none), and of one traverse of it if asked. */
export async function getSectionApprovalState({ sectionId, traverseId }: { sectionId: string; traverseId?: string | null }) {
  const db = await getDb();
  const [latest] = await db.select({ status: traverses.status }).from(traverses).where(eq(traverses.sectionId, sectionId)).orderBy(desc(traverses.createdAt)).limit(1);
  let traverse: { status: string } | null = null;
  if (traverseId) [traverse = null] = await db.select({ status: traverses.status }).from(traverses).where(and(eq(traverses.id, traverseId), eq(traverses.sectionId, sectionId)));
  return { latestStatus: latest?.status ?? null, traverseStatus: traverse?.status ?? null, traverseFound: traverse !== null };
}

const photoColumns = {
  id: photos.id,
  sectionId: photos.sectionId,
  traverseId: photos.traverseId,
  contentType: photos.contentType,
  bytes: photos.bytes,
  width: photos.width,
  height: photos.height,
  fileName: photos.fileName,
  caption: photos.caption,
  takenBy: photos.takenBy,
  takenByName: users.name,
  createdAt: photos.createdAt,
};

export async function listSectionPhotos({ projectId, sectionId }: { projectId: string; sectionId: string }) {
  const db = await getDb();
  return db
    .select(photoColumns)
    .from(photos)
    .leftJoin(users, eq(users.id, photos.takenBy))
    .where(and(eq(photos.projectId, projectId), eq(photos.sectionId, sectionId)))
    .orderBy(asc(photos.createdAt))
    .limit(200);
}

/** A photo with its storage keys, only when it belongs to this project and section. */
export async function getPhoto({ projectId, sectionId, photoId }: { projectId: string; sectionId: string; photoId: string }) {
  const db = await getDb();
  const [row] = await db.select().from(photos).where(and(eq(photos.id, photoId), eq(photos.projectId, projectId), eq(photos.sectionId, sectionId)));
  return row ?? null;
}

/** The newest calibration certificate of an instrument, with the name of whoever attached it. */
export async function getCurrentCertificate({ instrumentId }: { instrumentId: string }) {
  const db = await getDb();
  const [row] = await db
    .select({ certificate: instrumentCertificates, uploadedByName: users.name })
    .from(instrumentCertificates)
    .leftJoin(users, eq(users.id, instrumentCertificates.uploadedBy))
    .where(eq(instrumentCertificates.instrumentId, instrumentId))
    .orderBy(desc(instrumentCertificates.createdAt))
    .limit(1);
  return row ? { ...row.certificate, uploadedByName: row.uploadedByName } : null;
}

/** Every stored object of an instrument's certificates (files and thumbnails), to remove with the instrument. */
export async function listCertificateObjectKeys({ instrumentId }: { instrumentId: string }): Promise<string[]> {
  const db = await getDb();
  const rows = await db.select({ objectKey: instrumentCertificates.objectKey, thumbKey: instrumentCertificates.thumbKey }).from(instrumentCertificates).where(eq(instrumentCertificates.instrumentId, instrumentId));
  return rows.flatMap((r) => (r.thumbKey ? [r.objectKey, r.thumbKey] : [r.objectKey]));
}
