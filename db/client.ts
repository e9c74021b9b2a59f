import fs from "node:fs";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { drizzle as drizzlePglite, type PgliteDatabase } from "drizzle-orm/pglite";
import { drizzle as drizzlePg } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import * as schema from "./schema";
import { migrateDatabase } from "./migrate";
import { seedDemo } from "./seed/index";

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
  close(): Promise<void>;
}

export interface OpenOptions {
  /** PostgreSQL connection string; wins over dataDir. */
  url?: string;
  /** PGlite data directory, or `memory://` for a throwaway database. */
  dataDir?: string;
}

export function defaultDataDir(): string {
  return process.env.AIRTALLY_DATA_DIR || path.join(process.cwd(), ".data");
}

const LOCK_FILE = "airtally.lock";

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === "EPERM";
  }
}

/**
 * PGlite has no lock of its own: two processes on one data directory silently lose writes.
 * The process that opens the directory writes its PID here; any other live process is refused.
 */
export function acquireDataDirLock(dataDir: string): () => void {
  fs.mkdirSync(dataDir, { recursive: true });
  const lockPath = path.join(dataDir, LOCK_FILE);
  if (fs.existsSync(lockPath)) {
    const holder = Number.parseInt(fs.readFileSync(lockPath, "utf8"), 10);
    if (Number.isInteger(holder) && holder !== process.pid && processAlive(holder)) {
      throw new Error(
        `The data directory ${dataDir} is in use by process ${holder} (a running Airtally server). ` +
          `Stop that process first, or point AIRTALLY_DATA_DIR at another directory.`,
      );
    }
  }
  fs.writeFileSync(lockPath, String(process.pid), { mode: 0o600 });
  return () => {
    try {
      if (fs.readFileSync(lockPath, "utf8") === String(process.pid)) fs.unlinkSync(lockPath);
    } catch {
      // already gone
    }
  };
}

/** Opens a database and applies every pending migration. */
export async function openDatabase(options: OpenOptions = {}): Promise<DatabaseHandle> {
  if (options.url) {
    const pool = new Pool({ connectionString: options.url, max: 10 });
    const db = drizzlePg({ client: pool, schema }) as unknown as Database;
    await migrateDatabase(db, "postgres");
    return { db, kind: "postgres", close: () => pool.end() };
  }
  const dataDir = options.dataDir ?? defaultDataDir();
  const inMemory = dataDir.startsWith("memory://");
  const release = inMemory ? () => undefined : acquireDataDirLock(dataDir);
  try {
    const client = new PGlite(dataDir);
    const db = drizzlePglite({ client, schema });
    await migrateDatabase(db, "pglite");
    return {
      db,
      kind: "pglite",
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

/** Demo mode (`npm run demo`) seeds the invented demo project once, on first open. */
export function demoMode(): boolean {
  return process.env.AIRTALLY_DEMO === "1";
}

/**
 * The process-wide database: one PGlite instance (it is single-connection, and queries are
 * serialised by PGlite itself) or one pg pool, opened on first use and kept across hot reloads.
 */
export function getDatabaseHandle(): Promise<DatabaseHandle> {
  globalForDb.airtallyDb ??= (async () => {
    const handle = await openDatabase({ url: process.env.DATABASE_URL || undefined });
    if (demoMode()) await seedDemo(handle.db);
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
