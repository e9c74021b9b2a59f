import type { Metadata } from "next";
import { OfflineCheck, SignatureExplainer } from "@/components/reports/signature-explainer";
import { VerifyForm } from "@/components/reports/verify-form";

export const metadata: Metadata = { title: "Check a closeout report" };

export default function VerifyPage() {
  return (
    <main className="mx-auto grid max-w-5xl gap-8 px-gutter py-8">
      <div className="grid gap-2">
        <h1>Check a closeout report</h1>
        <p className="max-w-prose text-lg text-ink-soft">
          Anyone can check whether a PDF is a closeout report that this Airtally deployment issued, unchanged. No account is needed. Every page of an issued report also
          carries its own verification link.
        </p>
      </div>
      <VerifyForm />
      <SignatureExplainer />
      <OfflineCheck />
    </main>
  );
}
