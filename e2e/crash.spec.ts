import fs from "node:fs";
import { count, eq } from "drizzle-orm";
import { expect, test } from "@playwright/test";
import { openDatabase } from "../db/client";
import * as s from "../db/schema";
import { DEMO_PASSWORD } from "./pages/sign-in-page";
import { startServer, tempDataDir, type TestServer } from "./support/server";

// Its own server on its own data directory: runs alone, and cleans up after itself.
test.describe.configure({ mode: "serial" });

const USERS = ["tech@example.test", "cx@example.test", "engineer@example.test", "owner@example.test"];
const VALUES = ["IP", "SI", null] as const;

async function signIn(baseURL: string, email: string): Promise<string> {
  const res = await fetch(`${baseURL}/api/auth/sign-in`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  expect(res.status).toBe(204);
  return res.headers.get("set-cookie")!.split(";")[0]!;
}

test("a server killed with SIGKILL mid-burst restarts on its data, and every acknowledged write is there", async () => {
  test.setTimeout(120_000);
  const dataDir = tempDataDir();
  const servers: TestServer[] = [];
  try {
    const first = await startServer({ dataDir });
    servers.push(first);
    const cookies = await Promise.all(USERS.map((u) => signIn(first.baseURL, u)));

    // One stream of preference saves per user, all four at once; each acknowledged save is a user
    // row update and an audit entry, committed before the 200.
    const acked = new Map<string, { last: (typeof VALUES)[number]; inFlight: (typeof VALUES)[number] | undefined; count: number }>();
    let killed = false;
    const streams = USERS.map(async (email, i) => {
      const mine = { last: null as (typeof VALUES)[number], inFlight: undefined as (typeof VALUES)[number] | undefined, count: 0 };
      acked.set(email, mine);
      for (let n = 0; !killed && n < 1000; n++) {
        const value = VALUES[(n + i) % VALUES.length]!;
        mine.inFlight = value;
        try {
          const res = await fetch(`${first.baseURL}/api/v1/me`, {
            method: "PATCH",
            headers: { "content-type": "application/json", cookie: cookies[i]! },
            body: JSON.stringify({ unit_system: value }),
          });
          if (res.status !== 200) break;
          mine.last = value;
          mine.count++;
        } catch {
          break; // the server is gone
        }
      }
    });
    // Kill once enough writes are acknowledged, with requests still in flight.
    while ([...acked.values()].reduce((n, a) => n + a.count, 0) < 80) await new Promise((r) => setTimeout(r, 20));
    first.child.kill("SIGKILL");
    killed = true;
    expect(await first.exited).toBe("SIGKILL");
    await Promise.all(streams);
    const total = [...acked.values()].reduce((n, a) => n + a.count, 0);
    expect(total).toBeGreaterThanOrEqual(80);

    // Restart on the same directory: the lock left by the killed server is recovered, the database opens.
    const second = await startServer({ dataDir });
    servers.push(second);
    expect(second.output()).toContain("Recovered the data directory lock");
    const cookie = await signIn(second.baseURL, "tech@example.test");
    expect((await fetch(`${second.baseURL}/api/v1/projects`, { headers: { cookie } })).status).toBe(200);
    second.child.kill("SIGTERM");
    expect(await second.exited).toBe(143);
    expect(second.output()).toContain("database closed");

    const handle = await openDatabase({ dataDir });
    try {
      const [row] = await handle.db.select({ n: count() }).from(s.auditLog).where(eq(s.auditLog.action, "user.preferences_changed"));
      // Every acknowledged save left its audit entry (the one in flight at the kill may have too).
      expect(row!.n).toBeGreaterThanOrEqual(total);
      expect(row!.n).toBeLessThanOrEqual(total + USERS.length);
      for (const email of USERS) {
        const [user] = await handle.db.select({ unitSystem: s.users.unitSystem }).from(s.users).where(eq(s.users.email, email));
        const mine = acked.get(email)!;
        expect([mine.last, mine.inFlight]).toContain(user!.unitSystem);
      }
    } finally {
      await handle.close();
    }
  } finally {
    for (const server of servers) if (server.child.exitCode === null && server.child.signalCode === null) server.child.kill("SIGKILL");
    await Promise.all(servers.map((server) => server.exited));
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
});
