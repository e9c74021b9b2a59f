/**
 * The sync queue: every resource a technician changes has one record on the device (see types.ts);
 * the queue sends the latest value of each when the network is there, one request at a time in the
 * order the changes were made, and retries with a bounded backoff when it is not. It never drops a
 * value and never overwrites the server silently: a stale version comes back as a conflict holding
 * both versions, and waits for the technician's choice.
 *
 * Framework-free. The React hook (use-offline-draft.ts) is a thin layer over `load`, `edit`,
 * `subscribe` and `resolveConflict`.
 */
import { DEFAULT_BACKOFF, retryDelayMs, type BackoffOptions } from "./backoff";
import type { DraftStore } from "./draft-store";
import { SEND_TIMEOUT_MS, sendRequest, type FetchLike, type SendOutcome } from "./transport";
import { systemClock, type Clock, type DraftRecord, type Network, type SyncRequest } from "./types";

export interface SyncQueueOptions {
  store: DraftStore;
  /** The signed-in user's id: only their records are loaded and sent. */
  owner: string;
  fetch?: FetchLike;
  network?: Network;
  clock?: Clock;
  backoff?: BackoffOptions;
  random?: () => number;
  /** Quiet time after the last change of an auto-synced value before it is sent: typing is coalesced. */
  debounceMs?: number;
  timeoutMs?: number;
}

/** A network that is always up: for tests and for callers that cannot tell. */
export const alwaysOnline: Network = { isOnline: () => true, subscribe: () => () => {} };

/** The browser's view: `navigator.onLine` and the window's online/offline events. */
export function browserNetwork(): Network {
  if (typeof window === "undefined" || typeof navigator === "undefined") return alwaysOnline;
  return {
    isOnline: () => navigator.onLine !== false,
    subscribe(onChange) {
      const up = () => onChange(true);
      const down = () => onChange(false);
      window.addEventListener("online", up);
      window.addEventListener("offline", down);
      return () => {
        window.removeEventListener("online", up);
        window.removeEventListener("offline", down);
      };
    },
  };
}

export interface EditInput<T> {
  value: T;
  /** How to send this value; null keeps it on the device only. */
  request: SyncRequest | null;
  /** true: send after the debounce (autosave); false: keep until `sync(key)`. */
  queue: boolean;
}

export interface Base<T> {
  value: T;
  version: number | null;
  server?: unknown;
}

export type ConflictChoice<T> = { take: "theirs"; value: T } | { take: "mine"; value: T; request: SyncRequest | null };

/** Debounce of auto-synced values (our choice: long enough to cover a few keystrokes, short enough to feel live). */
export const DEFAULT_DEBOUNCE_MS = 800;

/** The longest a server's Retry-After may hold a value back (our bound). */
export const MAX_RETRY_AFTER_MS = 10 * 60_000;

const DEVICE_WRITE_FAILED = "This device could not keep the value (storage full or blocked). Keep this page open until it shows Saved.";

export class SyncQueue {
  readonly owner: string;
  private readonly store: DraftStore;
  private readonly fetchImpl: FetchLike | undefined;
  private readonly network: Network;
  private readonly clock: Clock;
  private readonly backoff: BackoffOptions;
  private readonly random: () => number;
  private readonly debounceMs: number;
  private readonly timeoutMs: number;

  private readonly records = new Map<string, DraftRecord>();
  private readonly loading = new Map<string, Promise<DraftRecord | undefined>>();
  private readonly listeners = new Map<string, Set<() => void>>();
  private readonly allListeners = new Set<() => void>();
  private readonly inFlight = new Set<string>();
  private readonly writes = new Map<string, Promise<void>>();
  private readonly deviceErrors = new Map<string, string>();
  private timer: unknown = null;
  private flushing: Promise<void> | null = null;
  private flushAgain = false;
  /** After a send found no network, nothing is tried again before this moment. */
  private pausedUntil: number | null = null;
  private unsubscribeNetwork: (() => void) | null = null;
  private stopped = false;
  private changes = 0;

