import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { listMailMessages } from "@/db/queries/notifications";
import * as s from "@/db/schema";
import { verifyPassword } from "@/lib/auth/password";
import { acceptInvitation, findInvitation, INVITATION_HOURS, inviteToProject, PeopleError, revokeInvitation } from "@/lib/server/invitations";
import { changeMemberRole, removeMember } from "@/lib/server/members";
import { designateSupervisor, getSupervisorState, signCertification } from "@/lib/server/supervisor";
import { DEMO_PASSWORD } from "@/db/seed/index";
import { demoDatabase } from "../support/db";

let demo: Awaited<ReturnType<typeof demoDatabase>>;
let engineer: { id: string; name: string; isAdmin: boolean };
beforeAll(async () => {
  demo = await demoDatabase();
  engineer = { id: demo.engineer.id, name: demo.engineer.name, isAdmin: false };
});

async function linkFromOutbox(to: string): Promise<string> {
  const [mail] = await listMailMessages({ to, limit: 1 });
  const match = mail!.text.match(/\/invite\/(\S+)/);
  return match![1]!;
}

async function failure(p: Promise<unknown>): Promise<PeopleError> {
  const err = await p.then(() => null, (e: unknown) => e);
  expect(err).toBeInstanceOf(PeopleError);
  return err as PeopleError;
}

