import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { asc, count } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { openDatabase, type Database } from "@/db/client";
import { backupKindOf, backupPglite, restorePglite } from "@/db/backup";
import { DataDirLockedError, lockDataDir } from "@/db/lock";
import { seedDemo } from "@/db/seed";
import * as s from "@/db/schema";

const root = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-backup-"));
afterAll(() => fs.rmSync(root, { recursive: true, force: true }));

const TABLES = { users: s.users, projects: s.projects, projectMembers: s.projectMembers, airSystems: s.airSystems, ductSections: s.ductSections, terminals: s.terminals, traverses: s.traverses, readings: s.readings, reviews: s.reviews, auditLog: s.auditLog };

async function snapshot(db: Database) {
  const counts: Record<string, number> = {};
  for (const [name, table] of Object.entries(TABLES)) counts[name] = (await db.select({ n: count() }).from(table))[0]!.n;
  const users = await db.select({ email: s.users.email, hash: s.users.passwordHash }).from(s.users).orderBy(asc(s.users.email));
  const readings = await db.select().from(s.readings).orderBy(asc(s.readings.id)).limit(5);
  return { counts, users, readings };
}

describe("embedded database backup and restore", () => {
  it("round-trips a data directory: same row counts and the same rows", async () => {
    const source = path.join(root, "source");
    const handle = await openDatabase({ dataDir: source });
    await seedDemo(handle.db);
    const before = await snapshot(handle.db);
    expect(before.counts.readings).toBeGreaterThan(50);

    // While a process holds the directory, no backup is taken from under it.
    await expect(backupPglite({ dataDir: source, file: path.join(root, "no.tar.gz") })).rejects.toBeInstanceOf(DataDirLockedError);
    await handle.close();

    const file = path.join(root, "backup.tar.gz");
    const { bytes } = await backupPglite({ dataDir: source, file });
    expect(bytes).toBeGreaterThan(100_000);
    expect(backupKindOf(file)).toBe("pglite");

    const target = path.join(root, "target");
    fs.mkdirSync(target);
    fs.writeFileSync(path.join(target, "session-secret"), "kept-secret");
    expect(await restorePglite({ dataDir: target, file })).toEqual({ movedAside: null });
    // Refuses to overwrite a database unless told to, and then keeps the old data aside.
    await expect(restorePglite({ dataDir: target, file })).rejects.toThrow(/already holds a database/);
    const { movedAside } = await restorePglite({ dataDir: target, file, replace: true });
    expect(movedAside && fs.existsSync(path.join(movedAside, "PG_VERSION"))).toBe(true);
    expect(fs.readFileSync(path.join(target, "session-secret"), "utf8")).toBe("kept-secret");

    const restored = await openDatabase({ dataDir: target });
    try {
      expect(await snapshot(restored.db)).toEqual(before);
    } finally {
      await restored.close();
    }
    // Two on-disk databases opened, dumped and unpacked: ~13 s on an idle 2-core machine.
  }, 120_000);

  it("refuses a file that is not an embedded backup", async () => {
    const bogus = path.join(root, "bogus.tar.gz");
    fs.writeFileSync(bogus, "PGDMP-not-ours");
    await expect(restorePglite({ dataDir: path.join(root, "x"), file: bogus })).rejects.toThrow(/not an embedded-database backup/);
  });

  it("holds the lock for its whole run", () => {
    const dir = path.join(root, "held");
    const lock = lockDataDir(dir);
    try {
      expect(() => lockDataDir(dir)).toThrow(DataDirLockedError);
    } finally {
      lock.release();
    }
  });
});
