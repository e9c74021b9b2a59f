import Link from "next/link";
import type { Report } from "@/db/schema";

const when = (d: Date) => `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;

/** Issued revisions, newest first, each with its PDF, signature and verification page. */
export function IssuedReports({ projectId, reports }: { projectId: string; reports: Report[] }) {
  return (
    <ul className="divide-y divide-line">
      {reports.map((r) => (
        <li key={r.id} className="grid gap-2 py-3">
          <p className="flex flex-wrap items-center gap-2">
            <strong>Revision {r.revision}</strong>
            <span className="num text-ink-soft">issued {when(r.issuedAt)} by {r.issuedByName}</span>
            {r.supersededBy ? (
              <span className="rounded-full border border-line-strong bg-paper-sunk px-2 text-sm font-semibold text-ink-soft">Superseded</span>
            ) : (
              <span className="rounded-full border border-ok bg-ok-soft px-2 text-sm font-semibold text-ok">Current</span>
            )}
          </p>
          {r.reason && <p className="text-sm">Why: {r.reason}</p>}
          <p className="flex flex-wrap gap-x-4 gap-y-1">
            <a className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline" href={`/api/v1/projects/${projectId}/reports/${r.id}/pdf`}>
              Download the PDF<span className="sr-only"> of revision {r.revision}</span>
            </a>
            <a className="inline-flex min-h-touch items-center text-accent-strong underline" href={`/api/v1/projects/${projectId}/reports/${r.id}/signature`}>
              Signature file<span className="sr-only"> of revision {r.revision}</span>
            </a>
            <Link className="inline-flex min-h-touch items-center text-accent-strong underline" href={`/verify/${r.code}`}>
              Verification page ({r.code})
            </Link>
          </p>
        </li>
      ))}
    </ul>
  );
}
