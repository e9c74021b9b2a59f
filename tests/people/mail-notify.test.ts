import net from "node:net";
import { eq } from "drizzle-orm";
import { SMTPServer } from "smtp-server";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import * as s from "@/db/schema";
import { deliverQueued, MAX_ATTEMPTS, queueMail, settleDelivery, stopDelivery } from "@/lib/server/mailer";
import { notify, notifyApproved, notifyReturned, notifySubmitted } from "@/lib/server/notify";
import { listMailMessages, listNotifications, markNotificationsRead, countUnreadNotifications } from "@/db/queries/notifications";
import { demoDatabase } from "../support/db";

let demo: Awaited<ReturnType<typeof demoDatabase>>;
beforeAll(async () => {
  demo = await demoDatabase();
});
afterEach(() => {
  delete process.env.SMTP_URL;
  stopDelivery();
});

const item = { type: "traverse" as const, id: "00000000-0000-4000-8000-000000000001", label: "traverse of AHU-1 / S1.2" };

describe("notifications without SMTP_URL (the outbox)", () => {
  it("tells the project's commissioning agents of a submission, in the app and in the outbox, and not the one who acted", async () => {
    const told = await notifySubmitted({ projectId: demo.library.id, item, by: { id: demo.tech.id, name: demo.tech.name } });
    expect(told.map((p) => p.email)).toEqual(["cx@example.test"]);
    const [note] = await listNotifications({ userId: demo.cx.id });
    expect(note).toMatchObject({ kind: "traverse.submitted", link: `/projects/${demo.library.id}/review`, readAt: null });
    expect(note!.message).toContain("traverse of AHU-1 / S1.2 submitted for review");
    const [mail] = await listMailMessages({ to: "cx@example.test", limit: 1 });
    expect(mail).toMatchObject({ status: "outbox", kind: "traverse.submitted", toName: demo.cx.name });
    expect(mail!.text).toMatch(/^Hello Ines Karlsson,/);
    expect(mail!.text).toContain(`/projects/${demo.library.id}/review`);
    expect(mail!.html).toContain("<a href=");
    expect(await listNotifications({ userId: demo.tech.id })).toEqual([]);
  });

  it("returns to the technician with the reviewer's comment, quoted and escaped in HTML", async () => {
    await notifyReturned({ projectId: demo.library.id, item, technicianUserId: demo.tech.id, by: { id: demo.cx.id, name: demo.cx.name }, comment: "Point 3.4 reads <0 Pa: re-read line 3." });
    const [mail] = await listMailMessages({ to: "tech@example.test", limit: 1 });
    expect(mail!.text).toContain("> Point 3.4 reads <0 Pa: re-read line 3.");
    expect(mail!.html).toContain("&lt;0 Pa");
    expect(mail!.html).not.toContain("<0 Pa");
  });

  it("tells the engineer and the owner of an approval", async () => {
    const told = await notifyApproved({ projectId: demo.library.id, item, by: { id: demo.cx.id, name: demo.cx.name } });
    expect(told.map((p) => p.email).sort()).toEqual(["engineer@example.test", "owner@example.test"]);
  });

  it("writes nothing when the caller's transaction rolls back", async () => {
    const before = (await listMailMessages({ limit: 200 })).length;
    await expect(
      demo.db.transaction(async (tx) => {
        await notifyApproved({ projectId: demo.library.id, item, by: { id: demo.cx.id, name: demo.cx.name }, tx });
        throw new Error("the decision failed");
      }),
    ).rejects.toThrow("the decision failed");
    expect((await listMailMessages({ limit: 200 })).length).toBe(before);
  });

  it("marks a user's own notifications read, one or all", async () => {
    const mine = await listNotifications({ userId: demo.owner.id });
    expect(mine.length).toBeGreaterThan(0);
    expect(await markNotificationsRead({ userId: demo.cx.id, ids: [mine[0]!.id] })).toBe(0); // not theirs
    expect(await markNotificationsRead({ userId: demo.owner.id, ids: [mine[0]!.id] })).toBe(1);
    await markNotificationsRead({ userId: demo.owner.id, ids: "all" });
    expect(await countUnreadNotifications({ userId: demo.owner.id })).toBe(0);
  });
});

