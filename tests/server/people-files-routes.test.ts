import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle } from "@/db/client";
import * as s from "@/db/schema";
import type { LocalObjectStore } from "@/lib/cli/local-object-store";
import { issueReport } from "@/lib/server/report-issue";
import { listObjectKeys } from "@/lib/server/storage";
import { demoDatabase } from "../support/db";
import { useLocalObjectStore } from "../support/object-store";
import { makeTestPdf } from "../support/pdf";
import { callRoute } from "../support/route-call";

// The session is whoever the test says; everything after it (users, roles, database, object store) is real.
const session = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), session));

const invitations = await import("@/app/api/v1/projects/[projectId]/invitations/route");
const invitation = await import("@/app/api/v1/invitations/[token]/route");
const accept = await import("@/app/api/v1/invitations/[token]/accept/route");
const outbox = await import("@/app/api/v1/admin/outbox/route");
const notifications = await import("@/app/api/v1/notifications/route");
const markRead = await import("@/app/api/v1/notifications/read/route");
const certificate = await import("@/app/api/v1/instruments/[instrumentId]/certificate/route");
const instrument = await import("@/app/api/v1/instruments/[instrumentId]/route");
const photos = await import("@/app/api/v1/projects/[projectId]/sections/[sectionId]/photos/route");
const verify = await import("@/app/api/v1/reports/verify/route");
const publicKey = await import("@/app/api/v1/reports/public-key/route");
const latest = await import("@/app/api/v1/projects/[projectId]/reports/latest.pdf/route");

let store: LocalObjectStore;
let demo: Awaited<ReturnType<typeof demoDatabase>>;
const as = (user: { id: string } | null) => {
  session.userId = user?.id;
};

beforeAll(async () => {
  store = await useLocalObjectStore();
  demo = await demoDatabase();
});
afterAll(async () => {
  await store.stop();
  await (await getDatabaseHandle()).close();
});

