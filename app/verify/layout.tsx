import Link from "next/link";
import { Providers } from "@/components/providers";
import { Wordmark } from "@/components/layout/wordmark";

/** The public verification pages: no sign-in, the same look. */
export default function VerifyLayout({ children }: { children: React.ReactNode }) {
  return (
    <Providers>
      <header className="bg-ink text-white">
        <div className="mx-auto flex max-w-5xl items-center justify-between gap-3 px-gutter py-2">
          <Link href="/verify" className="flex min-h-touch items-center" aria-label="Airtally: check a report">
            <Wordmark />
          </Link>
          <Link href="/sign-in" className="flex min-h-touch items-center rounded-card px-3 font-semibold hover:bg-ink-soft">
            Sign in
          </Link>
        </div>
      </header>
      {children}
    </Providers>
  );
}
