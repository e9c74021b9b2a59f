"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { buttonClasses } from "@/components/ui/button";
import { forgetOfflinePages } from "@/lib/offline/service-worker";

/** Ends the session (or, `everywhere`, every session of the user on every device), then shows the signed-out page. */
export function SignOutButton({ variant = "header", everywhere = false }: { variant?: "header" | "primary" | "secondary"; everywhere?: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [failed, setFailed] = useState(false);
  return (
    <>
      <button
        type="button"
        disabled={busy}
        className={variant === "header" ? buttonClasses("quiet", "px-3 text-white") : buttonClasses(variant)}
        onClick={async () => {
          setBusy(true);
          setFailed(false);
          const res = await fetch(everywhere ? "/api/auth/sign-out-everywhere" : "/api/auth/sign-out", { method: "POST" }).catch(() => null);
          if (!res?.ok) {
            setFailed(true);
            setBusy(false);
            return;
          }
          await forgetOfflinePages().catch(() => undefined);
          router.replace("/sign-out");
          router.refresh();
        }}
      >
        {everywhere ? "Sign out on every device" : "Sign out"}
      </button>
      {failed && (
        <span role="alert" className={variant === "header" ? "text-sm text-caution-soft" : "text-sm font-semibold text-fault"}>
          Could not reach the server to sign out; try again.
        </span>
      )}
    </>
  );
}
