/**
 * The traverse screen's parts that are not in the page's first load: the live engine (with the zod
 * validation of its input) and the results it draws (the server draws the first ones), the velocity map
 * and profile chart, the meter-file import, the instrument and conditions editor, the air editor and the choice
 * after a version conflict. The page is drawn and usable without them; each is fetched once the page
 * is up (one per idle moment, so no single task holds the tablet's main thread for long) or at once
 * when it is needed first. A failed fetch (no network before it ever arrived) is tried again on the
 * next call.
 *
 * Once they are all on the device, the service worker is asked to keep their files with the page, so
 * a technician who loses the signal later never meets a part that cannot load.
 */
import type { PartLoader } from "@/components/ui/later-part";
import { keepLoadedFilesForOffline } from "@/lib/offline/service-worker";

/**
 * A loader that fetches its module once; a rejection is forgotten so the next call tries again.
 * `loaded()` gives the module without waiting once it is there.
 */
function once<T>(load: () => Promise<T>): PartLoader<T> & { loaded: () => T | null } {
  let pending: Promise<T> | null = null;
  let value: T | null = null;
  const loader = () =>
    (pending ??= load().then(
      (m) => (value = m),
      (err: unknown) => {
        pending = null;
        throw err;
      },
    ));
  return Object.assign(loader, { loaded: () => value });
}

/** A macrotask boundary: the browser may paint and answer input before the next step. */
const pause = () => new Promise<void>((resolve) => setTimeout(resolve, 0));

// In three steps (zod, the calc command's schemas, the engine), each its own task, instead of one long one.
export const loadLiveEngine = once(async () => {
  await import("@/lib/validation/zod-browser");
  await pause();
  await import("@/lib/validation/calc");
  await pause();
  return import("@/lib/traverse/engine-input");
});
export const loadLiveResults = once(() => import("./live-results"));
export const loadVelocityViews = once(() => import("./velocity-views"));
export const loadChart = once(() => import("./profile-chart"));
export const loadMeterImport = once(() => import("./meter-import"));
export const loadKitEditor = once(() => import("./kit-editor"));
export const loadAirEditor = once(() => import("./air-editor"));
export const loadGridConflict = once(() => import("./grid-conflict"));

export type LiveEngine = Awaited<ReturnType<typeof loadLiveEngine>>;

/** Runs `task` when the browser is idle (soon after at the latest); returns a cancel function. */
export function whenIdle(task: () => void, timeoutMs = 1500): () => void {
  if (typeof window.requestIdleCallback === "function") {
    const id = window.requestIdleCallback(task, { timeout: timeoutMs });
    return () => window.cancelIdleCallback(id);
  }
  // Safari has no idle callbacks: a short pause lets the page's own work go first.
  const id = window.setTimeout(task, 200);
  return () => window.clearTimeout(id);
}

/** Runs `task` in an idle moment once the page has loaded; returns a cancel function. */
export function afterLoad(task: () => void): () => void {
  let cancelIdle = () => {};
  const start = () => {
    cancelIdle = whenIdle(task);
  };
  if (document.readyState === "complete") start();
  else window.addEventListener("load", start, { once: true });
  return () => {
    window.removeEventListener("load", start);
    cancelIdle();
  };
}

/**
 * After the page has loaded, fetches each of `loaders` in turn, one per idle moment, then asks the
 * service worker to keep every file the page has loaded. Failures are skipped (the part says so when
 * it is opened). Returns a cancel function.
 */
export function fetchAfterLoad(loaders: readonly (() => Promise<unknown>)[]): () => void {
  let cancelled = false;
  let cancel = () => {};
  const next = (i: number) => {
    if (cancelled) return;
    if (i >= loaders.length) {
      keepLoadedFilesForOffline();
      return;
    }
    cancel = afterLoad(() => {
      void loaders[i]!()
        .catch(() => undefined)
        .then(() => next(i + 1));
    });
  };
  next(0);
  return () => {
    cancelled = true;
    cancel();
  };
}
