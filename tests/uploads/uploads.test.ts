import { and, eq, isNull } from "drizzle-orm";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as s from "@/db/schema";
import type { LocalObjectStore } from "@/lib/cli/local-object-store";
import { downloadCertificate, uploadCertificate } from "@/lib/server/certificates";
import { downloadPhoto, listPhotosResponse, removePhoto, uploadPhoto } from "@/lib/server/photos";
import { listObjectKeys } from "@/lib/server/storage";
import { demoDatabase } from "../support/db";
import { useLocalObjectStore } from "../support/object-store";
import { makeTestPdf } from "../support/pdf";

let store: LocalObjectStore;
let demo: Awaited<ReturnType<typeof demoDatabase>>;
let sectionId: string;
let instrumentId: string;

beforeAll(async () => {
  store = await useLocalObjectStore();
  demo = await demoDatabase();
  // A section with no traverse yet, so the test decides its approval state.
  const [section] = await demo.db
    .select({ id: s.ductSections.id })
    .from(s.ductSections)
    .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
    .leftJoin(s.traverses, eq(s.traverses.sectionId, s.ductSections.id))
    .where(and(eq(s.airSystems.projectId, demo.library.id), isNull(s.traverses.id)))
    .limit(1);
  sectionId = section!.id;
  const [instrument] = await demo.db.insert(s.instruments).values({ kind: "manometer", serial: "UPL-1", make: "Test", model: "M" }).returning();
  instrumentId = instrument!.id;
});
afterAll(async () => {
  await store.stop();
});

const BOUNDARY = "----airtally-test-boundary";

function multipart(parts: { name: string; value: Uint8Array | string; fileName?: string; type?: string }[]): Uint8Array {
  const chunks: Buffer[] = [];
  for (const p of parts) {
    const head = p.fileName
      ? `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${p.name}"; filename="${p.fileName}"\r\nContent-Type: ${p.type ?? "application/octet-stream"}\r\n\r\n`
      : `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${p.name}"\r\n\r\n`;
    chunks.push(Buffer.from(head), Buffer.from(p.value), Buffer.from("\r\n"));
  }
  chunks.push(Buffer.from(`--${BOUNDARY}--\r\n`));
  return Buffer.concat(chunks);
}

function request(body: Uint8Array | ReadableStream<Uint8Array>, { length = true } = {}): Request {
  const headers: Record<string, string> = { "content-type": `multipart/form-data; boundary=${BOUNDARY}` };
  if (length && body instanceof Uint8Array) headers["content-length"] = String(body.byteLength);
  return new Request("http://localhost/upload", { method: "POST", body, headers, duplex: "half" } as RequestInit);
}

/** A body that streams in chunks without declaring its length. */
function chunked(bytes: Uint8Array, { failAfter }: { failAfter?: number } = {}): ReadableStream<Uint8Array> {
  let offset = 0;
  return new ReadableStream({
    pull(controller) {
      if (failAfter !== undefined && offset >= failAfter) {
        controller.error(new Error("connection reset by the client"));
        return;
      }
      if (offset >= bytes.byteLength) return controller.close();
      const end = Math.min(offset + 64 * 1024, failAfter ?? Infinity, bytes.byteLength);
      controller.enqueue(bytes.subarray(offset, end));
      offset = end;
    },
  });
}

async function jpeg(width = 1600, height = 1200): Promise<Buffer> {
  return sharp({ create: { width, height, channels: 3, background: { r: 120, g: 140, b: 160 } } }).jpeg().toBuffer();
}

async function rowsAndObjects() {
  const rows = await demo.db.select().from(s.photos);
  const objects = await listObjectKeys(`projects/${demo.library.id}/sections/`);
  return { rows: rows.length, objects: objects.length };
}

const upload = (req: Request, userId = demo.tech.id) => uploadPhoto({ req, projectId: demo.library.id, sectionId, userId });

