import type { Metadata } from "next";
import Link from "next/link";
import { AcceptInvitationForm } from "@/components/auth/accept-invitation-form";
import { Wordmark } from "@/components/layout/wordmark";
import { buttonClasses } from "@/components/ui/button";
import { ROLE_LABELS } from "@/lib/auth/policy";
import { findInvitation } from "@/lib/server/invitations";

export const metadata: Metadata = { title: "Accept an invitation" };
export const dynamic = "force-dynamic";

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const found = await findInvitation(decodeURIComponent(token));
  return (
    <main className="mx-auto flex min-h-screen max-w-5xl flex-col justify-center gap-10 px-6 py-10 md:flex-row md:items-start md:pt-24">
      <div className="md:w-1/2">
        <Wordmark size="lg" />
        <p className="mt-4 max-w-md text-lg text-ink-soft">The airflow commissioning record: traverses, terminal readings, reviews and the signed closeout report.</p>
      </div>
      <div className="rounded-card border border-line bg-paper-raised p-6 shadow-sm md:w-1/2">
        {found.ok ? (
          <>
            <h1 className="mb-2">Join {found.projectName}</h1>
            <p className="mb-5 text-ink-soft">
              {found.invitedByName ?? "The project"} invited you as <strong className="text-ink">{ROLE_LABELS[found.invitation.role].toLowerCase()}</strong> at {found.siteName}. This link works once, until{" "}
              <span className="num">{found.invitation.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC</span>.
            </p>
            <AcceptInvitationForm token={decodeURIComponent(token)} email={found.invitation.email} />
          </>
        ) : (
          <>
            <h1 className="mb-4">This invitation cannot be used</h1>
            <p role="alert" className="mb-5 rounded-card border-2 border-fault bg-fault-soft p-3 font-semibold text-fault">
              {found.message}
            </p>
            <Link href="/sign-in" className={buttonClasses("secondary")}>
              Go to sign-in
            </Link>
          </>
        )}
      </div>
    </main>
  );
}
