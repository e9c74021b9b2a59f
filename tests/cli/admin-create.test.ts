import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { openDatabase } from "@/db/client";
import { auditLog, users } from "@/db/schema";
import { verifyPassword } from "@/lib/auth/password";

const ROOT = path.resolve(import.meta.dirname, "../..");
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-admin-"));
afterAll(() => fs.rmSync(dataDir, { recursive: true, force: true }));

function run(args: string[], input: string) {
  const env: NodeJS.ProcessEnv = { ...process.env, AIRTALLY_DATA_DIR: dataDir };
  delete env.AIRTALLY_DEMO;
  delete env.DATABASE_URL;
  return spawnSync(path.join(ROOT, "node_modules/.bin/tsx"), ["lib/cli/admin-create.ts", ...args], { cwd: ROOT, env, input, encoding: "utf8", timeout: 90_000 });
}

describe("npm run admin:create", () => {
  it("refuses a short password from standard input and creates nothing", () => {
    const r = run(["--email", "first@example.test", "--name", "First Admin"], "short\n");
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/at least 12 characters/);
  }, 60_000);

  it("creates a site administrator from a password on standard input, and refuses the same e-mail twice", async () => {
    const r = run(["--email", "First@Example.test", "--name", "First Admin"], "a long enough secret\n");
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    const again = run(["--email", "first@example.test", "--name", "Other"], "another long secret\n");
    expect(again.status).toBe(1);
    expect(again.stderr).toMatch(/exists already/);

    // A fresh production database has exactly this one account: no demo accounts, no known password.
    const handle = await openDatabase({ dataDir });
    try {
      const rows = await handle.db.select().from(users);
      expect(rows.map((u) => ({ email: u.email, isAdmin: u.isAdmin, name: u.name }))).toEqual([{ email: "first@example.test", isAdmin: true, name: "First Admin" }]);
      expect(await verifyPassword(rows[0]!.passwordHash, "a long enough secret")).toBe(true);
      expect(await verifyPassword(rows[0]!.passwordHash, "airtally-demo")).toBe(false);
      const audit = await handle.db.select().from(auditLog);
      expect(audit.map((a) => ({ action: a.action, actorEmail: a.actorEmail, userId: a.userId }))).toEqual([{ action: "user.admin_created", actorEmail: "first@example.test", userId: rows[0]!.id }]);
    } finally {
      await handle.close();
    }
    // Three fresh processes each open the data directory (initdb and migrations on the first): slow on a busy machine.
  }, 180_000);
});