describe("photos of traverse locations", () => {
  let photoId: string;

  it("stores a camera JPEG with a thumbnail and lists it", async () => {
    const res = await upload(request(multipart([{ name: "file", value: await jpeg(), fileName: "IMG_0042.JPG", type: "image/jpeg" }, { name: "caption", value: "Test port on the trunk, 3 m after the coil" }])));
    expect(res.status).toBe(201);
    const { photo } = (await res.json()) as { photo: { id: string; width: number; height: number; caption: string; thumbUrl: string; contentType: string } };
    expect(photo).toMatchObject({ width: 1600, height: 1200, contentType: "image/jpeg", caption: "Test port on the trunk, 3 m after the coil" });
    photoId = photo.id;
    const thumb = await downloadPhoto({ projectId: demo.library.id, sectionId, photoId, thumb: true });
    expect(thumb.headers.get("content-type")).toBe("image/jpeg");
    const meta = await sharp(Buffer.from(await thumb.arrayBuffer())).metadata();
    expect(Math.max(meta.width!, meta.height!)).toBe(480);
    const list = (await (await listPhotosResponse({ projectId: demo.library.id, sectionId })).json()) as { photos: unknown[] };
    expect(list.photos).toHaveLength(1);
    expect(await rowsAndObjects()).toEqual({ rows: 1, objects: 2 });
  });

  it("refuses a renamed executable with a .jpg name, by its bytes", async () => {
    const exe = Buffer.alloc(4096);
    exe.write("MZ", 0, "latin1");
    exe.writeUInt32LE(0x80, 0x3c);
    exe.write("PE\0\0", 0x80, "latin1");
    const res = await upload(request(multipart([{ name: "file", value: exe, fileName: "holiday.jpg", type: "image/jpeg" }])));
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: { message: string; fields: Record<string, string> } };
    expect(body.error.message).toMatch(/Only JPEG or PNG files are accepted here.*EXE/);
    expect(body.error.fields.file).toBeDefined();
    expect(await rowsAndObjects()).toEqual({ rows: 1, objects: 2 });
  });

  it("refuses an 11 MB file before reading it when its length is declared, and cuts it off when it is not", async () => {
    const big = Buffer.concat([await jpeg(64, 64), Buffer.alloc(11 * 1024 * 1024)]);
    const body = multipart([{ name: "file", value: big, fileName: "huge.jpg", type: "image/jpeg" }]);
    let pulled = 0;
    const watched = new ReadableStream<Uint8Array>(
      {
        pull(controller) {
          pulled++;
          controller.enqueue(body.subarray(0, 1024));
          controller.close();
        },
      },
      // Nothing is pulled until someone reads.
      { highWaterMark: 0 },
    );
    const declared = new Request("http://localhost/upload", { method: "POST", body: watched, duplex: "half", headers: { "content-type": `multipart/form-data; boundary=${BOUNDARY}`, "content-length": String(body.byteLength) } } as RequestInit);
    const refused = await upload(declared);
    expect(refused.status).toBe(413);
    expect(((await refused.json()) as { error: { message: string } }).error.message).toMatch(/larger than 10 MB/);
    expect(pulled).toBe(0);

    const streamed = await upload(request(chunked(body), { length: false }));
    expect(streamed.status).toBe(413);
    expect(await rowsAndObjects()).toEqual({ rows: 1, objects: 2 });
  });

  it("leaves nothing behind when the upload is interrupted half-way", async () => {
    const body = multipart([{ name: "file", value: await jpeg(2400, 1800), fileName: "cut.jpg", type: "image/jpeg" }]);
    const res = await upload(request(chunked(body, { failAfter: Math.floor(body.byteLength / 2) }), { length: false }));
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/cut off/);
    // A body that simply ends early (no closing boundary) is refused the same way.
    const truncated = await upload(request(body.subarray(0, Math.floor(body.byteLength / 2))));
    expect(truncated.status).toBe(400);
    expect(await rowsAndObjects()).toEqual({ rows: 1, objects: 2 });
  });

  it("answers 404 for the photo through another project, and to anyone but its technician refuses removal", async () => {
    const other = await downloadPhoto({ projectId: demo.clinic.id, sectionId, photoId, thumb: false });
    expect(other.status).toBe(404);
    const notMine = await removePhoto({ projectId: demo.library.id, sectionId, photoId, userId: demo.cx.id });
    expect(notMine.status).toBe(403);
  });

  it("keeps photos of an approved section, and lets the technician remove them otherwise", async () => {
    await demo.db.insert(s.traverses).values({ sectionId, method: "log-linear", lines: 2, pointsPerLine: 3, status: "approved" });
    expect((await removePhoto({ projectId: demo.library.id, sectionId, photoId, userId: demo.tech.id })).status).toBe(409);
    // A re-traverse (a newer traverse, not yet approved) opens the section again.
    await demo.db.insert(s.traverses).values({ sectionId, method: "log-linear", lines: 2, pointsPerLine: 3, status: "draft", revision: 2, createdAt: new Date(Date.now() + 1000) });
    expect((await removePhoto({ projectId: demo.library.id, sectionId, photoId, userId: demo.tech.id })).status).toBe(204);
    expect(await rowsAndObjects()).toEqual({ rows: 0, objects: 0 });
  });
});

describe("calibration certificates", () => {
  it("takes a PDF, serves it back through the app, and refuses text dressed as a PDF", async () => {
    const pdf = await makeTestPdf("Calibration certificate");
    const res = await uploadCertificate({ req: request(multipart([{ name: "file", value: pdf, fileName: "cal-2026.pdf", type: "application/pdf" }])), instrumentId, userId: demo.tech.id });
    expect(res.status, await res.clone().text()).toBe(201);
    const back = await downloadCertificate({ instrumentId, thumb: false });
    expect(back.headers.get("content-type")).toBe("application/pdf");
    expect(Buffer.from(await back.arrayBuffer()).equals(Buffer.from(pdf))).toBe(true);
    expect((await downloadCertificate({ instrumentId, thumb: true })).status).toBe(404);

    const fake = await uploadCertificate({ req: request(multipart([{ name: "file", value: "just some text", fileName: "cert.pdf", type: "application/pdf" }])), instrumentId, userId: demo.tech.id });
    expect(fake.status).toBe(400);
    expect((await downloadCertificate({ instrumentId: "00000000-0000-4000-8000-00000000ffff", thumb: false })).status).toBe(404);
  });
});
