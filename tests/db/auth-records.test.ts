import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabaseHandle, type Database } from "@/db/client";
import { AUDIT, recordAudit } from "@/db/queries/audit";
import { beginSignInAttempt, finishSignInAttempt, pruneSignInAttempts, SIGN_IN_THROTTLE } from "@/db/queries/sign-in-attempts";
import { bumpSessionVersion, getUserById, setUserPassword } from "@/db/queries/users";
import { getUserWithProjectAccess } from "@/db/queries/projects";
import { seedDemo } from "@/db/seed";
import * as s from "@/db/schema";

// One in-memory PGlite for the file (the process-wide handle the queries use).
let db: Database;
beforeAll(async () => {
  db = (await getDatabaseHandle()).db;
  await seedDemo(db);
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

async function newUser(email: string) {
  const [u] = await db.insert(s.users).values({ email, name: "Temp", passwordHash: "x" }).returning();
  return u!;
}

describe("the audit log", () => {
  it("copies the actor's e-mail into the entry, in the same statement", async () => {
    const u = await newUser("audit-copy@example.test");
    await recordAudit({ userId: u.id, action: "test.copy", entityType: "user", entityId: u.id });
    const [row] = await db.select().from(s.auditLog).where(eq(s.auditLog.action, "test.copy"));
    expect(row!.actorEmail).toBe("audit-copy@example.test");
  });

  it("refuses UPDATE, DELETE and TRUNCATE: it is append-only", async () => {
    await recordAudit({ action: "test.append_only", entityType: "test" });
    /** The database's own message (drizzle wraps it as the cause). */
    const refusal = (q: ReturnType<typeof sql>) =>
      db.execute(q).then(
        () => "accepted",
        (err: Error & { cause?: Error }) => err.cause?.message ?? err.message,
      );
    expect(await refusal(sql`update audit_log set action = 'x' where action = 'test.append_only'`)).toMatch(/append-only: UPDATE refused/);
    expect(await refusal(sql`delete from audit_log where action = 'test.append_only'`)).toMatch(/append-only: DELETE refused/);
    expect(await refusal(sql`truncate audit_log`)).toMatch(/append-only: TRUNCATE refused/);
    const rows = await db.select().from(s.auditLog).where(eq(s.auditLog.action, "test.append_only"));
    expect(rows).toHaveLength(1);
  });

  it("keeps a user's and a project's history, e-mail as it was, when they are deleted", async () => {
    const u = await newUser("leaver@example.test");
    const [p] = await db.insert(s.projects).values({ name: "Short-lived", siteName: "Nowhere" }).returning();
    await recordAudit({ userId: u.id, projectId: p!.id, action: "test.history", entityType: "project", entityId: p!.id });
    await db.update(s.users).set({ email: "renamed@example.test" }).where(eq(s.users.id, u.id));
    await db.delete(s.projects).where(eq(s.projects.id, p!.id));
    await db.delete(s.users).where(eq(s.users.id, u.id));
    const [row] = await db.select().from(s.auditLog).where(eq(s.auditLog.action, "test.history"));
    expect(row).toMatchObject({ userId: u.id, projectId: p!.id, actorEmail: "leaver@example.test" });
  });
});

describe("sign-in throttling", () => {
  const { freePerEmailAndClient } = SIGN_IN_THROTTLE;
  /** Moves every attempt of an e-mail back in time (the database clock is the only clock used). */
  const age = (email: string, seconds: number) =>
    db.execute(sql`update sign_in_attempts set at = at - make_interval(secs => ${seconds}) where email = ${email}`);

  it("lets the free attempts through, then makes the next one wait, whether or not the account exists", async () => {
    for (const email of ["tech@example.test", "no-such-person@example.test"]) {
      for (let i = 0; i < freePerEmailAndClient; i++) {
        const t = await beginSignInAttempt({ email, client: "10.0.0.1" });
        expect(t.retryAfterSeconds).toBe(0);
        await finishSignInAttempt({ id: t.id, outcome: "failed" });
      }
      expect((await beginSignInAttempt({ email, client: "10.0.0.1" })).retryAfterSeconds).toBe(1);
    }
  });

  it("counts a burst of parallel guesses in full: only the free ones reach the password check", async () => {
    const email = "burst@example.test";
    const started = Date.now();
    const tickets = await Promise.all(Array.from({ length: 20 }, () => beginSignInAttempt({ email, client: "10.0.0.2" })));
    const through = tickets.filter((t) => t.retryAfterSeconds === 0).length;
    // The free ones, plus at most what the backoff (1 s, 2 s, 4 s…) allows over the time the burst
    // took: none when it took under a second, as it does on an idle machine.
    const elapsedS = (Date.now() - started) / 1000;
    expect(through).toBeGreaterThanOrEqual(freePerEmailAndClient);
    expect(through).toBeLessThanOrEqual(freePerEmailAndClient + Math.floor(Math.log2(elapsedS + 1)));
  });

  it("backs off progressively rather than locking out: the wait doubles, and the real user gets in after it", async () => {
    const email = "victim@example.test";
    const client = "10.0.0.3";
    for (let i = 0; i < freePerEmailAndClient; i++) await finishSignInAttempt({ id: (await beginSignInAttempt({ email, client })).id, outcome: "failed" });
    const waits: number[] = [];
    for (let i = 0; i < 4; i++) {
      await age(email, 120); // far enough back that the previous wait has passed (the ceiling is 60 s)
      const t = await beginSignInAttempt({ email, client });
      expect(t.retryAfterSeconds).toBe(0);
      await finishSignInAttempt({ id: t.id, outcome: "failed" });
      waits.push((await beginSignInAttempt({ email, client })).retryAfterSeconds);
    }
    expect(waits).toEqual([2, 4, 8, 16]);
    // A throttled attempt does not lengthen the wait: the real user retries after it and signs in.
    await age(email, 16);
    const real = await beginSignInAttempt({ email, client });
    expect(real.retryAfterSeconds).toBe(0);
    await finishSignInAttempt({ id: real.id, outcome: "succeeded" });
    expect((await beginSignInAttempt({ email, client })).retryAfterSeconds).toBe(0);
  });

  it("never makes anyone wait longer than the ceiling", async () => {
    const email = "ceiling@example.test";
    await db.insert(s.signInAttempts).values(Array.from({ length: 40 }, () => ({ email, client: "10.0.0.4", outcome: "failed" as const })));
    const t = await beginSignInAttempt({ email, client: "10.0.0.4" });
    expect(t.retryAfterSeconds).toBeLessThanOrEqual(SIGN_IN_THROTTLE.maxDelaySeconds);
    expect(t.retryAfterSeconds).toBeGreaterThan(SIGN_IN_THROTTLE.maxDelaySeconds - 2);
  });

  it("forgets attempts older than the window for throttling, and prunes them after a day", async () => {
    const email = "old@example.test";
    await db.insert(s.signInAttempts).values(Array.from({ length: 10 }, () => ({ email, client: "10.0.0.5", outcome: "failed" as const })));
    await age(email, SIGN_IN_THROTTLE.windowMinutes * 60 + 1);
    expect((await beginSignInAttempt({ email, client: "10.0.0.5" })).retryAfterSeconds).toBe(0);
    await age(email, SIGN_IN_THROTTLE.keepHours * 3600);
    await pruneSignInAttempts();
    const left = await db.select().from(s.signInAttempts).where(eq(s.signInAttempts.email, email));
    expect(left).toHaveLength(0);
  });
});

describe("session versions", () => {
  it("moves on with sign-out everywhere and with a password change, read with the user in one row", async () => {
    const u = await newUser("versions@example.test");
    expect((await getUserById({ id: u.id }))!.sessionVersion).toBe(1);
    expect(await bumpSessionVersion({ id: u.id })).toBe(2);
    expect(await setUserPassword({ id: u.id, passwordHash: "y" })).toBe(3);
    const withProject = await getUserWithProjectAccess({ userId: u.id, projectId: "00000000-0000-4000-8000-000000000000" });
    expect(withProject).toMatchObject({ user: { id: u.id, sessionVersion: 3 }, access: null });
  });

  it("reads the user, the project and the role together for a project route", async () => {
    const [tech] = await db.select().from(s.users).where(eq(s.users.email, "tech@example.test"));
    const [clinic] = await db.select().from(s.projects).where(sql`${s.projects.name} like 'Marlow%'`);
    const [library] = await db.select().from(s.projects).where(sql`${s.projects.name} like 'Wrenfield%'`);
    expect(await getUserWithProjectAccess({ userId: tech!.id, projectId: library!.id })).toMatchObject({ access: { role: "technician" } });
    // Another project: it exists, but the user has no role in it (the route answers 404 either way).
    expect(await getUserWithProjectAccess({ userId: tech!.id, projectId: clinic!.id })).toMatchObject({ access: { role: null } });
    expect(await getUserWithProjectAccess({ userId: tech!.id, projectId: "not-a-uuid" })).toMatchObject({ access: null });
  });
});

describe("audit action names", () => {
  it("are stable strings", () => {
    expect(AUDIT.requestDenied).toBe("request.denied");
  });
});
