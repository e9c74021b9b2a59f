/**
 * The page side of public/sw.js: registers it, tells it whose pages it keeps (a different user's
 * sign-in clears the others' pages), and hands it the files this page already loaded so a reload
 * without network finds them. Does nothing where service workers are unavailable (http other than
 * localhost, old browsers).
 */

export function registerOfflinePages(owner: string): void {
  if (typeof navigator === "undefined" || !("serviceWorker" in navigator)) return;
  void navigator.serviceWorker
    .register("/sw.js", { scope: "/" })
    .then(async () => {
      const ready = await navigator.serviceWorker.ready;
      const worker = ready.active;
      if (!worker) return;
      worker.postMessage({ type: "owner", owner });
      const files = performance
        .getEntriesByType("resource")
        .map((e) => e.name)
        .filter((u) => u.startsWith(`${location.origin}/_next/static/`));
      worker.postMessage({ type: "keep", page: location.href, files });
    })
    .catch(() => undefined);
}

/** Signing out: the pages kept for offline use hold the user's data; drop them (drafts stay until sent). */
export async function forgetOfflinePages(): Promise<void> {
  if (typeof navigator === "undefined" || !("serviceWorker" in navigator)) return;
  const reg = await navigator.serviceWorker.getRegistration().catch(() => undefined);
  reg?.active?.postMessage({ type: "forget-pages" });
}
