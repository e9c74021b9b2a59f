import type { Metadata } from "next";
import Link from "next/link";
import { SignOutButton } from "@/components/layout/sign-out-button";
import { Wordmark } from "@/components/layout/wordmark";
import { buttonClasses } from "@/components/ui/button";
import { currentUser } from "@/lib/auth/guards";

export const metadata: Metadata = { title: "Sign out" };
export const dynamic = "force-dynamic";

export default async function SignOutPage() {
  const user = await currentUser();
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center gap-6 px-6">
      <Wordmark size="lg" />
      {user ? (
        <>
          <h1>Sign out</h1>
          <p>
            You are signed in as <strong>{user.name}</strong> ({user.email}). Readings you have saved stay on the server.
          </p>
          <div className="flex flex-wrap gap-3">
            <SignOutButton variant="primary" />
            <Link href="/projects" className={buttonClasses("secondary")}>
              Stay signed in
            </Link>
          </div>
          <p className="text-ink-soft">Lost a tablet, or signed in on a shared computer? End every session of yours at once.</p>
          <div>
            <SignOutButton variant="secondary" everywhere />
          </div>
        </>
      ) : (
        <>
          <h1>You are signed out</h1>
          <p>Your session on this device has ended.</p>
          <Link href="/sign-in" className={buttonClasses("primary", "self-start")}>
            Sign in again
          </Link>
        </>
      )}
    </main>
  );
}
