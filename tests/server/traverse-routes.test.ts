import { spawnSync } from "node:child_process";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { runCalcCommand } from "@/lib/airflow/commands";
import { camelKeys } from "@/lib/traverse/engine-input";
import { callRoute } from "../support/route-call";

const session = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), session));
// Lets a test act between a save's look at the traverse and its write, as a second device might.
const race = vi.hoisted(() => ({ afterLook: null as null | (() => Promise<unknown>) }));
vi.mock("@/db/queries/traverses", async (original) => {
  const mod = await original<typeof import("@/db/queries/traverses")>();
  return {
    ...mod,
    getTraverseToEdit: async (q: Parameters<typeof mod.getTraverseToEdit>[0]) => {
      const found = await mod.getTraverseToEdit(q);
      const act = race.afterLook;
      race.afterLook = null;
      if (act) await act();
      return found;
    },
  };
});

const collection = await import("@/app/api/v1/projects/[projectId]/traverses/route");
const one = await import("@/app/api/v1/projects/[projectId]/traverses/[traverseId]/route");
const readingsRoute = await import("@/app/api/v1/projects/[projectId]/traverses/[traverseId]/readings/route");

const ROOT = path.resolve(import.meta.dirname, "../..");
const ids: Record<string, string> = {};
const sections: Record<string, string> = {};
const instrumentIds: Record<string, string> = {};
let library: string;
let clinic: string;
let ahuConditions: string;
let efConditions: string;
const as = (email: string | null) => {
  session.userId = email === null ? undefined : ids[email];
};
const UNKNOWN = "00000000-0000-4000-8000-00000000beef";

beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  for (const u of await db.select().from(s.users)) ids[u.email] = u.id;
  for (const p of await db.select().from(s.projects)) {
    if (p.siteName === "Wrenfield Community Library") library = p.id;
    else clinic = p.id;
  }
  for (const sec of await db.select().from(s.ductSections)) sections[sec.tag] = sec.id;
  for (const i of await db.select().from(s.instruments)) instrumentIds[i.serial] = i.id;
  const systems = await db.select().from(s.airSystems);
  const cond = await db.select().from(s.operatingConditions);
  ahuConditions = cond.filter((c) => c.systemId === systems.find((x) => x.tag === "AHU-1")!.id).sort((a, b) => +b.recordedAt - +a.recordedAt)[0]!.id;
  efConditions = cond.find((c) => c.systemId === systems.find((x) => x.tag === "EF-1")!.id)!.id;
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

const air = { dryBulbC: 21.5, relativeHumidityPct: 42, staticPa: -180 };
const instrument = () => ({
  readingInstrumentId: instrumentIds["MM-30418"],
  probeInstrumentId: instrumentIds["PT-0931"],
  airInstrumentId: instrumentIds["TH-2209"],
  barometerInstrumentId: instrumentIds["BA-1174"],
});
const start = (body: Record<string, unknown>, projectId = library) => callRoute(collection.POST, { method: "POST", params: { projectId }, body });
const get = (traverseId: string, projectId = library) => callRoute(one.GET, { params: { projectId, traverseId } });
const put = (traverseId: string, body: unknown, projectId = library) => callRoute(readingsRoute.PUT, { method: "PUT", params: { projectId, traverseId }, body });
const patch = (traverseId: string, body: unknown, projectId = library) => callRoute(one.PATCH, { method: "PATCH", params: { projectId, traverseId }, body });

/** Exhaust velocity pressures (Pa) across Ø 450 mm, 2 diameters × 8 log-linear points: a developed profile, invented. */
const X1_GRID = [
  [18.2, 26.4, 29.8, 33.1, 33.6, 30.2, 27.0, 19.1],
  [17.5, 25.9, 30.4, 32.7, 34.0, 29.6, 26.1, 18.4],
];

