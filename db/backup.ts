/**
 * Backup and restore. Embedded database: PGlite's data-directory dump (a gzipped tarball of the
 * whole directory), taken under the directory lock so no server writes meanwhile. PostgreSQL
 * server: pg_dump's custom format and pg_restore, from Debian's postgresql packages.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { FLOCK_FILE, LOCK_RECORD, lockDataDir } from "./lock";

/** Files of ours that live in the data directory beside PGlite's and are not part of a backup or restore. */
const OWN_FILES = new Set([LOCK_RECORD, FLOCK_FILE, "session-secret"]);

export type BackupKind = "pglite" | "postgres";

/** What a backup file holds, from its first bytes: pg_dump's custom format starts "PGDMP", a gzip stream 1f 8b. */
export function backupKindOf(file: string): BackupKind | null {
  const fd = fs.openSync(file, "r");
  try {
    const head = Buffer.alloc(5);
    fs.readSync(fd, head, 0, 5, 0);
    if (head.toString("latin1") === "PGDMP") return "postgres";
    if (head[0] === 0x1f && head[1] === 0x8b) return "pglite";
    return null;
  } finally {
    fs.closeSync(fd);
  }
}

function hasDatabase(dataDir: string): boolean {
  return fs.existsSync(path.join(dataDir, "PG_VERSION"));
}

/** Dumps an embedded data directory to `file` (gzipped tar). Refuses while a server holds the directory. */
export async function backupPglite({ dataDir, file }: { dataDir: string; file: string }): Promise<{ bytes: number }> {
  if (!hasDatabase(dataDir)) throw new Error(`There is no database in ${dataDir} to back up.`);
  const lock = lockDataDir(dataDir);
  try {
    const pg = new PGlite(dataDir);
    try {
      // dumpDataDir does not wait for the database to finish opening: a query does.
      await pg.query("select 1");
      const dump = await pg.dumpDataDir("gzip");
      const bytes = Buffer.from(await dump.arrayBuffer());
      const partial = `${file}.partial`;
      fs.writeFileSync(partial, bytes, { mode: 0o600 });
      fs.renameSync(partial, file);
      return { bytes: bytes.length };
    } finally {
      await pg.close();
    }
  } finally {
    lock.release();
  }
}

/**
 * Restores an embedded data directory from a dump. The dump is unpacked and opened in a scratch
 * directory first; only a dump that opens replaces the data, and the data it replaces is moved
 * aside (never deleted). Refuses a directory that already holds a database unless `replace`.
 */
export async function restorePglite({ dataDir, file, replace = false }: { dataDir: string; file: string; replace?: boolean }): Promise<{ movedAside: string | null }> {
  if (backupKindOf(file) !== "pglite") throw new Error(`${file} is not an embedded-database backup (a gzipped data directory).`);
  const lock = lockDataDir(dataDir);
  try {
    if (hasDatabase(dataDir) && !replace) {
      throw new Error(`${dataDir} already holds a database. Restore into an empty directory, or pass --replace to move the current data aside and restore over it.`);
    }
    const scratch = fs.mkdtempSync(`${path.resolve(dataDir)}.restoring-`);
    try {
      const pg = new PGlite(scratch, { loadDataDir: new Blob([fs.readFileSync(file)]) });
      try {
        await pg.query("select 1");
      } finally {
        await pg.close();
      }
      let movedAside: string | null = null;
      if (hasDatabase(dataDir)) {
        movedAside = `${path.resolve(dataDir)}.before-restore-${new Date().toISOString().replace(/[:.]/g, "-")}`;
        fs.mkdirSync(movedAside);
        for (const name of fs.readdirSync(dataDir)) if (!OWN_FILES.has(name)) fs.renameSync(path.join(dataDir, name), path.join(movedAside, name));
      }
      // The dump holds the whole directory: our lock files and secret stay as they are here.
      for (const name of fs.readdirSync(scratch)) if (!OWN_FILES.has(name)) fs.renameSync(path.join(scratch, name), path.join(dataDir, name));
      return { movedAside };
    } finally {
      fs.rmSync(scratch, { recursive: true, force: true });
    }
  } finally {
    lock.release();
  }
}

/** pg_dump / pg_restore: the newest of Debian's versioned binaries (they must be at least the server's version), else the PATH's. */
export function postgresTool(name: "pg_dump" | "pg_restore"): string {
  const debian = "/usr/lib/postgresql";
  if (fs.existsSync(debian)) {
    const versions = fs
      .readdirSync(debian)
      .filter((v) => fs.existsSync(path.join(debian, v, "bin", name)))
      .sort((a, b) => Number(a) - Number(b));
    if (versions.length > 0) return path.join(debian, versions.at(-1)!, "bin", name);
  }
  return name;
}

function run(tool: string, args: string[]): void {
  const r = spawnSync(tool, args, { encoding: "utf8", timeout: 30 * 60_000 });
  if (r.error) {
    const missing = (r.error as NodeJS.ErrnoException).code === "ENOENT";
    throw new Error(missing ? `${tool} is not installed: apt-get install postgresql-client.` : `${tool} failed: ${r.error.message}`);
  }
  if (r.status !== 0) throw new Error(`${path.basename(tool)} failed (exit ${r.status}): ${r.stderr.trim()}`);
}

/** A PostgreSQL database to `file` in pg_dump's custom format (consistent: pg_dump reads one snapshot). */
export function backupPostgres({ url, file }: { url: string; file: string }): { bytes: number } {
  const partial = `${file}.partial`;
  run(postgresTool("pg_dump"), ["--format=custom", "--no-owner", "--no-privileges", `--file=${partial}`, `--dbname=${url}`]);
  fs.renameSync(partial, file);
  return { bytes: fs.statSync(file).size };
}

/** Restores a pg_dump file into a PostgreSQL database in one transaction, replacing the objects it holds. */
export function restorePostgres({ url, file }: { url: string; file: string }): void {
  if (backupKindOf(file) !== "postgres") throw new Error(`${file} is not a PostgreSQL backup (pg_dump custom format).`);
  run(postgresTool("pg_restore"), ["--clean", "--if-exists", "--no-owner", "--no-privileges", "--single-transaction", "--exit-on-error", `--dbname=${url}`, file]);
}
