/**
 * Issuing a closeout report: the exact PDF bytes are hashed (SHA-256) and signed with the deployment's
 * Ed25519 key, stored in object storage, and recorded in the database, in an order that never leaves a
 * row without its object: object first, then the row (and the previous revision marked superseded)
 * in one transaction; if that fails, the object is removed again. The report builder calls
 * `planReportIssue` first, to print the revision and verification code on every page, then
 * `issueReport` with the bytes it built.
 */
import crypto from "node:crypto";
import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { recordAudit } from "@/db/queries/audit";
import { projects, reports, users, type Report, type ReportSigner } from "@/db/schema";
import { kickDelivery } from "./mailer";
import { notifyReportIssued } from "./notify";
import { publicUrl } from "./public-url";
import { newVerificationCode } from "./report-codes";
import { getSigningKey, sha256Hex, signBytes } from "./signing";
import { deleteObjectsQuietly, putObject } from "./storage";

/** Reports carry photos and charts; 40 MiB is far above a large project's report and bounds memory. */
export const MAX_REPORT_BYTES = 40 * 1024 * 1024;
const MAX_REASON = 2000;
const MAX_SIGNERS = 20;

export class ReportIssueError extends Error {
  constructor(
    message: string,
    /** 400: the input is wrong; 404: no such project; 409: the state moved on (another revision was issued). */
    readonly status: 400 | 404 | 409,
  ) {
    super(message);
  }
}

export interface IssuePlan {
  reportId: string;
  projectId: string;
  revision: number;
  code: string;
  /** `/verify/<code>`, and the absolute link to print on every page and in the QR code. */
  verifyPath: string;
  verifyUrl: string;
}

/** The identity of the next revision, for the builder to print on its pages before the bytes exist. */
export async function planReportIssue({ projectId }: { projectId: string }): Promise<IssuePlan> {
  const db = await getDb();
  const [project] = await db.select({ id: projects.id }).from(projects).where(eq(projects.id, projectId));
  if (!project) throw new ReportIssueError("No such project.", 404);
  const [latest] = await db.select({ revision: reports.revision }).from(reports).where(eq(reports.projectId, projectId)).orderBy(desc(reports.revision)).limit(1);
  const code = newVerificationCode();
  return { reportId: crypto.randomUUID(), projectId, revision: (latest?.revision ?? 0) + 1, code, verifyPath: `/verify/${code}`, verifyUrl: publicUrl(`/verify/${code}`) };
}

export interface IssueReportInput {
  projectId: string;
  /** The PDF exactly as it will be downloaded. */
  pdf: Uint8Array;
  /** The people whose approvals or signatures in the app stand behind it, with their role in words and when. */
  signers: readonly ReportSigner[];
  /** Why this revision replaces the previous one; required from revision 2 on. */
  reason?: string;
  /** The user issuing it. */
  issuedBy: string;
  /** From planReportIssue, when the pages print the code and revision; made here otherwise. */
  plan?: IssuePlan;
}

function validate(input: IssueReportInput): string | null {
  const { pdf, signers } = input;
  if (!(pdf instanceof Uint8Array) || pdf.byteLength === 0) return "The report has no bytes.";
  if (pdf.byteLength > MAX_REPORT_BYTES) return `The report is ${(pdf.byteLength / 1048576).toFixed(1)} MiB; at most ${MAX_REPORT_BYTES / 1048576} MiB can be issued.`;
  if (Buffer.from(pdf.subarray(0, 5)).toString("latin1") !== "%PDF-") return "The report is not a PDF file (it does not start with %PDF-).";
  if (signers.length === 0) return "A report is issued on someone's approval: name at least one signer.";
  if (signers.length > MAX_SIGNERS) return `At most ${MAX_SIGNERS} signers.`;
  for (const [i, s] of signers.entries()) {
    if (!s.name?.trim() || !s.role?.trim()) return `Signer ${i + 1} needs a name and a role.`;
    if (Number.isNaN(Date.parse(s.at))) return `Signer ${i + 1}'s time "${s.at}" is not a date and time.`;
  }
  if ((input.reason ?? "").length > MAX_REASON) return `The reason is at most ${MAX_REASON} characters.`;
  return null;
}

