import { count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { callRoute } from "../support/route-call";

const session = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), session));

const route = await import("@/app/api/v1/projects/[projectId]/systems/[systemId]/conditions/route");

const ids: Record<string, string> = {};
let library: string;
let clinic: string;
let ahu: string;
let ef: string;
let rtu: string;
const as = (email: string | null) => {
  session.userId = email === null ? undefined : ids[email];
};
const params = (projectId: string, systemId: string) => ({ projectId, systemId });

beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  for (const u of await db.select().from(s.users)) ids[u.email] = u.id;
  for (const p of await db.select().from(s.projects)) {
    if (p.siteName === "Wrenfield Community Library") library = p.id;
    else clinic = p.id;
  }
  for (const sys of await db.select().from(s.airSystems)) {
    if (sys.tag === "AHU-1") ahu = sys.id;
    if (sys.tag === "EF-1") ef = sys.id;
    if (sys.tag === "RTU-2") rtu = sys.id;
  }
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

const record = { fanSpeedRpm: 1150, boxes: "maximum", outsideAirDamperPct: 20, ductStaticSetpointPa: 250, filterState: "clean", notes: "Economizer held at minimum from the BMS." };

describe("GET …/systems/{systemId}/conditions", () => {
  it("lets every member read, newest first, and answers 401 signed out", async () => {
    as(null);
    expect((await callRoute(route.GET, { params: params(library, ahu) })).status).toBe(401);
    for (const email of ["owner@example.test", "cx@example.test", "engineer@example.test", "tech@example.test", "admin@example.test"]) {
      as(email);
      const res = await callRoute(route.GET, { params: params(library, ahu) });
      expect(res.status, email).toBe(200);
      expect(res.body.systemId).toBe(ahu);
      expect(res.body.current).toEqual(res.body.conditions[0] ?? null);
    }
  });

  it("answers another project's system exactly like an unknown one (404)", async () => {
    as("engineer@example.test"); // a member of both projects
    const foreign = await callRoute(route.GET, { params: params(library, rtu) });
    const unknown = await callRoute(route.GET, { params: params(library, "00000000-0000-4000-8000-000000000000") });
    const garbage = await callRoute(route.GET, { params: params(library, "not-an-id") });
    expect([foreign.status, unknown.status, garbage.status]).toEqual([404, 404, 404]);
    expect(foreign.body).toEqual(unknown.body);
    expect(garbage.body).toEqual(unknown.body);
    as("tech@example.test"); // not a member of the clinic at all
    expect((await callRoute(route.GET, { params: params(clinic, rtu) })).status).toBe(404);
  });
});

describe("POST …/systems/{systemId}/conditions", () => {
  it("refuses owners, engineers, commissioning agents and site administrators (403) before reading the body", async () => {
    for (const email of ["owner@example.test", "engineer@example.test", "cx@example.test", "admin@example.test"]) {
      as(email);
      const res = await callRoute(route.POST, { method: "POST", params: params(library, ahu), rawBody: "{" });
      expect(res.status, email).toBe(403);
    }
    as(null);
    expect((await callRoute(route.POST, { method: "POST", params: params(library, ahu), body: record })).status).toBe(401);
  });

  it("records a technician's conditions (201), audits them, and makes them current", async () => {
    as("tech@example.test");
    const res = await callRoute(route.POST, { method: "POST", params: params(library, ahu), body: record });
    expect(res.status).toBe(201);
    expect(res.body.conditions).toMatchObject({ ...record, vfdHz: null, systemId: ahu, recordedBy: ids["tech@example.test"], recordedByName: "Tomasz Reyes" });
    expect(res.body.warnings).toEqual([]);
    const read = await callRoute(route.GET, { params: params(library, ahu) });
    expect(read.body.current.id).toBe(res.body.conditions.id);

    const db = await getDb();
    const [audit] = await db.select().from(s.auditLog).where(eq(s.auditLog.entityId, res.body.conditions.id));
    expect(audit).toMatchObject({ action: "conditions.recorded", projectId: library, userId: ids["tech@example.test"], entityType: "operating_conditions" });
    expect((audit!.detail as { systemTag: string }).systemTag).toBe("AHU-1");
  });

  it("stores an unusual fan speed with a warning instead of refusing it", async () => {
    as("tech@example.test");
    const res = await callRoute(route.POST, { method: "POST", params: params(library, ef), body: { fanSpeedRpm: 2900, filterState: "unknown" } });
    expect(res.status).toBe(201);
    expect(res.body.warnings[0]).toContain("above the scheduled 1,420 rpm");
  });

  it("answers 400 naming the fields: no fan speed at all, a bad choice, a time in the future", async () => {
    as("tech@example.test");
    const res = await callRoute(route.POST, {
      method: "POST",
      params: params(library, ahu),
      body: { boxes: "wide open", outsideAirDamperPct: 140, recordedAt: new Date(Date.now() + 86_400_000).toISOString() },
    });
    expect(res.status).toBe(400);
    const f = res.body.error.fields;
    expect(f.fanSpeedRpm).toContain("give the fan speed in rpm");
    expect(f.boxes).toContain('got the text "wide open"');
    expect(f.outsideAirDamperPct).toBe("must be a number from 0 to 100 % open, or null; got 140");
    expect(Object.keys(f)).toEqual(expect.arrayContaining(["fanSpeedRpm", "boxes", "outsideAirDamperPct"]));
    const future = await callRoute(route.POST, { method: "POST", params: params(library, ahu), body: { ...record, recordedAt: new Date(Date.now() + 86_400_000).toISOString() } });
    expect(future.body.error.fields.recordedAt).toContain("cannot be in the future");
  });

  it("answers 404 for another project's system before looking at the body", async () => {
    as("tech@example.test");
    expect((await callRoute(route.POST, { method: "POST", params: params(library, rtu), body: record })).status).toBe(404);
    expect((await callRoute(route.POST, { method: "POST", params: params(clinic, rtu), body: record })).status).toBe(404);
  });

  it("stores a retried create once: the same client id answers 200 with the stored record; on another system, 409", async () => {
    as("tech@example.test");
    const id = "7b0c3a52-5d0e-4f7e-9a1b-2c3d4e5f6a7b";
    const recordedAt = new Date(Date.now() - 3 * 3_600_000).toISOString();
    const first = await callRoute(route.POST, { method: "POST", params: params(library, ahu), body: { ...record, id, recordedAt } });
    const again = await callRoute(route.POST, { method: "POST", params: params(library, ahu), body: { ...record, id, recordedAt } });
    expect([first.status, again.status]).toEqual([201, 200]);
    expect(again.body.conditions).toEqual(first.body.conditions);
    expect(new Date(first.body.conditions.recordedAt).toISOString()).toBe(recordedAt);
    const db = await getDb();
    const [n] = await db.select({ n: count() }).from(s.operatingConditions).where(eq(s.operatingConditions.id, id));
    expect(n!.n).toBe(1);
    const elsewhere = await callRoute(route.POST, { method: "POST", params: params(library, ef), body: { ...record, id } });
    expect(elsewhere.status).toBe(409);
  });
});
