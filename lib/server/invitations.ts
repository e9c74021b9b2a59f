/**
 * Invitations: a site administrator or the project's engineer invites an e-mail address with a role.
 * The link carries `<invitation id>.<secret>`; the database keeps only the secret's SHA-256, compared
 * in constant time. The link works once, for 72 hours, and lets the person choose their name and
 * password; they are then signed in as a member with that role. An address that already has an
 * account is added to the project at once and told by e-mail.
 */
import crypto from "node:crypto";
import { and, eq, gt, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { recordAudit } from "@/db/queries/audit";
import { isUuid } from "@/db/queries/projects";
import { invitations, projectMembers, projects, users, type Invitation, type MemberRole } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { ROLE_LABELS } from "@/lib/auth/policy";
import { renderMail } from "./mail-render";
import { kickDelivery, queueMail } from "./mailer";
import { notify } from "./notify";
import { publicUrl } from "./public-url";

export const INVITATION_HOURS = 72;
/** Public invitation look-ups and uses per client address and minute (lib/server/limits.ts). */
export const INVITATION_REQUESTS_PER_MINUTE = 60;

export class PeopleError extends Error {
  constructor(
    readonly status: 400 | 403 | 404 | 409 | 410 | 429 | 503,
    message: string,
    readonly fields?: Record<string, string>,
    /** Extra answer headers, such as Retry-After. */
    readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}

function digest(secret: string): Buffer {
  return crypto.createHash("sha256").update(secret, "utf8").digest();
}

/** A new link token for an invitation id, and the hash to store. */
export function newInvitationToken(id: string): { token: string; tokenHash: string } {
  const secret = crypto.randomBytes(32).toString("base64url");
  return { token: `${id}.${secret}`, tokenHash: digest(secret).toString("hex") };
}

function parseToken(token: string): { id: string; secret: string } | null {
  if (token.length > 120) return null;
  const [id, secret, ...rest] = token.split(".");
  if (rest.length || !id || !secret || !isUuid(id) || !/^[A-Za-z0-9_-]{43}$/.test(secret)) return null;
  return { id, secret };
}

export type InvitationLookup =
  | { ok: true; invitation: Invitation; projectName: string; siteName: string; invitedByName: string | null }
  | { ok: false; status: 404 | 410; message: string };

/** The invitation a link names, if the link is genuine and still usable. */
export async function findInvitation(token: string): Promise<InvitationLookup> {
  const invalid = { ok: false as const, status: 404 as const, message: "This invitation link is not valid. Check that the whole link was copied, or ask for a new invitation." };
  const parsed = parseToken(token);
  if (!parsed) return invalid;
  const db = await getDb();
  const [row] = await db
    .select({ invitation: invitations, projectName: projects.name, siteName: projects.siteName, invitedByName: users.name })
    .from(invitations)
    .innerJoin(projects, eq(projects.id, invitations.projectId))
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(eq(invitations.id, parsed.id));
  const stored = row ? Buffer.from(row.invitation.tokenHash, "hex") : crypto.randomBytes(32);
  const matches = crypto.timingSafeEqual(digest(parsed.secret), stored.length === 32 ? stored : crypto.randomBytes(32));
  if (!row || !matches) return invalid;
  const inv = row.invitation;
  if (inv.acceptedAt) return { ok: false, status: 410, message: "This invitation has already been used. Sign in with the password chosen then, or ask for a new invitation." };
  if (inv.revokedAt) return { ok: false, status: 410, message: "This invitation was withdrawn. Ask the project's engineer or a site administrator for a new one." };
  if (inv.expiresAt.getTime() <= Date.now()) return { ok: false, status: 410, message: `This invitation expired on ${inv.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC. Ask for a new one.` };
  return { ok: true, invitation: inv, projectName: row.projectName, siteName: row.siteName, invitedByName: row.invitedByName };
}

interface Actor {
  id: string;
  name: string;
  /** Site administrators may also invite or appoint engineers of record. */
  isAdmin: boolean;
}

export type InviteOutcome =
  | { kind: "invitation"; invitation: { id: string; email: string; role: MemberRole; expiresAt: Date } }
  | { kind: "member"; member: { userId: string; name: string; email: string; role: MemberRole } };

export async function inviteToProject({ projectId, email, role, by }: { projectId: string; email: string; role: MemberRole; by: Actor }): Promise<InviteOutcome> {
  if (role === "engineer" && !by.isAdmin) throw new PeopleError(403, "Only a site administrator can add an engineer of record.", { role: "Ask a site administrator to add engineers." });
  const address = email.trim().toLowerCase();
  const db = await getDb();
  const [project] = await db.select({ name: projects.name }).from(projects).where(eq(projects.id, projectId));
  if (!project) throw new PeopleError(404, "No such project.");
  const [existing] = await db.select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(sql`lower(${users.email})`, address));

  if (existing) {
    const [member] = await db.select().from(projectMembers).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, existing.id)));
    if (member) throw new PeopleError(409, `${existing.name} is already a member of this project, as ${ROLE_LABELS[member.role].toLowerCase()}.`, { email: "Already a member." });
    await db.transaction(async (tx) => {
      await tx.insert(projectMembers).values({ projectId, userId: existing.id, role });
      const link = `/projects/${projectId}`;
      await notify({
        projectId,
        to: { userIds: [existing.id] },
        kind: "member.added",
        subject: `You were added to ${project.name} as ${ROLE_LABELS[role].toLowerCase()}`,
        mail: { greeting: "Hello {name},", paragraphs: [`${by.name} added you to ${project.name} on Airtally, as ${ROLE_LABELS[role].toLowerCase()}. Sign in with your usual password to see it.`], action: { label: "Open the project", url: publicUrl(link) } },
        link,
        tx,
      });
    });
    await recordAudit({ userId: by.id, projectId, action: "member.added", entityType: "user", entityId: existing.id, detail: { email: existing.email, role } });
    return { kind: "member", member: { userId: existing.id, name: existing.name, email: existing.email, role } };
  }

  const id = crypto.randomUUID();
  const { token, tokenHash } = newInvitationToken(id);
  const expiresAt = new Date(Date.now() + INVITATION_HOURS * 3600_000);
  const url = publicUrl(`/invite/${token}`);
  const { text, html } = renderMail({
    greeting: "Hello,",
    paragraphs: [
      `${by.name} invited you to ${project.name} on Airtally, the airflow commissioning record for the project, as ${ROLE_LABELS[role].toLowerCase()}.`,
      `Open the link below to choose your name and password. It works once, until ${expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC (${INVITATION_HOURS} hours).`,
      "If you did not expect this, ignore it: nothing happens unless the link is opened and a password chosen.",
    ],
    action: { label: "Accept the invitation", url },
  });
  await db.transaction(async (tx) => {
    // Inviting the same address again replaces the earlier link.
    await tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.projectId, projectId), eq(sql`lower(${invitations.email})`, address), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
    await tx.insert(invitations).values({ id, projectId, email: address, role, tokenHash, invitedBy: by.id, expiresAt });
    await queueMail(tx, [{ to: address, subject: `Invitation to ${project.name} on Airtally`, text, html, kind: "invitation", projectId }]);
  });
  kickDelivery();
  await recordAudit({ userId: by.id, projectId, action: "invitation.sent", entityType: "invitation", entityId: id, detail: { email: address, role, expiresAt: expiresAt.toISOString() } });
  return { kind: "invitation", invitation: { id, email: address, role, expiresAt } };
}

