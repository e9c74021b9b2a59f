import path from "node:path";
import { migrate as migratePglite } from "drizzle-orm/pglite/migrator";
import { migrate as migratePg } from "drizzle-orm/node-postgres/migrator";
import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import type { Database, DatabaseKind } from "./client";

/** Applies every migration in drizzle/ that the database has not seen; safe to call on every start. */
export async function migrateDatabase(db: Database, kind: DatabaseKind): Promise<void> {
  const migrationsFolder = path.join(process.cwd(), "drizzle");
  if (kind === "pglite") await migratePglite(db, { migrationsFolder });
  else await migratePg(db as unknown as NodePgDatabase, { migrationsFolder });
}
