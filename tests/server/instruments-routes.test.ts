import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { callRoute } from "../support/route-call";

// The session is whoever the test says; everything after it (users, roles, database) is real.
const session = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), session));

const list = await import("@/app/api/v1/instruments/route");
const one = await import("@/app/api/v1/instruments/[instrumentId]/route");

const ids: Record<string, string> = {};
async function as(email: string | null) {
  session.userId = email === null ? undefined : ids[email];
}

beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  for (const u of await db.select().from(s.users)) ids[u.email] = u.id;
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

const manometer = {
  kind: "manometer",
  make: "Test maker",
  model: "DM-9",
  serial: "T-MM-001",
  calibratedOn: "2026-06-01",
  calibrationDueOn: "2027-06-01",
  rangeMin: -3735,
  rangeMax: 3735,
  accuracyPct: 1,
  accuracyFloor: 1,
};

async function auditFor(entityId: string) {
  const db = await getDb();
  return db.select().from(s.auditLog).where(and(eq(s.auditLog.entityType, "instrument"), eq(s.auditLog.entityId, entityId)));
}

describe("GET /api/v1/instruments", () => {
  it("answers 401 signed out and the register to any signed-in user, with calibration status in words", async () => {
    await as(null);
    expect((await callRoute(list.GET, { path: "/api/v1/instruments" })).status).toBe(401);
    await as("owner@example.test");
    const res = await callRoute(list.GET, { path: "/api/v1/instruments" });
    expect(res.status).toBe(200);
    expect(Array.isArray(res.body.instruments)).toBe(true);
    for (const i of res.body.instruments) {
      expect(i.retiredAt).toBeNull();
      expect(i.calibrationStatus.message).toMatch(/Calibration|No calibration/);
    }
  });

  it("filters by kind and refuses an unknown kind with the field named", async () => {
    await as("tech@example.test");
    const bad = await callRoute(list.GET, { path: "/api/v1/instruments?kind=manometer,teleporter" });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)[0]).toMatch(/^kind/);
    const ok = await callRoute(list.GET, { path: "/api/v1/instruments?kind=pitot_tube" });
    expect(ok.status).toBe(200);
    expect(ok.body.instruments.every((i: { kind: string }) => i.kind === "pitot_tube")).toBe(true);
  });
});

describe("POST /api/v1/instruments", () => {
  it("refuses owners, engineers and commissioning agents before reading the body", async () => {
    for (const email of ["owner@example.test", "engineer@example.test", "cx@example.test"]) {
      await as(email);
      const res = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", rawBody: "{not json" });
      expect(res.status, email).toBe(403);
      expect(res.body.error.message).toContain("technicians and site administrators");
    }
  });

  it("lets a technician add one (201, audited) and refuses the same serial in another case (409)", async () => {
    await as("tech@example.test");
    const res = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: manometer });
    expect(res.status).toBe(201);
    expect(res.body.instrument).toMatchObject({ kind: "manometer", serial: "T-MM-001", rangeMax: 3735, probeCoefficient: null, createdBy: ids["tech@example.test"] });
    expect(res.body.instrument.calibrationStatus.status).toMatch(/ok|due-soon|overdue/);
    const audit = await auditFor(res.body.instrument.id);
    expect(audit.map((a) => a.action)).toEqual(["instrument.created"]);
    expect(audit[0]!.userId).toBe(ids["tech@example.test"]);

    const dup = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: { ...manometer, serial: "t-mm-001" } });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.serial).toContain("already in the register");
  });

  it("refuses the second of two simultaneous adds of one serial with 409, not 500", async () => {
    await as("tech@example.test");
    const body = { ...manometer, serial: "RACE-1" };
    const [a, b] = await Promise.all([
      callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body }),
      callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: { ...body, serial: "race-1" } }),
    ]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
  });

  it("lets a site administrator add one", async () => {
    await as("admin@example.test");
    const res = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: { kind: "tachometer", serial: "T-TACH-1", rangeMin: 10, rangeMax: 99_999 } });
    expect(res.status).toBe(201);
  });

  it("answers 400 naming every field at fault, with the value and what is allowed", async () => {
    await as("tech@example.test");
    const res = await callRoute(list.POST, {
      method: "POST",
      path: "/api/v1/instruments",
      body: { kind: "capture_hood", serial: "", rangeMin: 0, rangeMax: 40, hoodCorrectionFactor: 3, probeHeadDiameterMm: 8, calibrationDueOn: "next year" },
    });
    expect(res.status).toBe(400);
    const f = res.body.error.fields;
    expect(f.serial).toContain("must not be empty");
    expect(f.hoodCorrectionFactor).toBe("must be a number from 0.5 to 2, or null; got 3");
    expect(f.calibrationDueOn).toContain('got the text "next year"');
    expect(res.body.error.message).toMatch(/check serial/);
    const kinds = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: { ...manometer, serial: "X", rangeMax: 200_000, hoodCorrectionFactor: 1.0 } });
    expect(kinds.body.error.fields).toEqual({
      rangeMax: "must be from -20000 to 20000 Pa for a manometer; got 200000",
      hoodCorrectionFactor: "applies to capture hoods only; leave it empty",
    });
  });

  it("refuses bodies that are not JSON (400) or too large (413)", async () => {
    await as("tech@example.test");
    const notJson = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", rawBody: "kind=manometer" });
    expect(notJson.status).toBe(400);
    expect(notJson.body.error.fields).toHaveProperty("(body)");
    const huge = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: { ...manometer, notes: "x".repeat(100_000) } });
    expect(huge.status).toBe(413);
    const long = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: { ...manometer, serial: "LONG", notes: "x".repeat(2_001) } });
    expect(long.status).toBe(400);
    expect(long.body.error.fields.notes).toBe("must be at most 2000 characters; got 2001");
  });
});

