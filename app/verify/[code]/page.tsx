import type { Metadata } from "next";
import Link from "next/link";
import { OfflineCheck, SignatureExplainer } from "@/components/reports/signature-explainer";
import { VerifyForm } from "@/components/reports/verify-form";
import { getReportByCode } from "@/db/queries/reports";
import { normaliseVerificationCode } from "@/lib/server/report-codes";

export const metadata: Metadata = { title: "Issued report" };
export const dynamic = "force-dynamic";

const when = (d: Date | string) => `${new Date(d).toISOString().slice(0, 16).replace("T", " ")} UTC`;

export default async function VerifyCodePage({ params }: { params: Promise<{ code: string }> }) {
  const raw = decodeURIComponent((await params).code);
  const code = normaliseVerificationCode(raw);
  const found = code ? await getReportByCode({ code }) : null;

  if (!found) {
    return (
      <main className="mx-auto grid max-w-5xl gap-6 px-gutter py-8">
        <h1>No report under this code</h1>
        <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft p-4 font-semibold text-fault">
          No closeout report was issued by this Airtally deployment under the code “{raw.slice(0, 40)}”. Check the code as printed on the report (12 letters and digits in
          three groups), or check the file itself.
        </p>
        <Link href="/verify" className="font-semibold text-accent-strong underline">
          Check a file instead
        </Link>
      </main>
    );
  }

  const { report, projectName, siteName, successor } = found;
  return (
    <main className="mx-auto grid max-w-5xl gap-8 px-gutter py-8">
      <div className="grid gap-2">
        <p className="num text-sm font-semibold uppercase tracking-wide text-ink-muted">Verification code {report.code}</p>
        <h1>
          {projectName} — closeout report, revision {report.revision}
        </h1>
        <p className="text-ink-soft">{siteName}</p>
      </div>
      {successor ? (
        <p className="rounded-card border-2 border-caution bg-caution-soft p-4 font-semibold">
          Superseded {report.supersededAt ? when(report.supersededAt) : ""} by{" "}
          <Link className="underline" href={`/verify/${successor.code}`}>
            revision {successor.revision}
          </Link>
          . This revision stays genuine, but it is no longer the current report.
        </p>
      ) : (
        <p className="rounded-card border-2 border-ok bg-ok-soft p-4 font-semibold text-ok">This is the current revision of the project&apos;s closeout report.</p>
      )}
      <section aria-labelledby="record" className="rounded-card border border-line bg-paper-raised p-gutter">
        <h2 id="record" className="mb-3">
          What was issued under this code
        </h2>
        <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-[auto_1fr]">
          <dt className="text-ink-muted">Issued</dt>
          <dd className="num">
            {when(report.issuedAt)} by {report.issuedByName}
          </dd>
          <dt className="text-ink-muted">Approved in the app by</dt>
          <dd>
            <ul>
              {report.signers.map((s) => (
                <li key={`${s.name}-${s.role}-${s.at}`}>
                  {s.name}, {s.role} <span className="num text-ink-soft">({when(s.at)})</span>
                </li>
              ))}
            </ul>
          </dd>
          {report.reason && (
            <>
              <dt className="text-ink-muted">Why this revision</dt>
              <dd>{report.reason}</dd>
            </>
          )}
          <dt className="text-ink-muted">File</dt>
          <dd className="num">
            {report.fileName}, {report.bytes.toLocaleString("en")} bytes
          </dd>
          <dt className="text-ink-muted">SHA-256</dt>
          <dd className="num break-all font-mono text-sm">{report.sha256}</dd>
          <dt className="text-ink-muted">Signed with key</dt>
          <dd className="num font-mono text-sm">{report.keyId}</dd>
          <dt className="text-ink-muted">Signature</dt>
          <dd>
            <a className="font-semibold text-accent-strong underline" href={`/api/v1/reports/${report.code}/signature`}>
              Download the signature file (.sig)
            </a>
          </dd>
        </dl>
      </section>
      <section aria-labelledby="check-file" className="grid gap-3">
        <h2 id="check-file">Check a copy of this report</h2>
        <VerifyForm expectedCode={report.code} />
      </section>
      <SignatureExplainer />
      <OfflineCheck />
    </main>
  );
}
