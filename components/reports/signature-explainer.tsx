/** What the server's signature on a report proves, and what it does not; the same words as the README. */
export function SignatureExplainer() {
  return (
    <section aria-labelledby="what-it-proves" className="grid gap-3">
      <h2 id="what-it-proves">What this check proves, and what it does not</h2>
      <div className="grid gap-4 md:grid-cols-2">
        <div className="rounded-card border border-line bg-paper-raised p-4">
          <h3 className="mb-2 text-lg font-semibold">It proves</h3>
          <ul className="list-disc space-y-1 pl-5">
            <li>the file is byte for byte the one this Airtally deployment issued: one changed byte and the check fails;</li>
            <li>which revision it is, when it was issued, and whether a later revision has replaced it;</li>
            <li>who approved the data in the app before issue, with their role and the time.</li>
          </ul>
        </div>
        <div className="rounded-card border border-line bg-paper-raised p-4">
          <h3 className="mb-2 text-lg font-semibold">It does not</h3>
          <ul className="list-disc space-y-1 pl-5">
            <li>stand for a professional engineer&apos;s seal or stamp: whether a report must be sealed, and how, is set by local rules and licensing boards;</li>
            <li>re-check the measurements or the engineering: those rest with the people named in the report;</li>
            <li>replace the people&apos;s own certifications: the TAB supervisor&apos;s signed statement inside the report is theirs, separate from this server signature.</li>
          </ul>
        </div>
      </div>
    </section>
  );
}

export function OfflineCheck() {
  return (
    <section aria-labelledby="offline" className="grid gap-2">
      <h2 id="offline">Check it yourself, without this site</h2>
      <p className="max-w-prose">
        Reports are signed with Ed25519. With the{" "}
        {/* A file, not a page. */}
        {/* eslint-disable-next-line @next/next/no-html-link-for-pages */}
        <a className="font-semibold text-accent-strong underline" href="/api/v1/reports/public-key">deployment&apos;s public key</a> and the report&apos;s signature file
        (from the report&apos;s verification page, or from whoever gave you the report), OpenSSL 3 checks it on any computer:
      </p>
      <pre className="overflow-x-auto whitespace-pre-wrap rounded-card bg-ink p-3 text-sm text-white">
        <code>openssl pkeyutl -verify -pubin -inkey airtally-public.pem -rawin -in report.pdf -sigfile report.sig</code>
      </pre>
      <p className="text-sm text-ink-soft">It prints “Signature Verified Successfully” for the issued file, and fails for any other.</p>
    </section>
  );
}
