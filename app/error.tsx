"use client";

import { useEffect } from "react";
import { Button } from "@/components/ui/button";

/** A failure we did not expect: say so plainly, keep what was saved, offer a retry. */
export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-md flex-col justify-center gap-5 px-6">
      <h1>Something went wrong</h1>
      <p>
        The page could not be shown. Readings already saved are not affected. Try again; if it keeps happening, give your administrator this
        reference: <code className="font-semibold">{error.digest ?? "none"}</code>.
      </p>
      <Button onClick={reset} className="self-start">
        Try again
      </Button>
    </main>
  );
}
