"use client";

/**
 * One sync queue per signed-in page, opened on the device's IndexedDB for that user. The queue's code
 * (lib/offline/open-queue.ts) comes after the page is up: drawing a page does not need it, and values
 * typed before it opens are held by useOfflineDraft and applied in order once it has. The provider also
 * asks the browser to keep the storage (not evict it under pressure), registers the service worker
 * that serves pages already seen when the network is gone, and nudges the queue when the page comes
 * back into view.
 */
import { usePathname } from "next/navigation";
import { createContext, useContext, useEffect, useState, useSyncExternalStore } from "react";
import { keepLoadedFilesForOffline, keepPageForOffline, registerOfflinePages } from "./service-worker";
import type { SyncQueue } from "./sync-queue";

/** How long to wait before fetching the queue's code again after a failure (no network, never kept). */
const QUEUE_RETRY_MS = 5000;

/** undefined: no provider above (a bug); null: the queue is still opening. */
const OfflineContext = createContext<SyncQueue | null | undefined>(undefined);

export function OfflineProvider({ owner, children }: { owner: string; children: React.ReactNode }) {
  const [queue, setQueue] = useState<SyncQueue | null>(null);

  useEffect(() => {
    let cancelled = false;
    let opened: { queue: SyncQueue; close: () => void } | null = null;
    let retry = 0;
    const open = () => {
      import("./open-queue")
        .then(({ openSyncQueue }) => openSyncQueue(owner, () => cancelled))
        .then(
          (q) => {
            if (!q) return;
            if (cancelled) return q.close();
            opened = q;
            setQueue(q.queue);
            // The queue's code may have arrived before the service worker took charge of the page.
            keepLoadedFilesForOffline();
          },
          () => {
            if (!cancelled) retry = window.setTimeout(open, QUEUE_RETRY_MS);
          },
        );
    };
    open();
    const onVisible = () => {
      if (document.visibilityState === "visible") opened?.queue.wake();
    };
    document.addEventListener("visibilitychange", onVisible);
    // Ask the browser not to evict what technicians typed (granted silently for installed or often-used sites).
    void navigator.storage?.persist?.().catch(() => undefined);
    registerOfflinePages(owner);
    return () => {
      cancelled = true;
      window.clearTimeout(retry);
      document.removeEventListener("visibilitychange", onVisible);
      opened?.close();
      setQueue(null);
    };
  }, [owner]);

  // Each page reached by a client-side navigation is kept too (the first one is kept on registration).
  const pathname = usePathname();
  const [firstPath] = useState(pathname);
  useEffect(() => {
    if (pathname !== firstPath) keepPageForOffline(window.location.href);
  }, [pathname, firstPath]);

  useEffect(() => {
    if (!queue || queue.storage === "device") return;
    // Without device storage a closed page loses unsent entries: warn before leaving.
    const warn = (e: BeforeUnloadEvent) => {
      if (queue.pending().length > 0) e.preventDefault();
    };
    window.addEventListener("beforeunload", warn);
    return () => window.removeEventListener("beforeunload", warn);
  }, [queue]);

  return <OfflineContext.Provider value={queue}>{children}</OfflineContext.Provider>;
}

/** Provides an existing queue (tests, or an embedding that manages its own queue). */
export function OfflineQueueProvider({ queue, children }: { queue: SyncQueue | null; children?: React.ReactNode }) {
  return <OfflineContext.Provider value={queue}>{children}</OfflineContext.Provider>;
}

/** The page's sync queue, or null for the few milliseconds it takes to open. Throws outside an OfflineProvider. */
export function useSyncQueue(): SyncQueue | null {
  const queue = useContext(OfflineContext);
  if (queue === undefined) throw new Error("useSyncQueue: wrap the page in <OfflineProvider> (the signed-in layout does).");
  return queue;
}

const noop = () => () => {};

/** How many resources hold changes the server does not have yet, and whether the device is online. */
export function usePendingChanges(): { count: number; online: boolean; storage: "device" | "memory" | null } {
  const queue = useSyncQueue();
  const count = useSyncExternalStore(
    queue ? (l) => queue.subscribeAll(l) : noop,
    () => queue?.pending().length ?? 0,
    () => 0,
  );
  const online = useSyncExternalStore(
    queue ? (l) => queue.subscribeAll(l) : noop,
    () => queue?.isOnline() ?? true,
    () => true,
  );
  return { count, online, storage: queue?.storage ?? null };
}
