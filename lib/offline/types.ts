/**
 * Offline-first storage for what technicians type: every value is kept on the device (IndexedDB) the
 * moment it is typed and sent to the server when the network is there. These are the shapes shared by
 * the store, the queue, the hook and the status component. Framework-free; browser APIs only where named.
 */

/** What the screen says about a value: where it is safe, and whether the server has it. */
export type SyncState =
  /** Kept on this device; the server does not have it yet (offline, waiting to retry, or a form not yet sent). */
  | "saved-on-device"
  /** On its way to the server now. */
  | "saving"
  /** The server has exactly this value. */
  | "saved"
  /** The server refused it because someone else changed the resource first (409): the technician chooses. */
  | "conflict"
  /** The server refused it for another reason (400, 403…): kept on the device, not retried until changed or retried. */
  | "error";

/**
 * How to send a value: a same-origin JSON request. The queue adds the version the value was based on
 * (`versionField`, e.g. `{"version": 7}`) at send time, and finds the resource in the answer under
 * `resourceField` (e.g. `"traverse"` for `200 {traverse}` and `409 {error, traverse}`).
 */
export interface SyncRequest {
  method: "POST" | "PUT" | "PATCH";
  /** A same-origin path such as `/api/v1/projects/…/traverses/…/readings`. */
  url: string;
  body: Record<string, unknown>;
  versionField?: string;
  resourceField: string;
}

export interface SyncError {
  /** HTTP status, or 0 when the server could not be reached. */
  status: number;
  message: string;
  /** Field errors of a 400, dotted paths as the API names them. */
  fields?: Record<string, string>;
}

export interface SyncConflict<R = unknown> {
  /** The server's current resource, as the 409 answer carried it. */
  server: R;
  serverVersion: number | null;
  message: string;
  at: number;
}

/** One resource's local copy and its sync bookkeeping, as stored on the device. */
export interface DraftRecord<T = unknown, R = unknown> {
  /** The signed-in user the value belongs to: a shared tablet never sends one user's entries as another's. */
  owner: string;
  /** The resource, e.g. `traverse:<id>` or `conditions-form:<systemId>`. */
  key: string;
  value: T;
  /** The server version `value` builds on; null when there is none (a create, or an unversioned resource). */
  version: number | null;
  /** How to send `value`; null while the value is kept on the device only. */
  request: SyncRequest | null;
  /** `value` holds changes the server has not confirmed. */
  dirty: boolean;
  /** The queue should send it: set on every change of an auto-synced value, or by an explicit `sync()`. */
  queued: boolean;
  /** Counts local changes, so an answer to an older send does not mark a newer value as saved. */
  revision: number;
  changedAt: number;
  state: SyncState;
  /** Failed sends since the last success (network or server trouble), for the backoff. */
  attempts: number;
  /** When the queue may send it next (epoch ms); null: as soon as it is queued and online. */
  nextAttemptAt: number | null;
  /** Why the last send did not save it (also set, as information, while retrying). */
  error: SyncError | null;
  /** The resource the server returned on the last successful save (e.g. with computed results). */
  server: R | null;
  savedAt: number | null;
  conflict: SyncConflict<R> | null;
}

/** Wall clock and timers, injectable so tests control time. */
export interface Clock {
  now(): number;
  setTimeout(fn: () => void, ms: number): unknown;
  clearTimeout(handle: unknown): void;
}

export const systemClock: Clock = {
  now: () => Date.now(),
  setTimeout: (fn, ms) => setTimeout(fn, ms),
  clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>),
};

/** Whether the device believes it is online, and news when that changes. */
export interface Network {
  isOnline(): boolean;
  subscribe(onChange: (online: boolean) => void): () => void;
}