  constructor(options: SyncQueueOptions) {
    this.store = options.store;
    this.owner = options.owner;
    this.fetchImpl = options.fetch;
    this.network = options.network ?? alwaysOnline;
    this.clock = options.clock ?? systemClock;
    this.backoff = options.backoff ?? DEFAULT_BACKOFF;
    this.random = options.random ?? Math.random;
    this.debounceMs = options.debounceMs ?? DEFAULT_DEBOUNCE_MS;
    this.timeoutMs = options.timeoutMs ?? SEND_TIMEOUT_MS;
  }

  /** Where records live: "device" (IndexedDB) or "memory" (lost on reload). */
  get storage(): "device" | "memory" {
    return this.store.kind;
  }

  /**
   * Loads every unsent record of the owner (left by an earlier page, perhaps offline) and starts
   * sending them. A send interrupted by the reload is simply tried again; one refused because the
   * user was signed out is tried again too.
   */
  async start(): Promise<void> {
    this.stopped = false;
    const dirty = await this.store.listDirty(this.owner);
    for (const stored of dirty) {
      if (this.records.has(stored.key)) continue;
      this.records.set(stored.key, this.revive(stored));
    }
    this.unsubscribeNetwork ??= this.network.subscribe((online) => {
      if (online) this.wake();
      this.notifyAll();
    });
    this.notifyAll();
    void this.flush();
  }

  stop(): void {
    this.stopped = true;
    if (this.timer !== null) this.clock.clearTimeout(this.timer);
    this.timer = null;
    this.unsubscribeNetwork?.();
    this.unsubscribeNetwork = null;
  }

  /** The online event and the page coming back into view: try everything waiting now. */
  wake(): void {
    this.pausedUntil = null;
    const now = this.clock.now();
    for (const r of this.records.values()) {
      if (this.sendable(r) && r.attempts > 0) this.commit({ ...r, attempts: 0, nextAttemptAt: now }, false);
    }
    void this.flush();
  }

  isOnline(): boolean {
    return this.network.isOnline();
  }

  /** The record in memory (after `load`), or undefined. Each change replaces the object. */
  snapshot<T = unknown, R = unknown>(key: string): DraftRecord<T, R> | undefined {
    return this.records.get(key) as DraftRecord<T, R> | undefined;
  }

  /** Why the device could not keep the latest value, if it could not. */
  deviceError(key: string): string | null {
    return this.deviceErrors.get(key) ?? null;
  }

  /** Grows on every change of any record: a cheap snapshot for `useSyncExternalStore` over many records. */
  get changeCount(): number {
    return this.changes;
  }

  /** The records in memory whose key starts with `prefix` (e.g. the conditions recorded on this device for one system). */
  recordsWithPrefix(prefix: string): DraftRecord[] {
    return [...this.records.values()].filter((r) => r.key.startsWith(prefix)).sort((a, b) => a.changedAt - b.changedAt);
  }

  /**
   * Every record with changes the server does not have yet and a way to send them (for a "N entries on
   * this device" line). Forms still being typed (no request yet) are not counted: nothing waits to be sent.
   */
  pending(): DraftRecord[] {
    return [...this.records.values()].filter((r) => r.dirty && r.request !== null).sort((a, b) => a.changedAt - b.changedAt);
  }

  subscribe(key: string, listener: () => void): () => void {
    let set = this.listeners.get(key);
    if (!set) this.listeners.set(key, (set = new Set()));
    set.add(listener);
    return () => set.delete(listener);
  }

  subscribeAll(listener: () => void): () => void {
    this.allListeners.add(listener);
    return () => this.allListeners.delete(listener);
  }

