/**
 * Calibration certificates of the instrument register: JPEG, PNG or PDF, typed from their bytes,
 * stored in object storage; the newest is the instrument's current certificate, older ones stay.
 */
import crypto from "node:crypto";
import { NextResponse } from "next/server";
import { getDb } from "@/db/client";
import { recordAudit } from "@/db/queries/audit";
import { isUuid } from "@/db/queries/projects";
import { getInstrument } from "@/db/queries/instruments";
import { getCurrentCertificate } from "@/db/queries/uploads";
import { instrumentCertificates } from "@/db/schema";
import type { CertificateItem } from "@/lib/api-client/uploads";
import { withSlot } from "./limits";
import { readMultipartFile } from "./multipart";
import { jsonError } from "./route";
import { deleteObjectsQuietly, getObject, objectResponse, putObject } from "./storage";
import { describeImage, detectUploadType, EXTENSIONS, UPLOAD_LIMIT_WORDS, UPLOAD_MAX_BYTES } from "./upload-files";

const NO_INSTRUMENT = "No such instrument in the register.";

/** A certificate as the API and the instrument page show it; its file only ever through our route. */
function view(c: typeof instrumentCertificates.$inferSelect & { uploadedByName?: string | null }) {
  const url = `/api/v1/instruments/${c.instrumentId}/certificate`;
  return {
    id: c.id,
    instrumentId: c.instrumentId,
    contentType: c.contentType,
    bytes: c.bytes,
    fileName: c.fileName,
    uploadedBy: c.uploadedBy,
    uploadedByName: c.uploadedByName ?? null,
    createdAt: c.createdAt,
    url,
    thumbUrl: c.thumbKey ? `${url}?thumb=1` : null,
  };
}

/** The instrument's current certificate for a page's first render (dates as strings), or null. */
export async function currentCertificateForClient({ instrumentId }: { instrumentId: string }) {
  const cert = await getCurrentCertificate({ instrumentId });
  return cert ? (JSON.parse(JSON.stringify(view(cert))) as CertificateView) : null;
}

export type CertificateView = CertificateItem;

export async function uploadCertificate({ req, instrumentId, userId }: { req: Request; instrumentId: string; userId: string }): Promise<Response> {
  if (!isUuid(instrumentId) || !(await getInstrument({ id: instrumentId }))) return jsonError(404, NO_INSTRUMENT);
  return withSlot("uploads", 4, () => receive({ req, instrumentId, userId }), () => jsonError(503, "Several uploads are being processed right now; try again in a moment."));
}

async function receive({ req, instrumentId, userId }: { req: Request; instrumentId: string; userId: string }): Promise<Response> {
  const body = await readMultipartFile(req, { maxFileBytes: UPLOAD_MAX_BYTES, limitWords: UPLOAD_LIMIT_WORDS });
  if (!body.ok) return jsonError(body.status, body.message, body.field ? { [body.field]: body.message } : undefined);
  if (!body.file) return jsonError(400, 'Attach the certificate in the field "file".', { file: "Choose the certificate file." });
  const type = await detectUploadType(body.file.bytes, ["application/pdf", "image/jpeg", "image/png"]);
  if (!type.ok) return jsonError(400, type.message, { file: type.message });
  let thumbnail: Buffer | null = null;
  if (type.type !== "application/pdf") {
    try {
      thumbnail = (await describeImage(body.file.bytes)).thumbnail;
    } catch {
      const message = "The image could not be read: it may be damaged. Nothing was saved.";
      return jsonError(400, message, { file: message });
    }
  }
  const id = crypto.randomUUID();
  const objectKey = `instruments/${instrumentId}/certificates/${id}.${EXTENSIONS[type.type]}`;
  const thumbKey = thumbnail ? `instruments/${instrumentId}/certificates/${id}.thumb.jpg` : null;
  const written: string[] = [];
  let row;
  try {
    await putObject({ key: objectKey, body: body.file.bytes, contentType: type.type });
    written.push(objectKey);
    if (thumbnail && thumbKey) {
      await putObject({ key: thumbKey, body: thumbnail, contentType: "image/jpeg" });
      written.push(thumbKey);
    }
    const db = await getDb();
    [row] = await db
      .insert(instrumentCertificates)
      .values({ id, instrumentId, objectKey, thumbKey, contentType: type.type, bytes: body.file.bytes.byteLength, fileName: body.file.fileName, uploadedBy: userId })
      .returning();
  } catch (err) {
    await deleteObjectsQuietly(written);
    throw err;
  }
  await recordAudit({ userId, projectId: null, action: "instrument.certificate_added", entityType: "instrument", entityId: instrumentId, detail: { certificateId: id, bytes: row!.bytes, contentType: type.type, fileName: row!.fileName } });
  const current = await getCurrentCertificate({ instrumentId });
  return NextResponse.json({ certificate: view(current?.id === id ? current : row!) }, { status: 201 });
}

export async function downloadCertificate({ instrumentId, thumb }: { instrumentId: string; thumb: boolean }): Promise<Response> {
  if (!isUuid(instrumentId) || !(await getInstrument({ id: instrumentId }))) return jsonError(404, NO_INSTRUMENT);
  const cert = await getCurrentCertificate({ instrumentId });
  if (!cert) return jsonError(404, "This instrument has no calibration certificate on file yet.");
  if (thumb && !cert.thumbKey) return jsonError(404, "This certificate is a PDF and has no thumbnail; download the file itself.");
  const obj = await getObject(thumb ? cert.thumbKey! : cert.objectKey);
  if (!obj) return jsonError(404, "The certificate's file is missing from storage.");
  return objectResponse(obj, { contentType: thumb ? "image/jpeg" : cert.contentType, fileName: cert.fileName || `certificate.${EXTENSIONS[cert.contentType as keyof typeof EXTENSIONS] ?? "bin"}` });
}
