import path from "node:path";
import { migrate as migratePglite } from "drizzle-orm/pglite/migrator";
import { drizzle as drizzlePg } from "drizzle-orm/node-postgres";
import { migrate as migratePg } from "drizzle-orm/node-postgres/migrator";
import type { Pool } from "pg";
import type { Database } from "./client";

/** Key of the session-level advisory lock that serialises migrations on a PostgreSQL server (any fixed 64-bit number; this one spells "airtally"). */
export const MIGRATION_LOCK_KEY = 0x6169727461_6c6cn;

/** Applies every migration in drizzle/ that the embedded database has not seen; safe to call on every start. */
export async function migrateDatabase(db: Database): Promise<void> {
  await migratePglite(db, { migrationsFolder: path.join(process.cwd(), "drizzle") });
}

/**
 * The same on a PostgreSQL server, under an advisory lock held on one connection: several app
 * servers starting together apply the migrations once, one after another, instead of racing.
 */
export async function migratePostgres(pool: Pool): Promise<void> {
  const client = await pool.connect();
  try {
    await client.query("select pg_advisory_lock($1)", [MIGRATION_LOCK_KEY.toString()]);
    try {
      await migratePg(drizzlePg({ client }), { migrationsFolder: path.join(process.cwd(), "drizzle") });
    } finally {
      await client.query("select pg_advisory_unlock($1)", [MIGRATION_LOCK_KEY.toString()]);
    }
  } finally {
    client.release();
  }
}