  /**
   * Brings a resource's record into memory: the one on the device if there is one, else a clean one
   * from `base` (the server's value, not stored until changed). A clean stored copy older than `base`
   * gives way to it; a dirty one always wins (the server decides on send, by version).
   */
  async load<T>(key: string, base?: Base<T>): Promise<DraftRecord<T> | undefined> {
    const inMemory = this.records.get(key);
    if (inMemory) return this.refreshFromBase(inMemory, base) as DraftRecord<T>;
    let pending = this.loading.get(key);
    if (!pending) {
      pending = this.store.get(this.owner, key).then((stored) => {
        this.loading.delete(key);
        const already = this.records.get(key);
        if (already) return already;
        const record = stored ? this.revive(stored) : base ? this.fresh(key, base) : undefined;
        if (record) this.commit(record, false);
        return record;
      });
      this.loading.set(key, pending);
    }
    const record = await pending;
    return (record ? this.refreshFromBase(record, base) : undefined) as DraftRecord<T> | undefined;
  }

  /** Records a local change. The record must have been loaded; memory updates at once, the device write follows. */
  edit<T>(key: string, input: EditInput<T>): Promise<void> {
    const current = this.records.get(key);
    if (!current) throw new Error(`SyncQueue.edit: load("${key}") before editing it.`);
    const now = this.clock.now();
    const queued = input.queue || (current.queued && current.dirty);
    const conflict = current.state === "conflict";
    const next: DraftRecord = {
      ...current,
      value: input.value,
      request: input.request,
      dirty: true,
      queued,
      revision: current.revision + 1,
      changedAt: now,
      state: conflict ? "conflict" : this.inFlight.has(key) ? "saving" : "saved-on-device",
      error: conflict ? current.error : null,
      attempts: 0,
      nextAttemptAt: queued ? now + (input.queue ? this.debounceMs : 0) : null,
    };
    const written = this.commit(next, true);
    this.schedule();
    return written;
  }

  /** Send now: a form's "Record", or "Try again" after an error. */
  sync(key: string): Promise<void> {
    const current = this.records.get(key);
    if (!current || !current.dirty) return Promise.resolve();
    const written = this.commit(
      { ...current, queued: true, state: current.state === "conflict" ? "conflict" : "saved-on-device", error: current.state === "conflict" ? current.error : null, attempts: 0, nextAttemptAt: this.clock.now() },
      true,
    );
    this.pausedUntil = null;
    void this.flush();
    return written;
  }

  /** Tries again every record (or one) that failed or waits for a retry. */
  retry(key?: string): void {
    for (const r of key ? [this.records.get(key)].filter((x): x is DraftRecord => !!x) : [...this.records.values()]) {
      if (!r.dirty || r.state === "conflict") continue;
      this.commit({ ...r, state: "saved-on-device", error: null, attempts: 0, nextAttemptAt: this.clock.now(), queued: r.queued || r.state === "error" }, true);
    }
    this.pausedUntil = null;
    void this.flush();
  }

  /**
   * The technician's choice after a conflict. "theirs" takes the server's resource (its value and
   * version); "mine" keeps the local value (or a merged one) and sends it against the server's
   * current version, knowingly replacing what is there.
   */
  resolveConflict<T>(key: string, choice: ConflictChoice<T>): Promise<void> {
    const current = this.records.get(key);
    if (!current?.conflict) return Promise.resolve();
    const { server, serverVersion } = current.conflict;
    if (choice.take === "theirs") {
      return this.commit({ ...current, value: choice.value, version: serverVersion, server, dirty: false, queued: false, state: "saved", conflict: null, error: null, attempts: 0, nextAttemptAt: null, savedAt: this.clock.now() }, true);
    }
    const written = this.commit(
      {
        ...current,
        value: choice.value,
        request: choice.request,
        version: serverVersion,
        conflict: null,
        error: null,
        dirty: true,
        queued: true,
        revision: current.revision + 1,
        changedAt: this.clock.now(),
        state: "saved-on-device",
        attempts: 0,
        nextAttemptAt: this.clock.now(),
      },
      true,
    );
    void this.flush();
    return written;
  }

