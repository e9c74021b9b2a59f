import { eq } from "drizzle-orm";
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
});
