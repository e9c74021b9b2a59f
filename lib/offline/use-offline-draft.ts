"use client";

/**
 * `useOfflineDraft`: a value a technician edits, kept on the device the moment it changes and synced
 * with the server when the network is there. The screen shows `value`, calls `setValue`, and states
 * `syncState` (see components/offline/sync-status.tsx). On a version conflict the hook holds both
 * versions (`conflict.mine`, `conflict.theirs`) until `resolveConflict` is called: nothing is
 * overwritten silently, and a conflict whose two sides are equal resolves itself.
 */
import { useCallback, useEffect, useMemo, useRef, useState, useSyncExternalStore } from "react";
import { useSyncQueue } from "./offline-context";
import type { DraftRecord, SyncError, SyncRequest, SyncState } from "./types";

export interface UseOfflineDraftOptions<T, R = unknown> {
  /** The resource, e.g. `traverse:${traverseId}`; one record per key and user on the device. */
  key: string;
  /** The server's value as the page received it (or an empty form). */
  initial: T;
  /** The server's version of `initial`; null for unversioned resources and creates. */
  initialVersion?: number | null;
  /** The server's resource as the page received it (exposed as `server` until a save returns a newer one). */
  initialServer?: R | null;
  /**
   * How to send a value (method, URL, body, `versionField`, `resourceField`). Omitted or returning
   * null: the value stays on the device only (a form not yet sent).
   */
  toRequest?: (value: T) => SyncRequest | null;
  /** The value inside the server's resource (200 and 409 answers); needed to show "theirs" on a conflict. */
  fromServer?: (resource: R) => T;
  /** Send each change after a short pause (default when `toRequest` is given); false: only on `sync()`. */
  autoSync?: boolean;
  /** Equality of two values (default: same JSON). Equal sides of a conflict resolve it without asking. */
  equals?: (a: T, b: T) => boolean;
}

export interface DraftConflict<T> {
  /** What this device holds (what the technician typed). */
  mine: T;
  /** What the server holds now. */
  theirs: T;
  theirsVersion: number | null;
  /** The server's words, e.g. "Someone else saved this traverse first." */
  message: string;
}

export interface OfflineDraft<T, R = unknown> {
  value: T;
  setValue: (next: T | ((previous: T) => T)) => void;
  syncState: SyncState;
  conflict: DraftConflict<T> | null;
  /** "mine": send mine over the server's version; "theirs": take the server's; `{value}`: send a merged value. */
  resolveConflict: (choice: "mine" | "theirs" | { value: T }) => void;
  /** The server version `value` builds on. */
  version: number | null;
  /** The server's resource from the last successful save (e.g. computed results), else `initialServer`. */
  server: R | null;
  /** Why the last send failed: a refusal when `syncState` is "error", else information while retrying. */
  error: SyncError | null;
  /** When the next try is due (epoch ms) while retrying. */
  nextAttemptAt: number | null;
  /** The device could not store the value (storage full or blocked): keep the page open until saved. */
  deviceError: string | null;
  online: boolean;
  /** Send now: a form's "Record" button. */
  sync: () => void;
  /** Try again after an error or while waiting for a retry. */
  retry: () => void;
  /** Forget the local copy (after a create was saved, or to throw a draft away). */
  discard: () => Promise<void>;
  /** The device copy has been read; before that, `setValue` calls are held and applied once it is. */
  ready: boolean;
  /** "device": survives a reload; "memory": the browser offers no storage; null: still opening. */
  storage: "device" | "memory" | null;
  savedAt: number | null;
}

export const jsonEquals = <T,>(a: T, b: T): boolean => JSON.stringify(a) === JSON.stringify(b);

const noop = () => () => {};

