/**
 * The issuing flow of the closeout report: the commissioning agent and the engineer of record each
 * approve the report's content as it stands (a fingerprint of the approved data is kept with the
 * approval, so any later change voids it), the TAB supervisor signs their statement, and then the
 * report is built from approved data, signed and stored (planReportIssue, then issueReport).
 */
import "server-only";
import crypto from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { recordAudit } from "@/db/queries/audit";
import { reportApprovals, reports, type MemberRole, type Report, type ReportApprovalRow, type ReportSigner } from "@/db/schema";
import type { ReportApproval, ReportModel } from "@/lib/report/model";
import { renderReport } from "@/lib/report/render";
import { loadReportModel, reportContent } from "./report-data";
import { issueReport, planReportIssue, ReportIssueError } from "./report-issue";
import { getSupervisorState } from "./supervisor";

export type ApproverRole = Extract<MemberRole, "commissioning_agent" | "engineer">;
export const APPROVER_ROLES: readonly ApproverRole[] = ["commissioning_agent", "engineer"];
export const APPROVER_TITLES: Record<ApproverRole, string> = { commissioning_agent: "Commissioning agent", engineer: "Engineer of record" };
const MAX_COMMENT = 2000;

/** SHA-256 of the report's content as an issued report would show it (approved data only). */
export function contentFingerprint(model: ReportModel): string {
  return crypto.createHash("sha256").update(JSON.stringify(reportContent(model))).digest("hex");
}

export interface ApprovalState {
  role: ApproverRole;
  title: string;
  /** The newest approval for the next revision, if any. */
  approval: { name: string; at: string; comment: string } | null;
  /** True when that approval matches the content as it stands now. */
  current: boolean;
}

export interface Readiness {
  ready: boolean;
  /** The revision an issue would make now. */
  revision: number;
  /** What blocks the issue, in words. */
  blockers: string[];
  /** What the issued report will leave out (not approved — excluded), in words. */
  excluded: string[];
  approvals: ApprovalState[];
  supervisor: { designated: boolean; name: string | null; signed: boolean; signedAt: string | null };
  fingerprint: string;
}

async function latestApprovals(projectId: string, revision: number): Promise<Map<ApproverRole, ReportApprovalRow>> {
  const db = await getDb();
  const rows = await db
    .select()
    .from(reportApprovals)
    .where(and(eq(reportApprovals.projectId, projectId), eq(reportApprovals.forRevision, revision)))
    .orderBy(desc(reportApprovals.approvedAt))
    .limit(200);
  const out = new Map<ApproverRole, ReportApprovalRow>();
  for (const r of rows) if ((r.role === "commissioning_agent" || r.role === "engineer") && !out.has(r.role)) out.set(r.role, r);
  return out;
}

async function nextRevision(projectId: string): Promise<number> {
  const db = await getDb();
  const [latest] = await db.select({ revision: reports.revision }).from(reports).where(eq(reports.projectId, projectId)).orderBy(desc(reports.revision)).limit(1);
  return (latest?.revision ?? 0) + 1;
}

function excludedItems(model: ReportModel): string[] {
  const out: string[] = [];
  for (const s of model.systems) {
    const rows = s.rows.filter((r) => r.excluded && r.depth > 0).map((r) => r.tag);
    if (rows.length > 0) out.push(`${s.tag}: traverse${rows.length === 1 ? "" : "s"} of ${rows.join(", ")} not approved`);
    if (s.terminalSet.excluded) out.push(`${s.tag}: outlet and terminal-unit readings not approved`);
  }
  return out;
}

/** What stands between the project and an issued report, from the data as they are now. */
export async function getReportReadiness({ projectId, model }: { projectId: string; model?: ReportModel }): Promise<Readiness> {
  const content = model ?? (await loadReportModel({ projectId, kind: "issued", withPhotoBytes: false }));
  const fingerprint = contentFingerprint(content);
  const revision = await nextRevision(projectId);
  const [latest, supervisor] = await Promise.all([latestApprovals(projectId, revision), getSupervisorState({ projectId })]);
  const blockers: string[] = [];
  const hasData = content.traverses.length > 0 || content.systems.some((s) => s.terminalSet.status === "approved");
  if (!hasData) blockers.push("Nothing is approved yet: an issued report contains approved data only. The commissioning agent approves traverses and terminal readings on the review screens.");
  if (!supervisor.designation) blockers.push("No TAB supervisor is designated for the project: the engineer or a site administrator designates a certified technician on the Members page.");
  else if (!supervisor.signature) blockers.push(`The TAB supervisor (${supervisor.designation.name}) has not signed the certification statement yet.`);
  const approvals: ApprovalState[] = APPROVER_ROLES.map((role) => {
    const row = latest.get(role);
    const current = !!row && row.fingerprint === fingerprint;
    const title = APPROVER_TITLES[role];
    if (!row) blockers.push(`The ${title.toLowerCase()} has not approved the report's content${revision > 1 ? ` for revision ${revision}` : ""} yet.`);
    else if (!current) blockers.push(`The ${title.toLowerCase()}'s approval (${row.name}, ${row.approvedAt.toISOString().slice(0, 16).replace("T", " ")} UTC) no longer counts: the data changed since. Approve again.`);
    return { role, title, approval: row ? { name: row.name, at: row.approvedAt.toISOString(), comment: row.comment } : null, current };
  });
  return {
    ready: blockers.length === 0,
    revision,
    blockers,
    excluded: excludedItems(content),
    approvals,
    supervisor: {
      designated: !!supervisor.designation,
      name: supervisor.designation?.name ?? null,
      signed: !!supervisor.signature,
      signedAt: supervisor.signature?.signedAt.toISOString() ?? null,
    },
    fingerprint,
  };
}