describe("invitations", () => {
  it("sends a link by e-mail, stores only a hash of it, and expires it after 72 hours", async () => {
    const out = await inviteToProject({ projectId: demo.library.id, email: "New.Tech@example.test", role: "technician", by: engineer });
    expect(out.kind).toBe("invitation");
    const token = await linkFromOutbox("new.tech@example.test");
    const [row] = await demo.db.select().from(s.invitations).where(eq(s.invitations.email, "new.tech@example.test"));
    expect(row!.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(token).not.toContain(row!.tokenHash);
    expect(row!.expiresAt.getTime() - row!.createdAt.getTime()).toBeCloseTo(INVITATION_HOURS * 3600_000, -4);
    expect(await findInvitation(token)).toMatchObject({ ok: true, projectName: demo.library.name });
  });

  it("refuses a link with a changed secret as not valid", async () => {
    const token = await linkFromOutbox("new.tech@example.test");
    const changed = token.slice(0, -1) + (token.endsWith("A") ? "B" : "A");
    expect(await findInvitation(changed)).toMatchObject({ ok: false, status: 404 });
    expect(await findInvitation("not-a-token")).toMatchObject({ ok: false, status: 404 });
  });

  it("sets the name and password once, makes a member with the role, and never works again", async () => {
    const token = await linkFromOutbox("new.tech@example.test");
    const { userId, projectId } = await acceptInvitation({ token, name: "Remy Vance", password: "a long enough secret" });
    expect(projectId).toBe(demo.library.id);
    const [member] = await demo.db.select().from(s.projectMembers).where(and(eq(s.projectMembers.userId, userId), eq(s.projectMembers.projectId, demo.library.id)));
    expect(member!.role).toBe("technician");
    const [user] = await demo.db.select().from(s.users).where(eq(s.users.id, userId));
    expect(user).toMatchObject({ name: "Remy Vance", email: "new.tech@example.test", isAdmin: false });
    expect(await verifyPassword(user!.passwordHash, "a long enough secret")).toBe(true);

    const again = await failure(acceptInvitation({ token, name: "Someone Else", password: "another long secret" }));
    expect(again.status).toBe(410);
    expect(again.message).toMatch(/already been used/);
    const [still] = await demo.db.select().from(s.users).where(eq(s.users.id, userId));
    expect(await verifyPassword(still!.passwordHash, "a long enough secret")).toBe(true);
  });

  it("lets only one of two simultaneous uses succeed", async () => {
    await inviteToProject({ projectId: demo.library.id, email: "twice@example.test", role: "owner", by: engineer });
    const token = await linkFromOutbox("twice@example.test");
    const results = await Promise.allSettled([
      acceptInvitation({ token, name: "First", password: "a long enough secret" }),
      acceptInvitation({ token, name: "Second", password: "a long enough secret" }),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    expect(await demo.db.select().from(s.users).where(eq(s.users.email, "twice@example.test"))).toHaveLength(1);
  });

  it("refuses an expired or withdrawn link", async () => {
    await inviteToProject({ projectId: demo.library.id, email: "late@example.test", role: "owner", by: engineer });
    const token = await linkFromOutbox("late@example.test");
    await demo.db.update(s.invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(s.invitations.email, "late@example.test"));
    expect((await failure(acceptInvitation({ token, name: "Late", password: "a long enough secret" }))).message).toMatch(/expired/);

    const out = await inviteToProject({ projectId: demo.library.id, email: "withdrawn@example.test", role: "owner", by: engineer });
    const withdrawn = await linkFromOutbox("withdrawn@example.test");
    if (out.kind !== "invitation") throw new Error("expected an invitation");
    await revokeInvitation({ projectId: demo.library.id, invitationId: out.invitation.id, by: engineer });
    expect((await failure(acceptInvitation({ token: withdrawn, name: "W", password: "a long enough secret" }))).message).toMatch(/withdrawn/);
  });

  it("replaces an earlier link when the same address is invited again", async () => {
    await inviteToProject({ projectId: demo.library.id, email: "again@example.test", role: "owner", by: engineer });
    const first = await linkFromOutbox("again@example.test");
    await inviteToProject({ projectId: demo.library.id, email: "again@example.test", role: "commissioning_agent", by: engineer });
    const second = await linkFromOutbox("again@example.test");
    expect(first).not.toBe(second);
    expect(await findInvitation(first)).toMatchObject({ ok: false, status: 410 });
    expect(await findInvitation(second)).toMatchObject({ ok: true, invitation: { role: "commissioning_agent" } });
  });

  it("adds an existing account at once, and refuses one already a member", async () => {
    const out = await inviteToProject({ projectId: demo.clinic.id, email: "OWNER@example.test", role: "owner", by: { ...engineer } });
    expect(out).toMatchObject({ kind: "member", member: { email: "owner@example.test", role: "owner" } });
    const [mail] = await listMailMessages({ to: "owner@example.test", limit: 1 });
    expect(mail!.kind).toBe("member.added");
    expect((await failure(inviteToProject({ projectId: demo.clinic.id, email: "owner@example.test", role: "owner", by: engineer }))).status).toBe(409);
  });

  it("leaves appointing engineers of record to site administrators", async () => {
    expect((await failure(inviteToProject({ projectId: demo.library.id, email: "eng2@example.test", role: "engineer", by: engineer }))).status).toBe(403);
    const byAdmin = await inviteToProject({ projectId: demo.library.id, email: "eng2@example.test", role: "engineer", by: { id: demo.admin.id, name: demo.admin.name, isAdmin: true } });
    expect(byAdmin.kind).toBe("invitation");
    const audit = await demo.db.select().from(s.auditLog).where(eq(s.auditLog.action, "invitation.sent"));
    expect(audit.length).toBeGreaterThan(3);
  });
});

describe("members and the TAB supervisor", () => {
  it("lets the engineer change and remove others but not themselves or another engineer", async () => {
    expect((await failure(changeMemberRole({ projectId: demo.library.id, userId: demo.engineer.id, role: "owner", by: engineer }))).status).toBe(403);
    expect((await failure(changeMemberRole({ projectId: demo.library.id, userId: demo.owner.id, role: "engineer", by: engineer }))).status).toBe(403);
    const changed = await changeMemberRole({ projectId: demo.library.id, userId: demo.owner.id, role: "commissioning_agent", by: engineer });
    expect(changed.role).toBe("commissioning_agent");
    await changeMemberRole({ projectId: demo.library.id, userId: demo.owner.id, role: "owner", by: engineer });
    const [invited] = await demo.db.select().from(s.users).where(eq(s.users.email, "twice@example.test"));
    await removeMember({ projectId: demo.library.id, userId: invited!.id, by: engineer });
    expect((await failure(removeMember({ projectId: demo.library.id, userId: invited!.id, by: engineer }))).status).toBe(404);
    const actions = (await demo.db.select({ a: s.auditLog.action }).from(s.auditLog)).map((r) => r.a);
    expect(actions).toEqual(expect.arrayContaining(["member.role_changed", "member.removed"]));
  });

  it("designates a technician only, and the supervisor signs the statement with their password", async () => {
    expect((await failure(designateSupervisor({ projectId: demo.library.id, userId: demo.owner.id, certifyingBody: "Test body", certificateNumber: "1", by: engineer }))).status).toBe(400);
    const state = await designateSupervisor({ projectId: demo.library.id, userId: demo.tech.id, certifyingBody: "Wrenfield Balancing Board", certificateNumber: "TB-0417", by: engineer });
    expect(state.designation).toMatchObject({ name: demo.tech.name, certificateNumber: "TB-0417" });
    expect(state.statement).toContain("TB-0417");
    expect(state.signature).toBeNull();

    const techUser = { id: demo.tech.id, email: demo.tech.email, name: demo.tech.name };
    const client = "198.51.100.7";
    expect((await failure(signCertification({ projectId: demo.library.id, user: techUser, password: "wrong password", client }))).status).toBe(400);
    expect((await failure(signCertification({ projectId: demo.library.id, user: { id: demo.cx.id, email: demo.cx.email, name: demo.cx.name }, password: DEMO_PASSWORD, client }))).status).toBe(403);
    // Wrong passwords count with sign-ins: past the free attempts from one address, the next waits (429, Retry-After).
    for (let i = 0; i < 4; i++) await failure(signCertification({ projectId: demo.library.id, user: techUser, password: "wrong password", client }));
    const throttled = await failure(signCertification({ projectId: demo.library.id, user: techUser, password: DEMO_PASSWORD, client }));
    expect(throttled.status).toBe(429);
    expect(Number(throttled.headers?.["Retry-After"])).toBeGreaterThan(0);
    const signed = await signCertification({ projectId: demo.library.id, user: techUser, password: DEMO_PASSWORD, client: "198.51.100.8" });
    expect(signed.statement).toBe(state.statement);
    expect((await getSupervisorState({ projectId: demo.library.id })).signature?.id).toBe(signed.id);

    // A new certificate number needs a new signature; the old one stays on record.
    const renewed = await designateSupervisor({ projectId: demo.library.id, userId: demo.tech.id, certifyingBody: "Wrenfield Balancing Board", certificateNumber: "TB-0999", by: engineer });
    expect(renewed.signature).toBeNull();
    expect(renewed.history).toHaveLength(1);
    // Another role ends the designation.
    await changeMemberRole({ projectId: demo.library.id, userId: demo.tech.id, role: "owner", by: engineer });
    expect((await getSupervisorState({ projectId: demo.library.id })).designation).toBeNull();
    await changeMemberRole({ projectId: demo.library.id, userId: demo.tech.id, role: "technician", by: engineer });
  });
});
