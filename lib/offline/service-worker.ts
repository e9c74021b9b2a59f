/**
 * The page side of public/sw.js: registers it, tells it whose pages it keeps (a different user's
 * sign-in clears the others' pages), and asks it to keep each page a technician works on, with the
 * files the page loaded, so a reload without network finds them. Does nothing where service workers
 * are unavailable (plain http other than localhost, old browsers).
 */

/**
 * The pages worth reopening without network: where readings are taken and the register they need.
 * Screens of the field work add their paths here.
 */
export const OFFLINE_PAGES: readonly RegExp[] = [
  /^\/projects\/[^/]+\/field$/,
  /^\/projects\/[^/]+\/sections\/[^/]+\/traverses\/new$/,
  /^\/projects\/[^/]+\/traverses\/[^/]+$/,
  /^\/projects\/[^/]+\/terminals(\/.*)?$/,
  /^\/instruments(\/.*)?$/,
];

function supported(): boolean {
  return typeof navigator !== "undefined" && "serviceWorker" in navigator;
}

function loadedFiles(): string[] {
  return performance
    .getEntriesByType("resource")
    .map((e) => e.name)
    .filter((u) => u.startsWith(`${location.origin}/_next/static/`));
}

export function registerOfflinePages(owner: string): void {
  if (!supported()) return;
  void navigator.serviceWorker
    .register("/sw.js", { scope: "/" })
    .then(async () => {
      const worker = (await navigator.serviceWorker.ready).active;
      if (!worker) return;
      worker.postMessage({ type: "owner", owner });
      keepPageForOffline(location.href);
    })
    .catch(() => undefined);
}

/** Asks the service worker to keep this page (if it is one of OFFLINE_PAGES) and the files loaded so far. */
export function keepPageForOffline(href: string): void {
  if (!supported()) return;
  const url = new URL(href, location.origin);
  if (!OFFLINE_PAGES.some((re) => re.test(url.pathname))) return;
  void navigator.serviceWorker.ready
    .then((reg) => reg.active?.postMessage({ type: "keep", page: url.href, files: loadedFiles() }))
    .catch(() => undefined);
}

/**
 * Asks the service worker to keep the files this page has loaded by now, among them the parts it
 * fetched after it was up (the traverse screen's engine, chart and editors), which may have arrived
 * before the worker was in control of the page. Only for OFFLINE_PAGES; the page itself is kept on
 * registration and navigation.
 */
export function keepLoadedFilesForOffline(): void {
  if (!supported() || !OFFLINE_PAGES.some((re) => re.test(location.pathname))) return;
  void navigator.serviceWorker.ready.then((reg) => reg.active?.postMessage({ type: "keep-files", files: loadedFiles() })).catch(() => undefined);
}

/** Signing out: the pages kept for offline use hold the user's data; drop them (drafts stay until sent). */
export async function forgetOfflinePages(): Promise<void> {
  if (!supported()) return;
  const reg = await navigator.serviceWorker.getRegistration().catch(() => undefined);
  reg?.active?.postMessage({ type: "forget-pages" });
}