  /** Takes a server value as the local one (clean): used when the server is known to be newer. */
  adopt<T>(key: string, base: Base<T>): Promise<void> {
    const current = this.records.get(key);
    return this.commit({ ...(current ?? this.fresh(key, base)), value: base.value, version: base.version, server: base.server ?? current?.server ?? null, dirty: false, queued: false, state: "saved", conflict: null, error: null, attempts: 0, nextAttemptAt: null }, true);
  }

  /** Forgets the local copy (after a form's record was saved, or when the technician throws a draft away). */
  async discard(key: string): Promise<void> {
    this.records.delete(key);
    this.deviceErrors.delete(key);
    this.notify(key);
    await this.chain(key, () => this.store.delete(this.owner, key));
  }

  /** The last server answer kept for reading offline (e.g. the instrument register), with when it was kept. */
  async cacheGet<V>(key: string): Promise<{ value: V; storedAt: number } | undefined> {
    return this.store.getCached<V>(this.owner, key);
  }

  async cachePut<V>(key: string, value: V): Promise<void> {
    await this.store.putCached(this.owner, key, value).catch(() => undefined);
  }

  /** Sends every record that is due, one at a time, oldest change first. Resolves when the pass ends. */
  flush(): Promise<void> {
    if (this.flushing) {
      this.flushAgain = true;
      return this.flushing;
    }
    this.flushing = (async () => {
      do {
        this.flushAgain = false;
        if (this.stopped || !this.network.isOnline()) break;
        const now = this.clock.now();
        if (this.pausedUntil !== null && this.pausedUntil > now) break;
        const due = [...this.records.values()]
          .filter((r) => this.sendable(r) && (r.nextAttemptAt ?? 0) <= now)
          .sort((a, b) => a.changedAt - b.changedAt);
        for (const r of due) {
          const outcome = await this.send(r.key);
          // No network: the others would fail the same way; wait for the backoff or the online event.
          if (outcome?.kind === "retry" && outcome.error.status === 0) break;
        }
      } while (this.flushAgain);
    })().finally(() => {
      this.flushing = null;
      // A request to flush that came after the pass decided to stop (e.g. the online event) is honoured now.
      if (this.flushAgain && !this.stopped) {
        this.flushAgain = false;
        void this.flush();
      } else this.schedule();
    });
    return this.flushing;
  }

  /** Resolves when no send is running and every device write has finished (tests and page unload). */
  async idle(): Promise<void> {
    while (this.flushing || this.writes.size > 0) {
      await this.flushing;
      await Promise.all([...this.writes.values()]);
    }
  }

  private sendable(r: DraftRecord): boolean {
    return r.dirty && r.queued && r.request !== null && r.state !== "conflict" && r.state !== "error" && !this.inFlight.has(r.key);
  }

  private async send(key: string): Promise<SendOutcome | undefined> {
    const rec = this.records.get(key);
    if (!rec || !rec.request || !this.sendable(rec)) return undefined;
    const { revision, request, version } = rec;
    this.inFlight.add(key);
    this.commit({ ...rec, state: "saving" }, false);
    let outcome: SendOutcome;
    try {
      outcome = await sendRequest(request, version, this.fetchImpl, this.timeoutMs);
    } finally {
      this.inFlight.delete(key);
    }
    const cur = this.records.get(key);
    if (!cur) return outcome; // discarded meanwhile
    const now = this.clock.now();
    switch (outcome.kind) {
      case "saved": {
        const newer = cur.revision !== revision;
        await this.commit(
          {
            ...cur,
            version: outcome.version ?? cur.version,
            server: outcome.resource,
            savedAt: now,
            attempts: 0,
            error: null,
            dirty: newer,
            queued: newer,
            state: newer ? (cur.state === "conflict" ? "conflict" : "saved-on-device") : "saved",
            nextAttemptAt: newer ? now : null,
          },
          true,
        );
        if (newer) this.flushAgain = true;
        break;
      }
      case "conflict":
        await this.commit({ ...cur, state: "conflict", conflict: { server: outcome.resource, serverVersion: outcome.version, message: outcome.message, at: now }, error: null, attempts: 0, nextAttemptAt: null }, true);
        break;
      case "rejected":
        await this.commit({ ...cur, state: "error", error: outcome.error, attempts: 0, nextAttemptAt: null }, true);
        break;
      case "retry": {
        const attempts = cur.attempts + 1;
        // A server's Retry-After is honoured up to ten minutes; otherwise the backoff decides.
        const wait = Math.max(Math.min(outcome.retryAfterMs ?? 0, MAX_RETRY_AFTER_MS), retryDelayMs(attempts, this.backoff, this.random));
        const nextAttemptAt = now + wait;
        if (outcome.error.status === 0) this.pausedUntil = nextAttemptAt;
        await this.commit({ ...cur, state: cur.state === "conflict" ? "conflict" : "saved-on-device", error: outcome.error, attempts, nextAttemptAt }, true);
        break;
      }
    }
    return outcome;
  }

