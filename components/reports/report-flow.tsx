"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button, buttonClasses } from "@/components/ui/button";

export interface ReadinessView {
  ready: boolean;
  revision: number;
  blockers: string[];
  excluded: string[];
  approvals: { role: string; title: string; approval: { name: string; at: string; comment: string } | null; current: boolean }[];
  supervisor: { designated: boolean; name: string | null; signed: boolean; signedAt: string | null };
}

const when = (iso: string) => `${iso.slice(0, 16).replace("T", " ")} UTC`;

async function post(url: string, body: unknown): Promise<{ ok: true } | { ok: false; message: string; field?: string }> {
  const res = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  if (res.ok) return { ok: true };
  const data = (await res.json().catch(() => null)) as { error?: { message?: string; fields?: Record<string, string> }; blockers?: string[] } | null;
  const field = data?.error?.fields ? Object.keys(data.error.fields)[0] : undefined;
  return { ok: false, message: data?.blockers?.join(" ") || (field && data?.error?.fields?.[field]) || data?.error?.message || `The server answered ${res.status}.`, field };
}

/**
 * The issuing flow on the Reports page: the draft download, what still blocks an issue (in words,
 * each with a mark and a word, never colour alone), the approval of the commissioning agent or
 * engineer of record, and the issue itself with the reason a later revision needs.
 */
export function ReportFlow({ projectId, readiness, canApprove, canIssue, role }: { projectId: string; readiness: ReadinessView; canApprove: boolean; canIssue: boolean; role: string | null }) {
  const router = useRouter();
  const [busy, setBusy] = useState<"approve" | "issue" | null>(null);
  const [comment, setComment] = useState("");
  const [reason, setReason] = useState("");
  const [message, setMessage] = useState<{ kind: "ok" | "error"; text: string; field?: string } | null>(null);
  const base = `/api/v1/projects/${projectId}/reports`;
  const mine = readiness.approvals.find((a) => a.role === role);

  const approve = async () => {
    setBusy("approve");
    setMessage(null);
    const answer = await post(`${base}/approvals`, comment.trim() ? { comment: comment.trim() } : {});
    setBusy(null);
    if (answer.ok) {
      setComment("");
      setMessage({ kind: "ok", text: "Your approval of the report's content is recorded." });
      router.refresh();
    } else setMessage({ kind: "error", text: answer.message, field: answer.field });
  };
  const issue = async () => {
    setBusy("issue");
    setMessage(null);
    const answer = await post(base, reason.trim() ? { reason: reason.trim() } : {});
    setBusy(null);
    if (answer.ok) {
      setReason("");
      setMessage({ kind: "ok", text: `Revision ${readiness.revision} is issued: the owner has been told.` });
      router.refresh();
    } else setMessage({ kind: "error", text: answer.message, field: answer.field });
  };

  const checks: { label: string; done: boolean; detail: string }[] = [
    {
      label: "TAB supervisor's certification signed",
      done: readiness.supervisor.signed,
      detail: readiness.supervisor.signed ? `${readiness.supervisor.name}, ${when(readiness.supervisor.signedAt!)}` : readiness.supervisor.designated ? `Waiting for ${readiness.supervisor.name} to sign on the Members page.` : "No TAB supervisor designated yet.",
    },
    ...readiness.approvals.map((a) => ({
      label: `${a.title}'s approval`,
      done: a.current,
      detail: a.approval ? (a.current ? `${a.approval.name}, ${when(a.approval.at)}` : `${a.approval.name}'s approval of ${when(a.approval.at)} no longer counts: the data changed since.`) : "Not approved yet.",
    })),
  ];

  return (
    <section aria-labelledby="issue-title" className="grid gap-4">
      <h2 id="issue-title" className="text-xl font-semibold">
        Revision {readiness.revision}: {readiness.ready ? "ready to issue" : "not ready to issue yet"}
      </h2>
      <p>
        <a className={buttonClasses("secondary")} href={`${base}/draft.pdf`}>
          Download a draft (PDF)
        </a>
        <span className="ml-3 text-sm text-ink-soft">From the data as they stand, approved or not; marked as a draft on every page.</span>
      </p>
      <ul className="grid gap-2" aria-label="Readiness checklist">
        {checks.map((c) => (
          <li key={c.label} className="flex items-start gap-2">
            <span aria-hidden="true" className={`mt-0.5 inline-flex h-6 w-6 shrink-0 items-center justify-center rounded-full border-2 font-bold ${c.done ? "border-ok text-ok" : "border-caution text-caution"}`}>
              {c.done ? "✓" : "!"}
            </span>
            <span>
              <strong>{c.label}:</strong> {c.done ? "done" : "missing"}. <span className="text-ink-soft">{c.detail}</span>
            </span>
          </li>
        ))}
      </ul>
      {readiness.blockers.length > 0 && (
        <div>
          <h3 className="font-semibold">What blocks the issue</h3>
          <ul className="ml-5 list-disc">
            {readiness.blockers.map((b) => (
              <li key={b}>{b}</li>
            ))}
          </ul>
        </div>
      )}
      {readiness.excluded.length > 0 && (
        <div>
          <h3 className="font-semibold">Left out of the issued report (not approved — excluded)</h3>
          <ul className="ml-5 list-disc">
            {readiness.excluded.map((b) => (
              <li key={b}>{b}</li>
            ))}
          </ul>
        </div>
      )}
      {canApprove && (
        <div className="grid gap-2 rounded-card border border-line p-3">
          <label htmlFor="approval-comment" className="font-semibold">
            Approve the report&rsquo;s content as {mine?.title.toLowerCase() ?? "approver"}
          </label>
          <p className="text-sm text-ink-soft">Read the draft first. Your approval covers the approved data as they stand now; any later change voids it.</p>
          <input id="approval-comment" className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3" maxLength={2000} placeholder="Comment (optional)" value={comment} onChange={(e) => setComment(e.target.value)} />
          <div>
            <Button onClick={approve} disabled={busy !== null}>
              {busy === "approve" ? "Recording…" : mine?.current ? "Approve again" : "Approve the report's content"}
            </Button>
          </div>
        </div>
      )}
      {canIssue && (
        <div className="grid gap-2 rounded-card border border-line p-3">
          <label htmlFor="issue-reason" className="font-semibold">
            {readiness.revision > 1 ? `Why revision ${readiness.revision} replaces the current one (required)` : "Note for this revision (optional)"}
          </label>
          <textarea
            id="issue-reason"
            className="min-h-[5rem] w-full rounded-card border-2 border-line-strong bg-paper-raised p-3"
            maxLength={2000}
            value={reason}
            aria-invalid={message?.field === "reason" ? true : undefined}
            aria-describedby={message?.field === "reason" ? "report-flow-message" : undefined}
            onChange={(e) => setReason(e.target.value)}
          />
          <div>
            <Button onClick={issue} disabled={busy !== null || !readiness.ready}>
              {busy === "issue" ? "Building and signing…" : `Issue revision ${readiness.revision}`}
            </Button>
          </div>
        </div>
      )}
      <p id="report-flow-message" aria-live="polite" className={message?.kind === "error" ? "font-semibold text-fault" : "font-semibold text-ok"}>
        {message?.text}
      </p>
    </section>
  );
}