const BOUNDARY = "----airtally-route-test";
function multipart(fileName: string, bytes: Uint8Array, type: string): Uint8Array {
  return Buffer.concat([
    Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\nContent-Type: ${type}\r\n\r\n`),
    Buffer.from(bytes),
    Buffer.from(`\r\n--${BOUNDARY}--\r\n`),
  ]);
}
const MULTIPART = `multipart/form-data; boundary=${BOUNDARY}`;

describe("invitations over HTTP", () => {
  it("the engineer invites, the outbox holds the link, and the link is used once through the public routes", async () => {
    as(demo.engineer);
    const sent = await callRoute(invitations.POST, { method: "POST", params: { projectId: demo.library.id }, json: { email: "Route.Test@example.test", role: "owner" } });
    expect(sent.status).toBe(201);
    expect(sent.body.kind).toBe("invitation");

    // The outbox is for site administrators only.
    expect((await callRoute(outbox.GET, { path: "/api/v1/admin/outbox" })).status).toBe(403);
    as(demo.admin);
    const mail = await callRoute(outbox.GET, { path: "/api/v1/admin/outbox?to=route.test@example.test&limit=1" });
    expect(mail.status).toBe(200);
    expect(mail.headers.get("cache-control")).toBe("no-store");
    const token = /\/invite\/(\S+)/.exec(mail.body.messages[0].text)![1]!;

    // Signed out from here on: the link is the only credential.
    as(null);
    const looked = await callRoute(invitation.GET, { params: { token } });
    expect(looked.status).toBe(200);
    expect(looked.body.invitation).toMatchObject({ email: "route.test@example.test", role: "owner", project: demo.library.name });
    expect((await callRoute(invitation.GET, { params: { token: "not-a-link" } })).status).toBe(404);

    const short = await callRoute(accept.POST, { method: "POST", params: { token }, json: { name: "Route Test", password: "short" } });
    expect(short.status).toBe(400);
    expect(short.body.error.fields.password).toMatch(/at least 12 characters/);
    // Capped like the other password forms (16 KiB), and refused from another site before the body is read.
    expect((await callRoute(accept.POST, { method: "POST", params: { token }, json: { name: "x".repeat(20_000), password: "long enough passphrase" } })).status).toBe(413);
    expect((await callRoute(accept.POST, { method: "POST", params: { token }, json: { name: "Route Test", password: "long enough passphrase" }, headers: { origin: "https://elsewhere.example" } })).status).toBe(403);

    const used = await callRoute(accept.POST, { method: "POST", params: { token }, json: { name: "Route Test", password: "long enough passphrase" } });
    expect(used.status).toBe(201);
    expect(used.body.projectId).toBe(demo.library.id);
    const again = await callRoute(accept.POST, { method: "POST", params: { token }, json: { name: "Someone", password: "another long passphrase" } });
    expect(again.status).toBe(410);
    expect(again.body.error.message).toMatch(/already been used/);

    // The sign-in it made is in the append-only audit log with the person's e-mail.
    const [signIn] = await demo.db.select().from(s.auditLog).where(and(eq(s.auditLog.action, "auth.sign_in"), eq(s.auditLog.actorEmail, "route.test@example.test")));
    expect(signIn!.userId).toBe(used.body.userId);
  });
});

describe("notifications over HTTP", () => {
  it("lists the caller's own and marks them read", async () => {
    as(demo.cx);
    const unknown = await callRoute(markRead.POST, { method: "POST", json: { ids: ["00000000-0000-4000-8000-00000000abcd"] } });
    expect(unknown.status).toBe(200);
    expect(unknown.body.marked).toBe(0);
    expect((await callRoute(markRead.POST, { method: "POST", json: { ids: [] } })).status).toBe(400);
    const all = await callRoute(markRead.POST, { method: "POST", json: { all: true } });
    expect(all.body.unread).toBe(0);
    expect((await callRoute(notifications.GET, { path: "/api/v1/notifications" })).body.unread).toBe(0);
    as(null);
    expect((await callRoute(notifications.GET, { path: "/api/v1/notifications" })).status).toBe(401);
  });
});

describe("calibration certificates over HTTP", () => {
  it("lets the register's keepers attach one, everyone signed in download it, and removes its files with the instrument", async () => {
    const [row] = await demo.db.insert(s.instruments).values({ kind: "manometer", serial: "ROUTE-CERT-1", make: "Test", model: "M" }).returning();
    const url = `/api/v1/instruments/${row!.id}/certificate`;
    const pdf = await makeTestPdf("Calibration certificate");

    // An owner keeps no register: refused before the file is read.
    as(demo.owner);
    expect((await callRoute(certificate.POST, { method: "POST", path: url, params: { instrumentId: row!.id }, bytes: multipart("cal.pdf", pdf, "application/pdf"), contentType: MULTIPART })).status).toBe(403);
    expect((await callRoute(certificate.GET, { path: url, params: { instrumentId: row!.id } })).status).toBe(404);

    as(demo.tech);
    const added = await callRoute(certificate.POST, { method: "POST", path: url, params: { instrumentId: row!.id }, bytes: multipart("cal.pdf", pdf, "application/pdf"), contentType: MULTIPART });
    expect(added.status).toBe(201);
    expect(added.body.certificate).toMatchObject({ contentType: "application/pdf", fileName: "cal.pdf", uploadedByName: demo.tech.name, thumbUrl: null });

    as(demo.owner);
    const got = await callRoute(certificate.GET, { path: url, params: { instrumentId: row!.id } });
    expect(got.status).toBe(200);
    expect(got.headers.get("content-type")).toBe("application/pdf");
    expect(got.headers.get("cache-control")).toBe("no-store");

    expect(await listObjectKeys(`instruments/${row!.id}/`)).toHaveLength(1);
    as(demo.tech);
    expect((await callRoute(instrument.DELETE, { method: "DELETE", params: { instrumentId: row!.id } })).status).toBe(204);
    expect(await listObjectKeys(`instruments/${row!.id}/`)).toEqual([]);
  });
});

describe("photo uploads over HTTP", () => {
  it("checks the role before reading a byte, and refuses an 11 MB body declared or streamed with 413", async () => {
    const [section] = await demo.db
      .select({ id: s.ductSections.id })
      .from(s.ductSections)
      .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
      .where(eq(s.airSystems.projectId, demo.library.id))
      .limit(1);
    const params = { projectId: demo.library.id, sectionId: section!.id };
    const body = multipart("huge.jpg", new Uint8Array(11 * 1024 * 1024), "image/jpeg");
    let pulled = 0;
    const stream = () => {
      pulled = 0;
      return new ReadableStream<Uint8Array>(
        {
          pull(c) {
            const start = pulled * 65536;
            if (start >= body.byteLength) return c.close();
            pulled++;
            c.enqueue(body.subarray(start, start + 65536));
          },
        },
        // Nothing is pulled until someone reads.
        { highWaterMark: 0 },
      );
    };

    as(demo.owner);
    expect((await callRoute(photos.POST, { method: "POST", params, bytes: stream(), contentType: MULTIPART })).status).toBe(403);
    expect(pulled).toBe(0);

    as(demo.tech);
    const declared = await callRoute(photos.POST, { method: "POST", params, bytes: body, contentType: MULTIPART });
    expect(declared.status).toBe(413);
    expect(declared.body.error.message).toMatch(/larger than 10 MB/);
    const streamed = await callRoute(photos.POST, { method: "POST", params, bytes: stream(), contentType: MULTIPART });
    expect(streamed.status).toBe(413);
    // Cut off near the cap, not read to the end.
    expect(pulled * 65536).toBeLessThan(10.5 * 1024 * 1024);
    const listed = await callRoute(photos.GET, { params });
    expect(listed.body.photos).toEqual([]);
  });
});

describe("issued reports over HTTP", () => {
  it("verifies the issued bytes publicly, refuses a changed byte, and serves the PDF to members only", async () => {
    const pdf = await makeTestPdf("Route test report");
    await issueReport({ projectId: demo.library.id, pdf, signers: [{ name: demo.cx.name, role: "Commissioning agent", at: new Date().toISOString() }], issuedBy: demo.cx.id });

    as(null);
    const genuine = await callRoute(verify.POST, { method: "POST", bytes: multipart("report.pdf", pdf, "application/pdf"), contentType: MULTIPART });
    expect(genuine.status).toBe(200);
    expect(genuine.body).toMatchObject({ valid: true, report: { project: demo.library.name, revision: 1, superseded: false } });
    const changed = Buffer.from(pdf);
    changed[Math.floor(changed.length / 2)]! ^= 0x01;
    const refused = await callRoute(verify.POST, { method: "POST", bytes: multipart("report.pdf", changed, "application/pdf"), contentType: MULTIPART });
    expect(refused.body.valid).toBe(false);
    expect((await callRoute(verify.POST, { method: "POST", json: { file: "x" } })).status).toBe(415);
    expect((await callRoute(verify.POST, { method: "POST", bytes: multipart("report.pdf", pdf, "application/pdf"), contentType: MULTIPART, headers: { origin: "https://elsewhere.example" } })).status).toBe(403);

    const key = await callRoute(publicKey.GET);
    expect(key.text).toMatch(/^-----BEGIN PUBLIC KEY-----/);
    expect(key.headers.get("cache-control")).toBe("no-store");

    expect((await callRoute(latest.GET, { params: { projectId: demo.library.id } })).status).toBe(401);
    as(demo.owner);
    const file = await callRoute(latest.GET, { params: { projectId: demo.library.id } });
    expect(file.status).toBe(200);
    expect(file.headers.get("content-type")).toBe("application/pdf");
    const none = await callRoute(latest.GET, { params: { projectId: demo.clinic.id } });
    expect(none.status).toBe(404);
    expect(none.body.error.message).toBe("No such project, or you are not a member of it.");
  });
});