describe("POST …/traverses", () => {
  it("refuses every role but technicians (403) before reading the body, and signed-out callers (401)", async () => {
    for (const email of ["owner@example.test", "engineer@example.test", "cx@example.test", "admin@example.test"]) {
      as(email);
      expect((await callRoute(collection.POST, { method: "POST", params: { projectId: library }, rawBody: "{" })).status, email).toBe(403);
    }
    as(null);
    expect((await start({ sectionId: sections.X1, method: "log-linear", air })).status).toBe(401);
    as("tech@example.test");
    expect((await start({ sectionId: sections["C1"] ?? UNKNOWN, method: "log-linear", air }, clinic)).status).toBe(404);
  });

  it("starts a draft with the engine's recommended counts, the register's accuracies and the probe head, and audits it", async () => {
    as("tech@example.test");
    const res = await start({ sectionId: sections.X1, method: "log-linear", portOffsetMm: 30, air, instrument: instrument(), conditionsId: efConditions });
    expect(res.status).toBe(201);
    const t = res.body.traverse;
    // Ø 450 mm: 2 diameters × 8 points (ASHRAE Handbook rule: 8 points per diameter above 250 mm; common practice: 2 diameters at 90°).
    expect(t).toMatchObject({ status: "draft", version: 1, revision: 1, lines: 2, pointsPerLine: 8, method: "log-linear", portOffsetMm: 30, readingsKind: "velocity_pressure" });
    expect(t.instrument).toMatchObject({ probeCoefficient: 1, probeHeadDiameterMm: 8, accuracy: { pressureAccuracyPct: 1, pressureFloorPa: 1, temperatureAccuracyC: 0.3, humidityAccuracyPct: 2, barometricAccuracyPa: 150 } });
    expect(t.readings).toEqual([Array(8).fill(null), Array(8).fill(null)]);
    expect(t.result).toBeNull();
    expect(t.resultError.message).toBe("No readings yet.");
    expect(t.layout.lines).toHaveLength(2);
    // Insertion depth = read position + port offset (ISO 5802 log-linear 8-point table: first point at 0.021 D = 9.45 mm).
    expect(t.layout.lines[0].points[0].depthMm).toBeCloseTo(9.5 + 30, 0);
    expect(t.conditions.id).toBe(efConditions);
    const db = await getDb();
    const audit = await db.select().from(s.auditLog).where(and(eq(s.auditLog.entityId, t.id), eq(s.auditLog.action, "traverse.started")));
    expect(audit).toHaveLength(1);
  });

  it("names each refused field: unknown section, counts the method does not define, wrong instrument kinds, another system's conditions, impossible air", async () => {
    as("tech@example.test");
    const unknown = await start({ sectionId: UNKNOWN, method: "log-linear", air });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.sectionId).toContain("names no duct section of this project");
    const res = await start({
      sectionId: sections.X1,
      method: "log-linear",
      pointsPerLine: 7,
      air: { dryBulbC: 20, relativeHumidityPct: 100, staticPa: 0, barometricPa: 50_000 },
      instrument: { readingInstrumentId: instrumentIds["TH-2209"], probeInstrumentId: instrumentIds["MM-30418"] },
      conditionsId: ahuConditions,
    });
    expect(res.status).toBe(400);
    const f = res.body.error.fields;
    expect(f.pointsPerLine).toContain("log-linear round layouts have 6, 8 or 10 points per diameter; got 7");
    // 100 % RH at 20 °C is 2.3 kPa of vapour: possible at 50 kPa, so only the other fields are refused here.
    expect(f["air.relativeHumidityPct"]).toBeUndefined();
    expect(f["instrument.readingInstrumentId"]).toContain("must be a manometer");
    expect(f["instrument.probeInstrumentId"]).toContain("pitot-static tube");
    expect(f.conditionsId).toContain("names no operating conditions recorded for EF-1");
    const both = await start({ sectionId: sections.X1, method: "log-linear", air: { dryBulbC: 20, relativeHumidityPct: 50, wetBulbC: 14, staticPa: 0 } });
    expect(both.body.error.fields["air.relativeHumidityPct"]).toContain("not both");
    const wetAboveDry = await start({ sectionId: sections.X1, method: "log-linear", air: { dryBulbC: 20, wetBulbC: 24, staticPa: 0 } });
    expect(wetAboveDry.body.error.fields["air.wetBulbC"]).toBe("must be at or below the dry-bulb 20 °C; got 24");
    const noStatic = await start({ sectionId: sections.X1, method: "log-linear", air: { dryBulbC: 20, relativeHumidityPct: 50 } });
    expect(noStatic.body.error.fields["air.staticPa"]).toContain("is needed");
  });

  it("keeps earlier traverses as history: a re-traverse takes the next revision", async () => {
    as("tech@example.test");
    const first = await start({ sectionId: sections["X1.1"], method: "equal-area", lines: 2, pointsPerLine: 6, air });
    const second = await start({ sectionId: sections["X1.1"], method: "log-linear", air });
    expect([first.status, second.status]).toEqual([201, 201]);
    expect([first.body.traverse.revision, second.body.traverse.revision]).toEqual([1, 2]);
    const read = await get(second.body.traverse.id);
    expect(read.body.traverse.revisions.map((r: { revision: number }) => r.revision)).toEqual([2, 1]);
    const db = await getDb();
    const retraverse = await db.select().from(s.auditLog).where(eq(s.auditLog.entityId, second.body.traverse.id));
    expect(retraverse.map((a) => a.action)).toContain("traverse.retraversed");
  });

  it("stores a retried create once (same client id: 200 with the stored traverse)", async () => {
    as("tech@example.test");
    const id = "3c8f0a11-2b4d-4e6f-8a9b-0c1d2e3f4a5b";
    const a = await start({ id, sectionId: sections["X1.2"], method: "log-linear", air });
    const b = await start({ id, sectionId: sections["X1.2"], method: "log-linear", air });
    expect([a.status, b.status]).toEqual([201, 200]);
    expect(b.body.traverse.id).toBe(id);
    expect(b.body.traverse.revision).toBe(1);
  });
});

