import Link from "next/link";
import { Wordmark } from "@/components/layout/wordmark";
import { buttonClasses } from "@/components/ui/button";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center gap-5 px-6">
      <Wordmark size="lg" />
      <h1>Not found</h1>
      <p>This page does not exist, or it belongs to a project you are not a member of.</p>
      <Link href="/projects" className={buttonClasses("primary", "self-start")}>
        Your projects
      </Link>
    </main>
  );
}