  private schedule(): void {
    if (this.timer !== null) this.clock.clearTimeout(this.timer);
    this.timer = null;
    if (this.stopped || this.flushing || !this.network.isOnline()) return;
    let earliest = Infinity;
    for (const r of this.records.values()) if (this.sendable(r)) earliest = Math.min(earliest, r.nextAttemptAt ?? 0);
    if (earliest === Infinity) return;
    const at = Math.max(earliest, this.pausedUntil ?? 0);
    this.timer = this.clock.setTimeout(() => {
      this.timer = null;
      void this.flush();
    }, Math.max(0, at - this.clock.now()));
  }

  private revive(stored: DraftRecord): DraftRecord {
    const signedOut = stored.state === "error" && stored.error?.status === 401;
    if (stored.state === "saving" || signedOut) return { ...stored, state: "saved-on-device", error: null, attempts: 0, nextAttemptAt: stored.queued ? this.clock.now() : null };
    return stored;
  }

  private fresh<T>(key: string, base: Base<T>): DraftRecord<T> {
    return {
      owner: this.owner,
      key,
      value: base.value,
      version: base.version,
      request: null,
      dirty: false,
      queued: false,
      revision: 0,
      changedAt: this.clock.now(),
      state: "saved",
      attempts: 0,
      nextAttemptAt: null,
      error: null,
      server: base.server ?? null,
      savedAt: null,
      conflict: null,
    };
  }

  private refreshFromBase(record: DraftRecord, base: Base<unknown> | undefined): DraftRecord {
    if (!base || record.dirty || this.inFlight.has(record.key)) return record;
    if ((base.version ?? -Infinity) < (record.version ?? -Infinity)) return record;
    const next = { ...record, value: base.value, version: base.version, server: base.server ?? record.server };
    this.commit(next, false);
    return next;
  }

  private commit(next: DraftRecord, persist: boolean): Promise<void> {
    this.records.set(next.key, next);
    this.notify(next.key);
    if (!persist) return Promise.resolve();
    return this.chain(next.key, async () => {
      // Write what is current when the write runs: a later change supersedes this one.
      const latest = this.records.get(next.key);
      if (!latest) return;
      try {
        await this.store.put(latest);
        if (this.deviceErrors.delete(next.key)) this.notify(next.key);
      } catch {
        this.deviceErrors.set(next.key, DEVICE_WRITE_FAILED);
        this.notify(next.key);
      }
    });
  }

  /** Device writes of one key run one after another, so the last change is the one left on the device. */
  private chain(key: string, write: () => Promise<void>): Promise<void> {
    const previous = this.writes.get(key) ?? Promise.resolve();
    const done = previous.then(write, write);
    const tracked = done.finally(() => {
      if (this.writes.get(key) === tracked) this.writes.delete(key);
    });
    this.writes.set(key, tracked);
    return tracked;
  }

  private notify(key: string): void {
    for (const l of this.listeners.get(key) ?? []) l();
    this.notifyAll();
  }

  private notifyAll(): void {
    this.changes += 1;
    for (const l of this.allListeners) l();
  }
}