describe("GET, PATCH and DELETE /api/v1/instruments/{instrumentId}", () => {
  let id: string;
  beforeAll(async () => {
    await as("tech@example.test");
    const res = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: { ...manometer, serial: "T-MM-EDIT" } });
    id = res.body.instrument.id;
  });

  it("answers 404 for unknown ids and ids that are not ids", async () => {
    await as("owner@example.test");
    expect((await callRoute(one.GET, { params: { instrumentId: "00000000-0000-4000-8000-000000000000" } })).status).toBe(404);
    expect((await callRoute(one.GET, { params: { instrumentId: "../etc" } })).status).toBe(404);
    const ok = await callRoute(one.GET, { params: { instrumentId: id } });
    expect(ok.status).toBe(200);
    expect(ok.body.instrument.usage).toEqual({ traverses: 0, terminalReadings: 0, lastUsedAt: null });
  });

  it("lets the owner read but not change it", async () => {
    await as("owner@example.test");
    expect((await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { notes: "x" } })).status).toBe(403);
    expect((await callRoute(one.DELETE, { method: "DELETE", params: { instrumentId: id } })).status).toBe(403);
  });

  it("records a new calibration with before and after in the audit log", async () => {
    await as("tech@example.test");
    const res = await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { calibratedOn: "2026-11-30", calibrationDueOn: "2027-11-30", certificateNumber: "CAL-2211" } });
    expect(res.status).toBe(200);
    expect(res.body.instrument).toMatchObject({ calibratedOn: "2026-11-30", calibrationDueOn: "2027-11-30", certificateNumber: "CAL-2211" });
    const [, updated] = await auditFor(id);
    expect(updated!.action).toBe("instrument.updated");
    expect(updated!.detail).toEqual({
      before: { calibratedOn: "2026-06-01", calibrationDueOn: "2027-06-01", certificateNumber: "" },
      after: { calibratedOn: "2026-11-30", calibrationDueOn: "2027-11-30", certificateNumber: "CAL-2211" },
    });
  });

  it("refuses a change based on a stale read (409 with the current entry) and saves nothing", async () => {
    await as("tech@example.test");
    const read = await callRoute(one.GET, { params: { instrumentId: id } });
    const seen = read.body.instrument.updatedAt as string;
    const first = await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { notes: "Dropped once; checked against MM-30418.", ifUpdatedAt: seen } });
    expect(first.status).toBe(200);
    const stale = await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { notes: "Overwrite attempt", ifUpdatedAt: seen } });
    expect(stale.status).toBe(409);
    expect(stale.body.instrument.notes).toBe("Dropped once; checked against MM-30418.");
    expect(stale.body.error.message).toContain("nothing was saved");
    const after = await callRoute(one.GET, { params: { instrumentId: id } });
    expect(after.body.instrument.notes).toBe("Dropped once; checked against MM-30418.");
  });

  it("checks the record as a whole: a change that breaks it names the field, even one not sent", async () => {
    await as("tech@example.test");
    const res = await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { rangeMin: 5000 } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ rangeMax: "must be above the range minimum 5000; got 3735" });
    const unknown = await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { colour: "red" } });
    expect(unknown.status).toBe(400);
  });

  it("retires and returns it to service; retired ones leave the list unless asked for", async () => {
    await as("tech@example.test");
    const retired = await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { retired: true } });
    expect(retired.body.instrument.retiredAt).not.toBeNull();
    expect(retired.body.instrument.calibrationStatus.status).toBe("retired");
    const listed = await callRoute(list.GET, { path: "/api/v1/instruments" });
    expect(listed.body.instruments.map((i: { id: string }) => i.id)).not.toContain(id);
    const all = await callRoute(list.GET, { path: "/api/v1/instruments?includeRetired=true" });
    expect(all.body.instruments.map((i: { id: string }) => i.id)).toContain(id);
    const back = await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { retired: false } });
    expect(back.body.instrument.retiredAt).toBeNull();
    const actions = (await auditFor(id)).map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(["instrument.retired", "instrument.returned_to_service"]));
  });

  it("keeps a used instrument: its kind cannot change and it cannot be deleted, only retired", async () => {
    const db = await getDb();
    const [traverse] = await db.select().from(s.traverses).limit(1);
    await db.update(s.traverses).set({ airInstrumentId: id }).where(eq(s.traverses.id, traverse!.id));
    await as("tech@example.test");
    const kind = await callRoute(one.PATCH, { method: "PATCH", params: { instrumentId: id }, body: { kind: "barometer", rangeMin: 80_000, rangeMax: 110_000, accuracyPct: null } });
    expect(kind.status).toBe(409);
    expect(kind.body.error.fields.kind).toContain("cannot change");
    const del = await callRoute(one.DELETE, { method: "DELETE", params: { instrumentId: id } });
    expect(del.status).toBe(409);
    expect(del.body.error.message).toContain("retire it instead");
    const read = await callRoute(one.GET, { params: { instrumentId: id } });
    expect(read.body.instrument.usage.traverses).toBe(1);
  });

  it("deletes an unused entry made in error", async () => {
    await as("tech@example.test");
    const made = await callRoute(list.POST, { method: "POST", path: "/api/v1/instruments", body: { kind: "clamp_meter", serial: "TYPO-1" } });
    const del = await callRoute(one.DELETE, { method: "DELETE", params: { instrumentId: made.body.instrument.id } });
    expect(del.status).toBe(204);
    expect((await callRoute(one.GET, { params: { instrumentId: made.body.instrument.id } })).status).toBe(404);
    expect((await auditFor(made.body.instrument.id)).map((a) => a.action)).toEqual(["instrument.created", "instrument.deleted"]);
  });
});