/**
 * Hashes, signs, stores and records a report; marks the previous revision superseded; tells the
 * owner. Nothing is left behind when a step fails. Returns the stored row.
 */
export async function issueReport(input: IssueReportInput): Promise<Report> {
  const problem = validate(input);
  if (problem) throw new ReportIssueError(problem, 400);
  const db = await getDb();
  const [issuer] = await db.select({ id: users.id, name: users.name }).from(users).where(eq(users.id, input.issuedBy));
  if (!issuer) throw new ReportIssueError("The issuing user does not exist.", 400);

  const plan = input.plan ?? (await planReportIssue({ projectId: input.projectId }));
  if (plan.projectId !== input.projectId) throw new ReportIssueError("The plan belongs to another project.", 400);
  const reason = (input.reason ?? "").trim();
  if (plan.revision > 1 && reason === "") throw new ReportIssueError(`Revision ${plan.revision} replaces an issued report: say why (reason).`, 400);

  const key = getSigningKey();
  const sha256 = sha256Hex(input.pdf);
  const signature = signBytes(input.pdf, key).toString("base64");
  const objectKey = `projects/${input.projectId}/reports/${plan.reportId}/revision-${plan.revision}.pdf`;
  const fileName = `airtally-report-${plan.code}-rev${plan.revision}.pdf`;

  await putObject({ key: objectKey, body: input.pdf, contentType: "application/pdf", metadata: { sha256, code: plan.code } });
  let row: Report;
  try {
    row = await db.transaction(async (tx) => {
      // One issue at a time per project: the row lock orders concurrent issues, and the revision check refuses the loser.
      await tx.execute(sql`select id from ${projects} where id = ${input.projectId} for update`);
      const [latest] = await tx.select().from(reports).where(eq(reports.projectId, input.projectId)).orderBy(desc(reports.revision)).limit(1);
      const expected = (latest?.revision ?? 0) + 1;
      if (plan.revision !== expected) throw new ReportIssueError(`Revision ${latest?.revision} was issued meanwhile; build the report again as revision ${expected}.`, 409);
      const [inserted] = await tx
        .insert(reports)
        .values({
          id: plan.reportId,
          projectId: input.projectId,
          revision: plan.revision,
          code: plan.code,
          sha256,
          signature,
          publicKeyPem: key.publicKeyPem,
          keyId: key.keyId,
          objectKey,
          bytes: input.pdf.byteLength,
          fileName,
          issuedBy: issuer.id,
          issuedByName: issuer.name,
          signers: input.signers.map((s) => ({ userId: s.userId ?? null, name: s.name.trim(), role: s.role.trim(), at: new Date(s.at).toISOString() })),
          reason,
        })
        .returning();
      if (latest) {
        await tx
          .update(reports)
          .set({ supersededBy: plan.reportId, supersededAt: inserted!.issuedAt })
          .where(and(eq(reports.projectId, input.projectId), isNull(reports.supersededBy), sql`${reports.id} <> ${plan.reportId}`));
      }
      await notifyReportIssued({ projectId: input.projectId, reportId: plan.reportId, revision: plan.revision, code: plan.code, by: issuer, tx });
      return inserted!;
    });
  } catch (err) {
    await deleteObjectsQuietly([objectKey]);
    throw err;
  }
  kickDelivery();
  await recordAudit({
    userId: issuer.id,
    projectId: input.projectId,
    action: "report.issued",
    entityType: "report",
    entityId: row.id,
    detail: { revision: row.revision, code: row.code, sha256, keyId: key.keyId, reason, signers: row.signers },
  });
  return row;
}