describe("GET …/traverses/{traverseId}", () => {
  it("lets every member read; another project's or an unknown id answers 404 alike", async () => {
    as("tech@example.test");
    const { body } = await start({ sectionId: sections.X1, method: "log-linear", air });
    for (const email of ["owner@example.test", "cx@example.test", "engineer@example.test", "tech@example.test", "admin@example.test"]) {
      as(email);
      expect((await get(body.traverse.id)).status, email).toBe(200);
    }
    as("engineer@example.test"); // a member of both projects
    const foreign = await get(body.traverse.id, clinic);
    const unknown = await get(UNKNOWN, clinic);
    const garbage = await get("not-an-id", clinic);
    expect([foreign.status, unknown.status, garbage.status]).toEqual([404, 404, 404]);
    expect(foreign.body).toEqual(unknown.body);
    expect(garbage.body).toEqual(unknown.body);
    as("tech@example.test"); // not a member of the clinic
    expect((await get(body.traverse.id, clinic)).status).toBe(404);
  });
});

describe("PUT …/traverses/{traverseId}/readings", () => {
  let traverseId: string;
  beforeAll(async () => {
    as("tech@example.test");
    const { body } = await start({ sectionId: sections.X1, method: "log-linear", air, instrument: instrument(), conditionsId: efConditions });
    traverseId = body.traverse.id;
  });

  it("refuses other roles (403) before reading the body, signed-out callers (401), and another project's traverse (404)", async () => {
    for (const email of ["owner@example.test", "engineer@example.test", "cx@example.test", "admin@example.test"]) {
      as(email);
      expect((await callRoute(readingsRoute.PUT, { method: "PUT", params: { projectId: library, traverseId }, rawBody: "{" })).status, email).toBe(403);
    }
    as(null);
    expect((await put(traverseId, { version: 1, readings: X1_GRID })).status).toBe(401);
    as("tech@example.test");
    expect((await put(traverseId, { version: 1, readings: X1_GRID }, clinic)).status).toBe(404);
    expect((await put(UNKNOWN, { version: 1, readings: X1_GRID })).status).toBe(404);
  });

  it("saves the grid, moves to the next version, and gives exactly what `npm run -s calc -- traverse` gives", async () => {
    as("tech@example.test");
    const res = await put(traverseId, { version: 1, readings: X1_GRID });
    expect(res.status).toBe(200);
    const t = res.body.traverse;
    expect(t.version).toBe(2);
    expect(t.readings).toEqual(X1_GRID);
    expect(t.result.counts).toEqual({ points: 16, read: 16, unreadable: 0, notRead: 0 });
    expect(t.result.complete).toBe(true);

    const cli = spawnSync(path.join(ROOT, "node_modules/.bin/tsx"), ["lib/cli/calc.ts", "traverse"], { cwd: ROOT, input: JSON.stringify(t.engineInput), encoding: "utf8", timeout: 60_000 });
    expect(cli.status, cli.stderr).toBe(0);
    const fromCli = camelKeys(JSON.parse(cli.stdout)) as Record<string, unknown>;
    const { pctOfDesign, counts, complete, ...engine } = t.result;
    expect(engine).toEqual(fromCli);
    expect(engine.densityKgM3).toBe(fromCli.densityKgM3);
    expect(Object.keys(engine)).toEqual(expect.arrayContaining(["densityKgM3", "meanVelocityMS", "flowM3S", "standardFlowM3S", "massFlowKgS", "quality", "uncertainty"]));
    expect(t.result.uncertainty.coverageFactor).toBe(2);
    expect(t.result.uncertainty.shown).toMatch(/^± \d+\.\d % \(k = 2, about 95 %\)$/);
    // % of design against the section's design airflow at standard air (X1: 0.9 m³/s).
    expect(pctOfDesign).toBeCloseTo((100 * (fromCli.standardFlowM3S as number)) / 0.9, 9);
    void counts;
    void complete;
  });

  it("answers a save with the traverse exactly as a fresh read gives it: points changed, cleared and marked unreadable", async () => {
    as("tech@example.test");
    const { version } = (await get(traverseId)).body.traverse;
    const grid = X1_GRID.map((row, k) => row.map((v, i) => (k === 1 && i === 7 ? null : k === 0 && i === 4 ? null : i === 2 ? v + 3 : v)));
    const res = await put(traverseId, { version, readings: grid, unreadable: [[0, 4]] });
    expect(res.status).toBe(200);
    // A read also lists the section's revisions; a save's answer leaves them out.
    const { revisions, ...fresh } = (await get(traverseId)).body.traverse;
    expect(revisions.length).toBeGreaterThan(0);
    expect(res.body.traverse).toEqual(fresh);
    expect(fresh.readings).toEqual(grid);
    expect(fresh.result.counts).toEqual({ points: 16, read: 14, unreadable: 1, notRead: 1 });
    // Back to the full grid for the tests that follow.
    expect((await put(traverseId, { version: fresh.version, readings: X1_GRID })).status).toBe(200);
  });

  it("answers a stale version with 409 and the current traverse, and changes nothing", async () => {
    as("tech@example.test");
    const before = (await get(traverseId)).body.traverse;
    const changed = X1_GRID.map((row) => row.map((v) => v + 1));
    const res = await put(traverseId, { version: 1, readings: changed });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain("Someone saved this traverse first");
    expect(res.body.traverse.version).toBe(before.version);
    expect(res.body.traverse.readings).toEqual(before.readings);
    const after = (await get(traverseId)).body.traverse;
    expect(after.readings).toEqual(before.readings);
    expect(after.version).toBe(before.version);
    // Stale and malformed at once: the device hears first that it is behind.
    const both = await put(traverseId, { version: 1, readings: [X1_GRID[0]] });
    expect(both.status).toBe(409);
    expect(both.body.traverse.version).toBe(before.version);
  });

  it("answers 409 and changes nothing when another device saves or submits between a save's look and its write", async () => {
    as("tech@example.test");
    const { body } = await start({ sectionId: sections.X1, method: "log-linear", air, instrument: instrument(), conditionsId: efConditions });
    const id = body.traverse.id as string;
    const first = await put(id, { version: 1, readings: X1_GRID });
    expect(first.status).toBe(200);
    const db = await getDb();
    const bumped = X1_GRID.map((row) => row.map((v) => v + 0.5));

    race.afterLook = () => put(id, { version: 2, readings: bumped }); // the other device saves first
    const lost = await put(id, { version: 2, readings: X1_GRID.map((row) => row.map((v) => v + 1)) });
    expect(lost.status).toBe(409);
    expect(lost.body.error.message).toContain("Someone saved this traverse first");
    expect(lost.body.traverse.version).toBe(3);
    expect(lost.body.traverse.readings).toEqual(bumped);

    race.afterLook = () => db.update(s.traverses).set({ status: "submitted" }).where(eq(s.traverses.id, id)); // submitted meanwhile
    const locked = await put(id, { version: 3, readings: X1_GRID });
    expect(locked.status).toBe(409);
    expect(locked.body.error.message).toContain("Start a re-traverse of X1");
    const [row] = await db.select().from(s.traverses).where(eq(s.traverses.id, id));
    expect([row!.status, row!.version]).toEqual(["submitted", 3]);
    expect((await get(id)).body.traverse.readings).toEqual(bumped);
  });

  it("answers a grid of the wrong shape with 400 naming readings.L.P, and keeps what was saved", async () => {
    as("tech@example.test");
    const { version, readings } = (await get(traverseId)).body.traverse;
    const short = await put(traverseId, { version, readings: [X1_GRID[0], X1_GRID[1]!.slice(0, 6)] });
    expect(short.status).toBe(400);
    expect(short.body.error.fields["readings.1.6"]).toContain("line 1 has 6 readings; every line needs 8");
    const long = await put(traverseId, { version, readings: [...X1_GRID, X1_GRID[0]] });
    expect(long.body.error.fields["readings.2.0"]).toContain("beyond the traverse's 2 lines");
    const extra = await put(traverseId, { version, readings: [[...X1_GRID[0]!, 5], X1_GRID[1]] });
    expect(extra.body.error.fields["readings.0.8"]).toContain("beyond the 8 points of line 0");
    const range = await put(traverseId, { version, readings: [[9000, ...X1_GRID[0]!.slice(1)], X1_GRID[1]] });
    expect(range.body.error.fields["readings.0.0"]).toBe("must be a velocity pressure from -500 to 5000 Pa (or null for a point not read); got 9000");
    const text = await put(traverseId, { version, readings: [["12", ...X1_GRID[0]!.slice(1)], X1_GRID[1]] });
    expect(text.status).toBe(400);
    expect(Object.keys(text.body.error.fields)).toEqual(["readings.0.0"]);
    const after = (await get(traverseId)).body.traverse;
    expect([after.version, after.readings]).toEqual([version, readings]);
  });

  it("tells unreadable points from points not read, integrates around them and says how", async () => {
    as("tech@example.test");
    const { version } = (await get(traverseId)).body.traverse;
    const grid = X1_GRID.map((row) => [...row]) as (number | null)[][];
    grid[0]![2] = null; // obstruction
    grid[1]![7] = null; // not read yet
    const bad = await put(traverseId, { version, readings: X1_GRID, unreadable: [[0, 2]] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields["readings.0.2"]).toContain("is marked unreadable");
    const res = await put(traverseId, { version, readings: grid, unreadable: [[0, 2]] });
    expect(res.status).toBe(200);
    const t = res.body.traverse;
    expect(t.unreadable).toEqual([[0, 2]]);
    expect(t.readings[0][2]).toBeNull();
    expect(t.result.counts).toEqual({ points: 16, read: 14, unreadable: 1, notRead: 1 });
    expect(t.result.complete).toBe(false);
    expect(t.result.filledPoints).toBe(2);
    expect(t.result.integrationRule).toBe("equal-weight");
    expect(t.result.warnings.join(" ")).toContain("not read; the method's own weights were kept");
    const point = t.result.points.find((p: { line: number; point: number }) => p.line === 0 && p.point === 2);
    expect(point.filledFrom).toBeDefined();
    const db = await getDb();
    const rows = await db.select().from(s.readings).where(eq(s.readings.traverseId, traverseId));
    expect(rows.find((r) => r.line === 1 && r.point === 3)).toMatchObject({ unreadable: true, value: null });
    expect(rows.some((r) => r.line === 2 && r.point === 8)).toBe(false);
    // The equality with the calc command holds with gaps too.
    const calc = runCalcCommand("traverse", t.engineInput);
    expect(calc.ok && camelKeys(calc.value)).toEqual((({ pctOfDesign, counts, complete, ...rest }) => (void pctOfDesign, void counts, void complete, rest))(t.result));
  });

  it("says when the duct static pressure was not measured and 0 Pa assumed", async () => {
    as("tech@example.test");
    const { version } = (await get(traverseId)).body.traverse;
    const res = await put(traverseId, { version, readings: X1_GRID, air: { ...air, staticPa: null } });
    expect(res.status).toBe(200);
    expect(res.body.traverse.air.staticPa).toBeNull();
    expect(res.body.traverse.result.air.staticAssumed).toBe(true);
    expect(res.body.traverse.result.warnings.join(" ")).toMatch(/static/i);
  });

  it("keeps a result error beside the saved readings when the engine refuses them (hoses swapped)", async () => {
    as("tech@example.test");
    const { version } = (await get(traverseId)).body.traverse;
    const swapped = X1_GRID.map((row) => row.map((v) => -v));
    const res = await put(traverseId, { version, readings: swapped, air });
    expect(res.status).toBe(200);
    expect(res.body.traverse.readings).toEqual(swapped);
    expect(res.body.traverse.result).toBeNull();
    expect(res.body.traverse.resultError.message).toContain("Most readings are negative");
  });

  it("keeps the accuracies copied from the register when the instruments stay the same, and copies anew when one changes", async () => {
    as("tech@example.test");
    const db = await getDb();
    const { body } = await start({ sectionId: sections.X1, method: "log-linear", air, instrument: instrument() });
    const id = body.traverse.id;
    await db.update(s.instruments).set({ accuracyPct: 2.5 }).where(eq(s.instruments.serial, "MM-30418"));
    try {
      const same = await put(id, { version: 1, readings: X1_GRID, instrument: { ...instrument(), overdueReason: "" } });
      expect(same.body.traverse.instrument.accuracy.pressureAccuracyPct).toBe(1);
      const changed = await put(id, { version: 2, readings: X1_GRID, instrument: { ...instrument(), barometerInstrumentId: null } });
      expect(changed.body.traverse.instrument.accuracy.pressureAccuracyPct).toBe(2.5);
      expect(changed.body.traverse.instrument.accuracy.barometricAccuracyPa).toBeUndefined();
    } finally {
      await db.update(s.instruments).set({ accuracyPct: 1 }).where(eq(s.instruments.serial, "MM-30418"));
    }
  });

  it("locks a submitted or approved traverse (409 saying to re-traverse), changing nothing", async () => {
    as("tech@example.test");
    const db = await getDb();
    const [submitted] = await db.select().from(s.traverses).where(and(eq(s.traverses.sectionId, sections.S1!), eq(s.traverses.status, "submitted")));
    const res = await put(submitted!.id, { version: submitted!.version, readings: [[1, 2, 3, 4, 5]] });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain("Start a re-traverse of S1");
    expect(res.body.status).toBe("submitted");
    expect(res.body.traverse).toBeUndefined();
    const [again] = await db.select().from(s.traverses).where(eq(s.traverses.id, submitted!.id));
    expect(again!.version).toBe(submitted!.version);
  });
});

describe("PATCH …/traverses/{traverseId}", () => {
  it("changes the air and instruments of a draft at its version; a stale version is 409 with nothing changed; other roles 403", async () => {
    as("tech@example.test");
    const { body } = await start({ sectionId: sections.X1, method: "log-linear", air });
    const id = body.traverse.id;
    for (const email of ["owner@example.test", "engineer@example.test"]) {
      as(email);
      expect((await callRoute(one.PATCH, { method: "PATCH", params: { projectId: library, traverseId: id }, rawBody: "{" })).status).toBe(403);
    }
    as("tech@example.test");
    const res = await patch(id, { version: 1, air: { dryBulbC: 19, wetBulbC: 13, staticPa: -120, barometricPa: 98_900 }, instrument: { readingInstrumentId: instrumentIds["MM-30418"] }, notes: "Ports on the underside." });
    expect(res.status).toBe(200);
    expect(res.body.traverse).toMatchObject({ version: 2, air: { dryBulbC: 19, wetBulbC: 13, relativeHumidityPct: null, staticPa: -120, barometricPa: 98_900 }, notes: "Ports on the underside." });
    expect(res.body.traverse.instrument.accuracy).toEqual({ pressureAccuracyPct: 1, pressureFloorPa: 1 });
    const staleRes = await patch(id, { version: 1, notes: "Overwrite?" });
    expect(staleRes.status).toBe(409);
    expect(staleRes.body.traverse.notes).toBe("Ports on the underside.");
    const db = await getDb();
    const changed = await db.select().from(s.auditLog).where(and(eq(s.auditLog.entityId, id), eq(s.auditLog.action, "traverse.changed")));
    expect(changed[0]!.detail).toMatchObject({ before: { dryBulbC: 21.5 }, after: { dryBulbC: 19 } });
  });
});