describe("e-mail through SMTP_URL", () => {
  let server: SMTPServer;
  let port: number;
  const received: { to: string[]; data: string }[] = [];

  beforeAll(async () => {
    server = new SMTPServer({
      authOptional: true,
      disabledCommands: ["STARTTLS"],
      onData(stream, session, callback) {
        let data = "";
        stream.on("data", (c: Buffer) => (data += c.toString("utf8")));
        stream.on("end", () => {
          received.push({ to: session.envelope.rcptTo.map((r) => r.address), data });
          callback();
        });
      },
    });
    await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
    port = (server.server.address() as net.AddressInfo).port;
  });
  afterAll(async () => {
    await new Promise<void>((resolve) => server.close(() => resolve()));
  });

  it("queues in the caller's transaction and delivers after it, as plain text and HTML", async () => {
    process.env.SMTP_URL = `smtp://127.0.0.1:${port}`;
    const told = await notifySubmitted({ projectId: demo.library.id, item, by: { id: demo.tech.id, name: demo.tech.name } });
    expect(told).toHaveLength(1);
    const [queued] = await listMailMessages({ to: "cx@example.test", limit: 1 });
    expect(queued!.status).toMatch(/queued|sending|sent/);
    // The kick runs a round shortly after; run one now as well and wait for both.
    await deliverQueued();
    await settleDelivery();
    const [sent] = await listMailMessages({ to: "cx@example.test", limit: 1 });
    expect(sent!.status).toBe("sent");
    expect(sent!.sentAt).not.toBeNull();
    const got = received.find((r) => r.to.includes("cx@example.test"));
    expect(got?.data).toContain("Subject: ");
    expect(got?.data).toContain("text/plain");
    expect(got?.data).toContain("text/html");
  });

  it("does not hold the caller up when the mail server never answers, and retries later", async () => {
    // A server that accepts connections and says nothing: the SMTP greeting never comes.
    const silent = net.createServer(() => undefined);
    await new Promise<void>((resolve) => silent.listen(0, "127.0.0.1", resolve));
    process.env.SMTP_URL = `smtp://127.0.0.1:${(silent.address() as net.AddressInfo).port}`;
    try {
      const started = Date.now();
      await notifyApproved({ projectId: demo.library.id, item, by: { id: demo.cx.id, name: demo.cx.name } });
      // The notice is written at once; the e-mail waits for the delivery worker.
      expect(Date.now() - started).toBeLessThan(2000);
      const [mail] = await listMailMessages({ to: "owner@example.test", limit: 1 });
      expect(["queued", "sending"]).toContain(mail!.status);
    } finally {
      stopDelivery();
      await settleDelivery();
      silent.close();
    }
  }, 60_000);

  it("gives up after the last attempt and says why", async () => {
    process.env.SMTP_URL = "smtp://127.0.0.1:1"; // nothing listens on port 1
    await queueMail(demo.db, [{ to: "nobody@example.test", subject: "Test", text: "x", html: "<p>x</p>", kind: "invitation" }]);
    for (let i = 0; i < MAX_ATTEMPTS; i++) {
      await demo.db.update(s.mailMessages).set({ nextAttemptAt: new Date(0) }).where(eq(s.mailMessages.toAddress, "nobody@example.test"));
      await deliverQueued();
    }
    const [mail] = await listMailMessages({ to: "nobody@example.test", limit: 1 });
    expect(mail).toMatchObject({ status: "failed", attempts: MAX_ATTEMPTS });
    expect(mail!.lastError).toMatch(/ECONNREFUSED|connect/i);
  });

  it("sends to a list of roles only once per person", async () => {
    process.env.SMTP_URL = `smtp://127.0.0.1:${port}`;
    const told = await notify({
      projectId: demo.library.id,
      to: { roles: ["owner"], userIds: [demo.owner.id] },
      kind: "report.issued",
      subject: "Once",
      mail: { greeting: "Hello {name},", paragraphs: ["Only once."] },
      link: "/projects",
    });
    expect(told).toHaveLength(1);
    await deliverQueued();
    await settleDelivery();
  });
});
