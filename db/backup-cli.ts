/**
 * `npm run db:backup -- [file]` and `npm run db:restore -- <file> [--replace]`.
 * Embedded database (AIRTALLY_DATA_DIR, default .data/): taken and restored under the data
 * directory lock, so stop the server first. PostgreSQL (DATABASE_URL): pg_dump / pg_restore.
 */
import path from "node:path";
import { defaultDataDir } from "./client";
import { backupPglite, backupPostgres, restorePglite, restorePostgres } from "./backup";

async function main() {
  const [command, ...rest] = process.argv.slice(2);
  const url = process.env.DATABASE_URL || undefined;
  const dataDir = defaultDataDir();
  if (!url && dataDir.startsWith("memory://")) throw new Error("An in-memory database cannot be backed up or restored.");
  const args = rest.filter((a) => !a.startsWith("--"));
  if (command === "backup") {
    const stamp = new Date().toISOString().replace(/[:.]/g, "-");
    const file = path.resolve(args[0] ?? `airtally-backup-${stamp}${url ? ".pgdump" : ".tar.gz"}`);
    const { bytes } = url ? backupPostgres({ url, file }) : await backupPglite({ dataDir, file });
    console.log(`Backup written: ${file} (${(bytes / 1024).toFixed(0)} KiB, ${url ? "PostgreSQL" : `embedded, from ${dataDir}`}).`);
  } else if (command === "restore") {
    if (!args[0]) throw new Error("Name the backup file: npm run db:restore -- <file> [--replace]");
    const file = path.resolve(args[0]);
    if (url) {
      restorePostgres({ url, file });
      console.log(`Restored ${file} into the PostgreSQL database.`);
    } else {
      const { movedAside } = await restorePglite({ dataDir, file, replace: rest.includes("--replace") });
      console.log(`Restored ${file} into ${dataDir}.${movedAside ? ` The data it replaced is kept in ${movedAside}.` : ""}`);
    }
  } else {
    throw new Error("Usage: backup-cli.ts backup [file] | restore <file> [--replace]");
  }
}

main().catch((err: Error) => {
  console.error(err.message);
  process.exit(1);
});
