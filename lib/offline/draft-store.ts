/**
 * Where drafts live on the device: IndexedDB through `idb`, one record per (user, resource). Writes
 * use strict durability, so a value reported as kept survives a crash or a flat battery. A memory
 * store with the same interface stands in when IndexedDB is unavailable (and says so).
 */
import { openDB, type DBSchema, type IDBPDatabase } from "idb";
import type { DraftRecord } from "./types";

export interface DraftStore {
  /** "device" when records survive a reload; "memory" when they do not. */
  readonly kind: "device" | "memory";
  get(owner: string, key: string): Promise<DraftRecord | undefined>;
  put(record: DraftRecord): Promise<void>;
  delete(owner: string, key: string): Promise<void>;
  /** Every record of the user with changes the server has not confirmed. */
  listDirty(owner: string): Promise<DraftRecord[]>;
  /** Last known server answers for reading offline (see read-cache.ts). */
  getCached<V>(owner: string, key: string): Promise<{ value: V; storedAt: number } | undefined>;
  putCached<V>(owner: string, key: string, value: V): Promise<void>;
  close(): void;
}

export const OFFLINE_DB_NAME = "airtally-offline";
const VERSION = 1;

interface CachedEntry {
  owner: string;
  key: string;
  value: unknown;
  storedAt: number;
}

interface OfflineSchema extends DBSchema {
  drafts: { key: [string, string]; value: DraftRecord; indexes: { owner: string } };
  cache: { key: [string, string]; value: CachedEntry };
}

/** IndexedDB-backed store. `open` fails (rejects) where IndexedDB is missing or blocked. */
export class IdbDraftStore implements DraftStore {
  readonly kind = "device" as const;
  private constructor(private readonly db: IDBPDatabase<OfflineSchema>) {}

  static async open(name = OFFLINE_DB_NAME): Promise<IdbDraftStore> {
    const db = await openDB<OfflineSchema>(name, VERSION, {
      upgrade(database) {
        const drafts = database.createObjectStore("drafts", { keyPath: ["owner", "key"] });
        drafts.createIndex("owner", "owner");
        database.createObjectStore("cache", { keyPath: ["owner", "key"] });
      },
      blocking() {
        // A newer version of the app opened the database in another tab: let it upgrade.
        db.close();
      },
    });
    return new IdbDraftStore(db);
  }

  async get(owner: string, key: string) {
    return this.db.get("drafts", [owner, key]);
  }

  async put(record: DraftRecord) {
    const tx = this.db.transaction("drafts", "readwrite", { durability: "strict" });
    await Promise.all([tx.store.put(record), tx.done]);
  }

  async delete(owner: string, key: string) {
    const tx = this.db.transaction("drafts", "readwrite", { durability: "strict" });
    await Promise.all([tx.store.delete([owner, key]), tx.done]);
  }

  async listDirty(owner: string) {
    const all = await this.db.getAllFromIndex("drafts", "owner", owner);
    return all.filter((r) => r.dirty);
  }

  async getCached<V>(owner: string, key: string) {
    const entry = await this.db.get("cache", [owner, key]);
    return entry ? { value: entry.value as V, storedAt: entry.storedAt } : undefined;
  }

  async putCached<V>(owner: string, key: string, value: V) {
    await this.db.put("cache", { owner, key, value, storedAt: Date.now() });
  }

  close() {
    this.db.close();
  }
}

/** Keeps records for this page only: the fallback where the browser offers no IndexedDB. */
export class MemoryDraftStore implements DraftStore {
  readonly kind = "memory" as const;
  private readonly drafts = new Map<string, DraftRecord>();
  private readonly cache = new Map<string, { value: unknown; storedAt: number }>();
  private id(owner: string, key: string) {
    return JSON.stringify([owner, key]);
  }
  async get(owner: string, key: string) {
    const r = this.drafts.get(this.id(owner, key));
    return r ? structuredClone(r) : undefined;
  }
  async put(record: DraftRecord) {
    this.drafts.set(this.id(record.owner, record.key), structuredClone(record));
  }
  async delete(owner: string, key: string) {
    this.drafts.delete(this.id(owner, key));
  }
  async listDirty(owner: string) {
    return [...this.drafts.values()].filter((r) => r.owner === owner && r.dirty).map((r) => structuredClone(r));
  }
  async getCached<V>(owner: string, key: string) {
    const e = this.cache.get(this.id(owner, key));
    return e ? { value: structuredClone(e.value) as V, storedAt: e.storedAt } : undefined;
  }
  async putCached<V>(owner: string, key: string, value: V) {
    this.cache.set(this.id(owner, key), { value: structuredClone(value), storedAt: Date.now() });
  }
  close() {}
}

/** The device store, or the memory one when IndexedDB cannot be opened (private windows of some browsers). */
export async function openDraftStore(name = OFFLINE_DB_NAME): Promise<DraftStore> {
  try {
    if (typeof indexedDB === "undefined") return new MemoryDraftStore();
    return await IdbDraftStore.open(name);
  } catch {
    return new MemoryDraftStore();
  }
}
