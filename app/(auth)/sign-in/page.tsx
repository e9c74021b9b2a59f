import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/sign-in-form";
import { Wordmark } from "@/components/layout/wordmark";
import { demoMode } from "@/db/client";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "@/db/seed/index";
import { currentUser } from "@/lib/auth/guards";
import { ROLE_LABELS } from "@/lib/auth/policy";

export const metadata: Metadata = { title: "Sign in" };
export const dynamic = "force-dynamic";

export default async function SignInPage() {
  if (await currentUser()) redirect("/projects");
  const demo = demoMode();
  return (
    <main className="mx-auto flex min-h-screen max-w-5xl flex-col justify-center gap-10 px-6 py-10 md:flex-row md:items-start md:pt-24">
      <div className="md:w-1/2">
        <Wordmark size="lg" />
        <p className="mt-4 max-w-md text-lg text-ink-soft">
          Traverses, density-corrected airflow, continuity at every junction, and a signed closeout report.
        </p>
      </div>
      <div className="rounded-card border border-line bg-paper-raised p-6 shadow-sm md:w-1/2">
        <h1 className="mb-5">Sign in</h1>
        <SignInForm />
        {demo && (
          <section className="mt-8 border-t border-line pt-5" aria-labelledby="demo-accounts">
            <h2 id="demo-accounts" className="text-lg">
              Demo accounts
            </h2>
            <p className="mb-2 text-sm text-ink-soft">
              Password for all: <code className="font-semibold text-ink">{DEMO_PASSWORD}</code>
            </p>
            <ul className="space-y-1 text-sm">
              {DEMO_ACCOUNTS.map((a) => (
                <li key={a.email} className="flex justify-between gap-3">
                  <code>{a.email}</code>
                  <span className="text-ink-soft">{a.role ? ROLE_LABELS[a.role] : "Site administrator"}</span>
                </li>
              ))}
            </ul>
          </section>
        )}
      </div>
    </main>
  );
}