export async function revokeInvitation({ projectId, invitationId, by }: { projectId: string; invitationId: string; by: Actor }): Promise<void> {
  if (!isUuid(invitationId)) throw new PeopleError(404, "No such open invitation in this project.");
  const db = await getDb();
  const rows = await db
    .update(invitations)
    .set({ revokedAt: new Date() })
    .where(and(eq(invitations.id, invitationId), eq(invitations.projectId, projectId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
    .returning({ email: invitations.email, role: invitations.role });
  if (rows.length === 0) throw new PeopleError(404, "No such open invitation in this project.");
  await recordAudit({ userId: by.id, projectId, action: "invitation.revoked", entityType: "invitation", entityId: invitationId, detail: { email: rows[0]!.email, role: rows[0]!.role } });
}

/**
 * Uses an invitation: creates the account with the chosen name and password and the membership, and
 * marks the invitation used, all or nothing. Only one of two simultaneous uses can succeed.
 */
export async function acceptInvitation({ token, name, password }: { token: string; name: string; password: string }): Promise<{ userId: string; email: string; sessionVersion: number; projectId: string }> {
  const found = await findInvitation(token);
  if (!found.ok) throw new PeopleError(found.status, found.message);
  const inv = found.invitation;
  if (password.toLowerCase().includes(inv.email.split("@")[0]!.toLowerCase()) && inv.email.split("@")[0]!.length >= 4) {
    throw new PeopleError(400, "Choose a password that does not contain your e-mail name.", { password: "Do not use your e-mail name in the password." });
  }
  // Hashing is deliberately slow; it runs only for a genuine, open invitation.
  const passwordHash = await hashPassword(password);
  const db = await getDb();
  const created = await db.transaction(async (tx) => {
    const claimed = await tx
      .update(invitations)
      .set({ acceptedAt: new Date() })
      .where(and(eq(invitations.id, inv.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, sql`now()`)))
      .returning({ id: invitations.id });
    if (claimed.length === 0) throw new PeopleError(410, "This invitation has already been used. Sign in with the password chosen then, or ask for a new invitation.");
    const [taken] = await tx.select({ id: users.id }).from(users).where(eq(sql`lower(${users.email})`, inv.email.toLowerCase()));
    if (taken) throw new PeopleError(409, "An account with this e-mail address exists already: sign in with it, and ask to be added to the project.");
    const [user] = await tx
      .insert(users)
      .values({ email: inv.email, name: name.trim(), passwordHash })
      .returning({ id: users.id, email: users.email, sessionVersion: users.sessionVersion });
    await tx.insert(projectMembers).values({ projectId: inv.projectId, userId: user!.id, role: inv.role });
    await tx.update(invitations).set({ acceptedBy: user!.id }).where(eq(invitations.id, inv.id));
    return user!;
  });
  await recordAudit({ userId: created.id, actorEmail: created.email, projectId: inv.projectId, action: "invitation.accepted", entityType: "invitation", entityId: inv.id, detail: { email: inv.email, role: inv.role } });
  return { userId: created.id, email: created.email, sessionVersion: created.sessionVersion, projectId: inv.projectId };
}
