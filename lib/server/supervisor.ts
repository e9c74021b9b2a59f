/**
 * The project's certified TAB supervisor: a technician member designated by the engineer or a site
 * administrator, with the body that certified them and their certificate number. Before a report is
 * issued they sign a statement in the app that the data were taken and reviewed under their
 * supervision. That statement is a person's; the server's signature on the report file is separate.
 */
import { desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { AUDIT, recordAudit } from "@/db/queries/audit";
import { getMember } from "@/db/queries/members";
import { beginSignInAttempt, finishSignInAttempt } from "@/db/queries/sign-in-attempts";
import { projects, projectSupervisors, supervisorSignatures, users, type SupervisorSignature } from "@/db/schema";
import { PasswordHashingBusyError, verifyPassword } from "@/lib/auth/password";
import { PeopleError } from "./invitations";

/** The words the supervisor signs, with their name and certification filled in. */
export function certificationStatement({ name, certifyingBody, certificateNumber, projectName, siteName }: { name: string; certifyingBody: string; certificateNumber: string; projectName: string; siteName: string }): string {
  return (
    `I, ${name}, certified by ${certifyingBody} under certificate number ${certificateNumber}, state that the air-side ` +
    `test and balance readings recorded in Airtally for ${projectName} (${siteName}) were taken by technicians working ` +
    `under my supervision, and that I have reviewed them. To the best of my knowledge they are a true record of the ` +
    `conditions measured, by the methods and instruments shown with them.`
  );
}

export interface SupervisorState {
  designation: { userId: string; name: string; email: string; certifyingBody: string; certificateNumber: string; designatedAt: Date } | null;
  /** The statement as the current designation would sign it. */
  statement: string | null;
  /** The newest signature that matches the current designation (same person and certificate), if any. */
  signature: SupervisorSignature | null;
  /** Every signature ever made for the project, newest first. */
  history: SupervisorSignature[];
}

export async function getSupervisorState({ projectId }: { projectId: string }): Promise<SupervisorState> {
  const db = await getDb();
  const [project] = await db.select({ name: projects.name, siteName: projects.siteName }).from(projects).where(eq(projects.id, projectId));
  const [row] = await db
    .select({ userId: projectSupervisors.userId, name: users.name, email: users.email, certifyingBody: projectSupervisors.certifyingBody, certificateNumber: projectSupervisors.certificateNumber, designatedAt: projectSupervisors.designatedAt })
    .from(projectSupervisors)
    .innerJoin(users, eq(users.id, projectSupervisors.userId))
    .where(eq(projectSupervisors.projectId, projectId));
  const history = await db.select().from(supervisorSignatures).where(eq(supervisorSignatures.projectId, projectId)).orderBy(desc(supervisorSignatures.signedAt)).limit(100);
  const designation = row ?? null;
  const statement = designation && project ? certificationStatement({ ...designation, projectName: project.name, siteName: project.siteName }) : null;
  const signature =
    designation && statement
      ? (history.find((s) => s.userId === designation.userId && s.certificateNumber === designation.certificateNumber && s.certifyingBody === designation.certifyingBody && s.signedAt >= designation.designatedAt) ?? null)
      : null;
  return { designation, statement, signature, history };
}

export async function designateSupervisor({ projectId, userId, certifyingBody, certificateNumber, by }: { projectId: string; userId: string; certifyingBody: string; certificateNumber: string; by: { id: string } }) {
  const member = await getMember({ projectId, userId });
  if (!member || member.role !== "technician") throw new PeopleError(400, "The TAB supervisor must be a technician of this project.", { userId: "Choose one of the project's technicians." });
  const db = await getDb();
  const values = { userId, certifyingBody: certifyingBody.trim(), certificateNumber: certificateNumber.trim(), designatedBy: by.id, designatedAt: new Date() };
  await db.insert(projectSupervisors).values({ projectId, ...values }).onConflictDoUpdate({ target: projectSupervisors.projectId, set: values });
  await recordAudit({ userId: by.id, projectId, action: "supervisor.designated", entityType: "user", entityId: userId, detail: { name: member.name, certifyingBody: values.certifyingBody, certificateNumber: values.certificateNumber } });
  return getSupervisorState({ projectId });
}

export async function clearSupervisor({ projectId, by }: { projectId: string; by: { id: string } }) {
  const db = await getDb();
  const removed = await db.delete(projectSupervisors).where(eq(projectSupervisors.projectId, projectId)).returning();
  if (removed.length === 0) throw new PeopleError(404, "This project has no TAB supervisor designated.");
  await recordAudit({ userId: by.id, projectId, action: "supervisor.cleared", entityType: "user", entityId: removed[0]!.userId, detail: {} });
}

/**
 * The designated supervisor signs the statement, confirming with their password. Password checks
 * count with sign-ins (db/queries/sign-in-attempts.ts): the same per-e-mail and per-address backoff,
 * so this form cannot be used to guess a password faster than the sign-in form.
 */
export async function signCertification({ projectId, user, password, client }: { projectId: string; user: { id: string; email: string; name: string }; password: string; client: string }): Promise<SupervisorSignature> {
  const state = await getSupervisorState({ projectId });
  if (!state.designation || !state.statement) throw new PeopleError(409, "No TAB supervisor is designated for this project yet.");
  if (state.designation.userId !== user.id) throw new PeopleError(403, `Only the project's designated TAB supervisor (${state.designation.name}) can sign this statement.`);
  const email = user.email.toLowerCase();
  const ticket = await beginSignInAttempt({ email, client });
  if (ticket.retryAfterSeconds > 0) {
    const s = ticket.retryAfterSeconds;
    throw new PeopleError(429, `Too many wrong passwords. Wait ${s} second${s === 1 ? "" : "s"} and try again.`, undefined, { "Retry-After": String(s) });
  }
  const db = await getDb();
  const [row] = await db.select({ hash: users.passwordHash }).from(users).where(eq(users.id, user.id));
  let valid: boolean;
  try {
    valid = await verifyPassword(row?.hash ?? null, password);
  } catch (err) {
    await finishSignInAttempt({ id: ticket.id, outcome: "failed" });
    if (err instanceof PasswordHashingBusyError) throw new PeopleError(503, err.message, undefined, { "Retry-After": "5" });
    throw err;
  }
  if (!valid) {
    await finishSignInAttempt({ id: ticket.id, outcome: "failed" });
    await recordAudit({ userId: user.id, actorEmail: email, projectId, action: AUDIT.signInFailed, entityType: "user", entityId: user.id, detail: { email, purpose: "supervisor.sign" } });
    throw new PeopleError(400, "That is not your password; the statement was not signed.", { password: "Wrong password." });
  }
  await finishSignInAttempt({ id: ticket.id, outcome: "succeeded" });
  const [signature] = await db
    .insert(supervisorSignatures)
    .values({ projectId, userId: user.id, name: state.designation.name, certifyingBody: state.designation.certifyingBody, certificateNumber: state.designation.certificateNumber, statement: state.statement })
    .returning();
  await recordAudit({
    userId: user.id,
    actorEmail: user.email,
    projectId,
    action: "supervisor.signed",
    entityType: "supervisor_signature",
    entityId: signature!.id,
    detail: { certifyingBody: signature!.certifyingBody, certificateNumber: signature!.certificateNumber, statement: signature!.statement },
  });
  return signature!;
}