export class ReportFlowError extends Error {
  constructor(
    message: string,
    readonly status: 400 | 403 | 404 | 409,
    readonly fields?: Record<string, string>,
    readonly blockers?: string[],
  ) {
    super(message);
  }
}

/** The commissioning agent or the engineer of record approves the report's content as it stands now. */
export async function approveReport({ projectId, user, role, comment = "" }: { projectId: string; user: { id: string; name: string; email?: string }; role: MemberRole; comment?: string }): Promise<Readiness> {
  if (role !== "commissioning_agent" && role !== "engineer") throw new ReportFlowError("Only the commissioning agent and the engineer of record approve the report.", 403);
  if (comment.length > MAX_COMMENT) throw new ReportFlowError(`The comment is at most ${MAX_COMMENT} characters.`, 400, { comment: `At most ${MAX_COMMENT} characters.` });
  const model = await loadReportModel({ projectId, kind: "issued", withPhotoBytes: false });
  const before = await getReportReadiness({ projectId, model });
  if (model.traverses.length === 0 && !model.systems.some((s) => s.terminalSet.status === "approved"))
    throw new ReportFlowError("There is nothing approved to report yet: approve traverses or terminal readings first.", 409, undefined, before.blockers);
  const db = await getDb();
  const [row] = await db
    .insert(reportApprovals)
    .values({ projectId, userId: user.id, name: user.name, role, forRevision: before.revision, fingerprint: before.fingerprint, comment: comment.trim() })
    .returning();
  await recordAudit({ userId: user.id, actorEmail: user.email, projectId, action: "report.approved", entityType: "report_approval", entityId: row!.id, detail: { role, revision: before.revision, fingerprint: before.fingerprint } });
  return getReportReadiness({ projectId, model });
}

/** The approvals and the supervisor's signature as printed in the report and stored as its signers. */
function approvalsOf(readiness: Readiness, signature: { name: string; signedAt: Date; userId: string | null } | null, userIds: Map<ApproverRole, string | null>): { printed: ReportApproval[]; signers: ReportSigner[] } {
  const printed: ReportApproval[] = [];
  const signers: ReportSigner[] = [];
  if (signature) {
    printed.push({ name: signature.name, role: "TAB supervisor", at: signature.signedAt.toISOString(), what: "Signed the certification statement in the app" });
    signers.push({ userId: signature.userId, name: signature.name, role: "TAB supervisor", at: signature.signedAt.toISOString() });
  }
  for (const a of readiness.approvals) {
    if (!a.approval || !a.current) continue;
    printed.push({ name: a.approval.name, role: a.title, at: a.approval.at, what: `Approved the content of revision ${readiness.revision}${a.approval.comment ? `: ${a.approval.comment}` : ""}` });
    signers.push({ userId: userIds.get(a.role) ?? null, name: a.approval.name, role: a.title, at: a.approval.at });
  }
  return { printed, signers };
}

/** A draft of the report from the data as they stand now, for any member. */
export async function buildDraftReport({ projectId }: { projectId: string }): Promise<Uint8Array> {
  const readiness = await getReportReadiness({ projectId });
  const supervisor = await getSupervisorState({ projectId });
  const latest = await latestApprovals(projectId, readiness.revision);
  const { printed } = approvalsOf(readiness, supervisor.signature, new Map([...latest].map(([r, row]) => [r, row.userId])));
  const model = await loadReportModel({ projectId, kind: "draft", approvals: printed });
  return renderReport(model);
}

/**
 * Issues the next revision: refuses (409, with the blockers) unless both approvals match the content
 * and the supervisor has signed; then builds the PDF from approved data, signs and stores it.
 */
export async function issueProjectReport({ projectId, user, reason = "" }: { projectId: string; user: { id: string }; reason?: string }): Promise<Report> {
  const readiness = await getReportReadiness({ projectId });
  if (!readiness.ready) throw new ReportFlowError("The report cannot be issued yet.", 409, undefined, readiness.blockers);
  if (readiness.revision > 1 && reason.trim() === "")
    throw new ReportFlowError(`Revision ${readiness.revision} replaces an issued report: say why.`, 400, { reason: "Required from revision 2 on: what changed since the last revision." });
  if (reason.length > 2000) throw new ReportFlowError("The reason is at most 2000 characters.", 400, { reason: "At most 2000 characters." });
  const plan = await planReportIssue({ projectId });
  if (plan.revision !== readiness.revision) throw new ReportFlowError(`Revision ${plan.revision - 1} was issued meanwhile; approve again for revision ${plan.revision}.`, 409);
  const supervisor = await getSupervisorState({ projectId });
  const latest = await latestApprovals(projectId, readiness.revision);
  const { printed, signers } = approvalsOf(readiness, supervisor.signature, new Map([...latest].map(([r, row]) => [r, row.userId])));
  const model = await loadReportModel({ projectId, kind: "issued", plan, reason: reason.trim(), approvals: printed });
  // The data may have moved between the readiness check and the build: approvals must match what is printed.
  if (contentFingerprint(model) !== readiness.fingerprint) throw new ReportFlowError("The data changed while the report was being built; the approvals no longer match. Approve again.", 409);
  const pdf = await renderReport(model);
  try {
    return await issueReport({ projectId, pdf, signers, reason: reason.trim(), issuedBy: user.id, plan });
  } catch (err) {
    if (err instanceof ReportIssueError) throw new ReportFlowError(err.message, err.status === 404 ? 404 : err.status, err.status === 400 && /reason/.test(err.message) ? { reason: err.message } : undefined);
    throw err;
  }
}