export function useOfflineDraft<T, R = unknown>(options: UseOfflineDraftOptions<T, R>): OfflineDraft<T, R> {
  const queue = useSyncQueue();
  const { key } = options;
  const latest = useRef(options);
  useEffect(() => {
    latest.current = options;
  });
  const held = useRef<((previous: T) => T)[]>([]);
  const [loadedKey, setLoadedKey] = useState<string | null>(null);
  // Bumped by discard(): the record is read again (fresh from `initial`).
  const [generation, setGeneration] = useState(0);

  const subscribe = useCallback((listener: () => void) => (queue ? queue.subscribe(key, listener) : () => {}), [queue, key]);
  const record = useSyncExternalStore(queue ? subscribe : noop, () => queue?.snapshot<T, R>(key), () => undefined) as DraftRecord<T, R> | undefined;
  const ready = !!queue && loadedKey === key && !!record;
  const online = useSyncExternalStore(queue ? (l) => queue.subscribeAll(l) : noop, () => queue?.isOnline() ?? true, () => true);

  const apply = useCallback(
    (update: (previous: T) => T) => {
      if (!queue) return;
      const current = queue.snapshot<T>(key);
      if (!current) return;
      const { toRequest, autoSync } = latest.current;
      const value = update(current.value);
      void queue.edit(key, { value, request: toRequest?.(value) ?? null, queue: autoSync ?? !!toRequest });
    },
    [queue, key],
  );

  useEffect(() => {
    if (!queue) return;
    let live = true;
    const { initial, initialVersion = null, initialServer = null } = latest.current;
    void queue.load<T>(key, { value: initial, version: initialVersion, server: initialServer }).then(() => {
      if (!live) return;
      setLoadedKey(key);
      // Changes made while the device copy was being read apply on top of it, in order.
      const pending = held.current.splice(0);
      for (const update of pending) apply(update);
    });
    return () => {
      live = false;
    };
  }, [queue, key, apply, generation]);

  const setValue = useCallback(
    (next: T | ((previous: T) => T)) => {
      const update = typeof next === "function" ? (next as (previous: T) => T) : () => next;
      if (!queue || loadedKey !== key || !queue.snapshot(key)) held.current.push(update);
      else apply(update);
    },
    [queue, key, loadedKey, apply],
  );

  const { fromServer } = options;
  const conflict = useMemo<DraftConflict<T> | null>(() => {
    if (!record || record.state !== "conflict" || !record.conflict) return null;
    const theirs = fromServer ? fromServer(record.conflict.server) : (record.conflict.server as unknown as T);
    return { mine: record.value, theirs, theirsVersion: record.conflict.serverVersion, message: record.conflict.message };
  }, [record, fromServer]);

  // The server already holds exactly what this device has (an answer lost on the way back): nothing to choose.
  useEffect(() => {
    if (!queue || !conflict) return;
    const equals = latest.current.equals ?? jsonEquals;
    if (equals(conflict.mine, conflict.theirs)) void queue.resolveConflict(key, { take: "theirs", value: conflict.theirs });
  }, [queue, key, conflict]);

  const resolveConflict = useCallback(
    (choice: "mine" | "theirs" | { value: T }) => {
      if (!queue || !conflict) return;
      const { toRequest } = latest.current;
      if (choice === "theirs") void queue.resolveConflict(key, { take: "theirs", value: conflict.theirs });
      else {
        const value = choice === "mine" ? conflict.mine : choice.value;
        void queue.resolveConflict(key, { take: "mine", value, request: toRequest?.(value) ?? null });
      }
    },
    [queue, key, conflict],
  );

  return {
    value: ready ? record!.value : options.initial,
    setValue,
    syncState: record?.state ?? "saved",
    conflict,
    resolveConflict,
    version: record?.version ?? options.initialVersion ?? null,
    server: record?.server ?? options.initialServer ?? null,
    error: record?.error ?? null,
    nextAttemptAt: record?.nextAttemptAt ?? null,
    deviceError: queue?.deviceError(key) ?? null,
    online,
    sync: useCallback(() => void queue?.sync(key), [queue, key]),
    retry: useCallback(() => queue?.retry(key), [queue, key]),
    discard: useCallback(async () => {
      await queue?.discard(key);
      setLoadedKey(null);
      setGeneration((g) => g + 1);
    }, [queue, key]),
    ready,
    storage: queue?.storage ?? null,
    savedAt: record?.savedAt ?? null,
  };
}
