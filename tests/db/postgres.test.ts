import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { asc, count, eq } from "drizzle-orm";
import { Client } from "pg";
import { backupKindOf, backupPostgres, restorePostgres } from "@/db/backup";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabaseHandle, openDatabase } from "@/db/client";
import { getProjectDesign, listTraversesForProject } from "@/db/queries/airflow";
import { listProjectsForUser } from "@/db/queries/projects";
import { getUserForSignIn } from "@/db/queries/users";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { startPostgres, type PostgresServer } from "../support/postgres-cluster";

// The same schema, migrations and queries on a real PostgreSQL server (a throwaway cluster).
let server: PostgresServer;
beforeAll(async () => {
  server = await startPostgres();
  process.env.DATABASE_URL = server.url;
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
  server.stop();
});

describe("on a PostgreSQL server", () => {
  it("opens through pg, applies the migrations and seeds the demo once", async () => {
    const handle = await getDatabaseHandle();
    expect(handle.kind).toBe("postgres");
    expect(await seedDemo(handle.db)).toEqual({ seeded: true });
    expect(await seedDemo(handle.db)).toEqual({ seeded: false });
  });

  it("applies migrations idempotently from a second connection", async () => {
    const second = await openDatabase({ url: server.url });
    const rows = await second.db.select().from(s.users);
    expect(rows).toHaveLength(5);
    await second.close();
  });

  it("runs the app's queries: sign-in lookup ignoring case, memberships, traverses with readings", async () => {
    const tech = await getUserForSignIn({ email: "  TECH@example.test " });
    expect(tech?.email).toBe("tech@example.test");
    const projects = await listProjectsForUser({ userId: tech!.id, isAdmin: false });
    expect(projects.map((p) => [p.name, p.role])).toEqual([["Wrenfield Library — air balance", "technician"]]);
    expect(projects[0]).toMatchObject({ systemCount: 2, sectionCount: 7, approvedSectionCount: 2, submittedTraverseCount: 2 });

    const design = await getProjectDesign({ projectId: projects[0]!.id });
    expect(design.sections).toHaveLength(7);
    const traverses = await listTraversesForProject({ projectId: projects[0]!.id });
    for (const t of traverses) expect(t.readings).toHaveLength(t.lines * t.pointsPerLine);
  });

  it("enforces the same constraints as PGlite", async () => {
    const { db } = await getDatabaseHandle();
    const [system] = await db.select().from(s.airSystems).where(eq(s.airSystems.tag, "AHU-1"));
    await expect(
      db.insert(s.ductSections).values({ systemId: system!.id, tag: "Z9", kind: "branch", shape: "rectangular", widthMm: 500, designFlowM3S: 1 }),
    ).rejects.toThrow();
  });

  it("applies migrations once when several app servers start together (advisory lock)", async () => {
    const admin = new Client({ connectionString: server.url });
    await admin.connect();
    await admin.query("create database airtally_race");
    await admin.end();
    const url = server.url.replace(/\/[^/]+$/, "/airtally_race");
    const handles = await Promise.all(Array.from({ length: 4 }, () => openDatabase({ url })));
    const applied = await handles[0]!.db.execute<{ n: number }>("select count(*)::int as n from drizzle.__drizzle_migrations");
    expect(applied.rows[0]!.n).toBe(fs.readdirSync(path.join(process.cwd(), "drizzle")).filter((f) => f.endsWith(".sql")).length);
    await Promise.all(handles.map((h) => h.close()));
  });

  it("backs up with pg_dump and restores with pg_restore: same row counts and rows, audit trail still append-only", async () => {
    const { db } = await getDatabaseHandle();
    const tables = { users: s.users, projects: s.projects, sections: s.ductSections, traverses: s.traverses, readings: s.readings, audit: s.auditLog };
    const snapshot = async (d: typeof db) => {
      const counts: Record<string, number> = {};
      for (const [name, t] of Object.entries(tables)) counts[name] = (await d.select({ n: count() }).from(t))[0]!.n;
      const rows = await d.select().from(s.readings).orderBy(asc(s.readings.id)).limit(5);
      return { counts, rows };
    };
    const before = await snapshot(db);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-pgdump-"));
    try {
      const file = path.join(dir, "backup.pgdump");
      backupPostgres({ url: server.url, file });
      expect(backupKindOf(file)).toBe("postgres");
      const admin = new Client({ connectionString: server.url });
      await admin.connect();
      await admin.query("create database airtally_restored");
      await admin.end();
      const url = server.url.replace(/\/[^/]+$/, "/airtally_restored");
      restorePostgres({ url, file });
      // Restoring again over the same database replaces what is there (pg_restore --clean).
      restorePostgres({ url, file });
      const restored = await openDatabase({ url });
      try {
        expect(await snapshot(restored.db)).toEqual(before);
        await expect(restored.db.execute("delete from audit_log")).rejects.toThrow();
      } finally {
        await restored.close();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
