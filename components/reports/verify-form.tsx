"use client";

import Link from "next/link";
import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { ApiError } from "@/lib/api-client";
import { useVerifyReport } from "@/lib/api-client/reports";

const fmt = (iso: string) => `${iso.slice(0, 16).replace("T", " ")} UTC`;

/** Choose a file, send it, and say in words and with a shape whether it is a genuine issued report. */
export function VerifyForm({ expectedCode }: { expectedCode?: string }) {
  const inputId = useId();
  const verify = useVerifyReport();
  const [file, setFile] = useState<File | null>(null);
  const answer = verify.data;
  const otherCode = answer?.valid && expectedCode && answer.report && answer.report.code !== expectedCode;

  return (
    <div className="grid gap-4">
      <form
        className="grid gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          if (file) verify.mutate(file);
        }}
      >
        <label htmlFor={inputId} className="font-semibold">
          The report file (PDF) to check
        </label>
        <input
          id={inputId}
          type="file"
          accept="application/pdf,.pdf"
          className="min-h-touch rounded-card border-2 border-dashed border-line-strong bg-paper-raised p-3 file:mr-3 file:min-h-touch file:rounded-card file:border-0 file:bg-accent-soft file:px-4 file:font-semibold file:text-accent-strong"
          onChange={(e) => {
            setFile(e.target.files?.[0] ?? null);
            verify.reset();
          }}
        />
        <p className="text-sm text-ink-muted">The file is sent to this server only to compute its fingerprint and check its signature; it is not kept.</p>
        <Button type="submit" disabled={!file || verify.isPending} className="justify-self-start">
          {verify.isPending ? "Checking…" : "Check this file"}
        </Button>
      </form>
      <div aria-live="polite">
        {verify.isError && (
          <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft p-3 font-semibold text-fault">
            {verify.error instanceof ApiError ? verify.error.message : "The check could not be made; try again."}
          </p>
        )}
        {answer && (
          <section aria-label="Result" className={`rounded-card border-2 p-4 ${answer.valid && !otherCode ? "border-ok bg-ok-soft" : "border-fault bg-fault-soft"}`}>
            <p className={`flex items-center gap-2 text-xl font-bold ${answer.valid && !otherCode ? "text-ok" : "text-fault"}`}>
              <svg viewBox="0 0 16 16" width="24" height="24" aria-hidden="true">
                {answer.valid && !otherCode ? (
                  <path d="M3 8.5l3 3 7-7" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />
                ) : (
                  <path d="M4 4l8 8M12 4l-8 8" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
                )}
              </svg>
              {!answer.valid ? "Not a genuine issued report" : otherCode ? "Genuine, but a different report" : answer.report?.superseded ? "Genuine — superseded by a later revision" : "Genuine: this is the issued report, unchanged"}
            </p>
            {answer.reason && <p className="mt-2">{answer.reason}</p>}
            {otherCode && answer.report && (
              <p className="mt-2">
                This file was issued under code{" "}
                <Link className="font-semibold underline" href={`/verify/${answer.report.code}`}>
                  {answer.report.code}
                </Link>
                , not {expectedCode}.
              </p>
            )}
            {answer.valid && answer.report && (
              <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
                <dt className="text-ink-muted">Project</dt>
                <dd className="font-semibold">{answer.report.project}</dd>
                <dt className="text-ink-muted">Revision</dt>
                <dd className="num">{answer.report.revision}</dd>
                <dt className="text-ink-muted">Issued</dt>
                <dd className="num">{fmt(answer.report.issuedAt)}</dd>
                <dt className="text-ink-muted">Code</dt>
                <dd>
                  <Link className="num underline" href={`/verify/${answer.report.code}`}>
                    {answer.report.code}
                  </Link>
                </dd>
                <dt className="text-ink-muted">Approved in the app by</dt>
                <dd>
                  <ul>
                    {answer.report.signers.map((s) => (
                      <li key={`${s.name}-${s.role}`}>
                        {s.name}, {s.role} <span className="num text-ink-soft">({fmt(s.at)})</span>
                      </li>
                    ))}
                  </ul>
                </dd>
              </dl>
            )}
          </section>
        )}
      </div>
    </div>
  );
}
