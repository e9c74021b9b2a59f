import { count, eq, getTableName, is } from "drizzle-orm";
import { PgTable } from "drizzle-orm/pg-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase, type DatabaseHandle } from "@/db/client";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { verifyPassword } from "@/lib/auth/password";

// One in-memory PGlite for the file: opening one costs ~0.8 GB and a few seconds.
let handle: DatabaseHandle;
beforeAll(async () => {
  handle = await openDatabase({ dataDir: "memory://" });
});
afterAll(async () => {
  await handle.close();
});

describe("migrations and demo seed", () => {
  it("applies the migrations and reports the embedded engine", async () => {
    expect(handle.kind).toBe("pglite");
    const tables = await handle.db.execute<{ table_name: string }>(
      "select table_name from information_schema.tables where table_schema = 'public' order by table_name",
    );
    // Every table the schema declares exists after the migrations, and no other: schema and migrations agree.
    const declared = Object.values(s)
      .filter((value) => is(value, PgTable))
      .map((table) => getTableName(table))
      .sort();
    expect(tables.rows.map((r) => r.table_name)).toEqual(declared);
    expect(declared).toEqual(expect.arrayContaining(["projects", "traverses", "terminals", "terminal_readings", "instruments", "audit_log", "sign_in_attempts"]));
  });

  it("seeds the demo once and leaves a second run without duplicates", async () => {
    expect(await seedDemo(handle.db)).toEqual({ seeded: true });
    expect(await seedDemo(handle.db)).toEqual({ seeded: false });
    const [users] = await handle.db.select({ n: count() }).from(s.users);
    expect(users!.n).toBe(DEMO_ACCOUNTS.length);
    const [projects] = await handle.db.select({ n: count() }).from(s.projects);
    expect(projects!.n).toBe(2);
  });

  it("gives every demo role its membership and hashes passwords with Argon2id", async () => {
    const rows = await handle.db
      .select({ email: s.users.email, role: s.projectMembers.role, hash: s.users.passwordHash })
      .from(s.users)
      .leftJoin(s.projectMembers, eq(s.projectMembers.userId, s.users.id));
    for (const account of DEMO_ACCOUNTS) {
      const mine = rows.filter((r) => r.email === account.email);
      if (account.role) expect(mine.map((r) => r.role)).toContain(account.role);
      expect(mine[0]!.hash.startsWith("$argon2id$")).toBe(true);
    }
    expect(await verifyPassword(rows[0]!.hash, DEMO_PASSWORD)).toBe(true);
    expect(await verifyPassword(rows[0]!.hash, "wrong-password")).toBe(false);
  });

  it("stores complete traverses whose readings fill their layouts", async () => {
    const traverses = await handle.db.select().from(s.traverses);
    expect(traverses.length).toBeGreaterThanOrEqual(1);
    for (const t of traverses) {
      const [n] = await handle.db.select({ n: count() }).from(s.readings).where(eq(s.readings.traverseId, t.id));
      expect(n!.n).toBe(t.lines * t.pointsPerLine);
    }
  });

  it("rejects a duplicate e-mail in another case and a duct without dimensions", async () => {
    await expect(
      handle.db.insert(s.users).values({ email: "TECH@example.test", name: "x", passwordHash: "x" }),
    ).rejects.toThrow();
    const [system] = await handle.db.select().from(s.airSystems).limit(1);
    await expect(
      handle.db.insert(s.ductSections).values({ systemId: system!.id, tag: "Z9", kind: "branch", shape: "round", designFlowM3S: 1 }),
    ).rejects.toThrow();
  });

  it("keeps concurrent transactions apart on the single PGlite connection, rolling back only the one that fails", async () => {
    const before = (await handle.db.select({ n: count() }).from(s.auditLog))[0]!.n;
    const writes = Array.from({ length: 20 }, (_, i) =>
      handle.db.transaction(async (tx) => {
        await tx.insert(s.auditLog).values({ action: "test.concurrent", entityType: "test", entityId: String(i) });
        if (i === 7) throw new Error("deliberate failure");
        await tx.insert(s.auditLog).values({ action: "test.concurrent", entityType: "test", entityId: `${i}b` });
      }),
    );
    const results = await Promise.allSettled(writes);
    expect(results.filter((r) => r.status === "rejected")).toHaveLength(1);
    const after = (await handle.db.select({ n: count() }).from(s.auditLog))[0]!.n;
    expect(after - before).toBe(19 * 2);
    const orphan = await handle.db.select().from(s.auditLog).where(eq(s.auditLog.entityId, "7"));
    expect(orphan).toHaveLength(0);
  });
});
