import { AsyncLocalStorage } from "node:async_hooks";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { drizzle as drizzlePglite, type PgliteDatabase } from "drizzle-orm/pglite";
import { drizzle as drizzlePg } from "drizzle-orm/node-postgres";
import { getTableName, is } from "drizzle-orm";
import { PgTable } from "drizzle-orm/pg-core";
import { Pool } from "pg";
import * as schema from "./schema";
import { watchPglite, type ReadCache } from "./read-cache";
import { migrateDatabase, migratePostgres } from "./migrate";
import { seedDemo } from "./seed/index";
import { acquireDataDirLock } from "./lock";

/**
 * The one place that opens the database. PGlite on a data directory by default
 * (`AIRTALLY_DATA_DIR`, `.data/`, or `memory://`), a PostgreSQL server when `DATABASE_URL` is set.
 * Both speak the same SQL and run the same migrations; the query API is identical, so the
 * node-postgres database is typed as the PGlite one.
 */
export type Database = PgliteDatabase<typeof schema>;
export type DatabaseKind = "pglite" | "postgres";

export interface DatabaseHandle {
  db: Database;
  kind: DatabaseKind;
  /** Answers to repeated reads (embedded database only: see db/read-cache.ts). */
  readCache?: ReadCache;
  close(): Promise<void>;
}

/** Every table's SQL name, for the read cache's bookkeeping. */
const TABLE_NAMES = Object.values(schema).flatMap((value) => (is(value, PgTable) ? [getTableName(value)] : []));

export interface OpenOptions {
  /** PostgreSQL connection string; wins over dataDir. */
  url?: string;
  /** PGlite data directory, or `memory://` for a throwaway database. */
  dataDir?: string;
}

export function defaultDataDir(): string {
  return process.env.AIRTALLY_DATA_DIR || path.join(process.cwd(), ".data");
}

export { acquireDataDirLock } from "./lock";

/** Opens a database and applies every pending migration. */
export async function openDatabase(options: OpenOptions = {}): Promise<DatabaseHandle> {
  if (options.url) {
    const pool = new Pool({ connectionString: options.url, max: 10 });
    const db = drizzlePg({ client: pool, schema }) as unknown as Database;
    try {
      await migratePostgres(pool);
    } catch (err) {
      await pool.end();
      throw err;
    }
    return { db, kind: "postgres", close: () => pool.end() };
  }
  const dataDir = options.dataDir ?? defaultDataDir();
  const inMemory = dataDir.startsWith("memory://");
  const release = inMemory ? () => undefined : acquireDataDirLock(dataDir);
  try {
    const client = new PGlite(dataDir);
    // AIRTALLY_READ_CACHE=off turns it off (to rule it out when chasing a problem).
    const readCache = process.env.AIRTALLY_READ_CACHE === "off" ? undefined : watchPglite(client, TABLE_NAMES);
    const db = drizzlePglite({ client, schema });
    await migrateDatabase(db);
    return {
      db,
      kind: "pglite",
      readCache,
      close: async () => {
        await client.close();
        release();
      },
    };
  } catch (err) {
    release();
    throw err;
  }
}

const globalForDb = globalThis as unknown as { airtallyDb?: Promise<DatabaseHandle> };

// The demo seed's last step (issuing the demo report) runs through the ordinary services, which ask
// getDb() for the database while it is still being opened: inside that step they get the open handle.
const openingHandle = new AsyncLocalStorage<DatabaseHandle>();

/** Demo mode (`npm run demo`) seeds the invented demo project once, on first open. */
export function demoMode(): boolean {
  return process.env.AIRTALLY_DEMO === "1";
}

/**
 * The process-wide database: one PGlite instance (it is single-connection, and queries are
 * serialised by PGlite itself) or one pg pool, opened on first use and kept across hot reloads.
 */
export function getDatabaseHandle(): Promise<DatabaseHandle> {
  const opening = openingHandle.getStore();
  if (opening) return Promise.resolve(opening);
  globalForDb.airtallyDb ??= (async () => {
    const handle = await openDatabase({ url: process.env.DATABASE_URL || undefined });
    if (demoMode()) await openingHandle.run(handle, () => seedDemo(handle.db, { withReport: true }));
    return handle;
  })().catch((err) => {
    globalForDb.airtallyDb = undefined;
    throw err;
  });
  return globalForDb.airtallyDb;
}

export async function getDb(): Promise<Database> {
  return (await getDatabaseHandle()).db;
}

/**
 * `load()`'s answer, remembered under `key` until something it read is written (embedded database;
 * see db/read-cache.ts for what counts; with PostgreSQL it always loads). The answer is frozen:
 * callers must not change it.
 */
export async function cachedRead<T>(key: string, load: () => Promise<T>): Promise<Frozen<T>> {
  const handle = await getDatabaseHandle();
  return (handle.readCache ? handle.readCache.read(key, load) : load()) as Promise<Frozen<T>>;
}

/** A remembered answer's type: read-only all the way down (dates and bytes as they are), as it is frozen. */
export type Frozen<T> = T extends Date | Uint8Array
  ? T
  : T extends readonly (infer U)[]
    ? readonly Frozen<U>[]
    : T extends object
      ? { readonly [K in keyof T]: Frozen<T[K]> }
      : T;

/** Closes the process-wide database if it was opened (clean shutdown). */
export async function closeProcessDatabase(): Promise<void> {
  const pending = globalForDb.airtallyDb;
  if (!pending) return;
  globalForDb.airtallyDb = undefined;
  const handle = await pending.catch(() => null);
  await handle?.close();
}
