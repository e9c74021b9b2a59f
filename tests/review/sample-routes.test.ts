/**
 * Verification samples over the API: who may draw, the draw reproduced from its stored seed, the
 * project's rule, the agent's readings compared with the technician's (and not judged when the
 * operating conditions differ), the recommendation to return, witnessing, and the project settings.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { callRoute } from "../support/route-call";

const session = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), session));

const samplesRoute = await import("@/app/api/v1/projects/[projectId]/samples/route");
const sampleRoute = await import("@/app/api/v1/projects/[projectId]/samples/[sampleId]/route");
const itemRoute = await import("@/app/api/v1/projects/[projectId]/samples/[sampleId]/items/[itemId]/route");
const readingRoute = await import("@/app/api/v1/projects/[projectId]/samples/[sampleId]/items/[itemId]/reading/route");
const projectRoute = await import("@/app/api/v1/projects/[projectId]/route");

const ids: Record<string, string> = {};
const systems: Record<string, string> = {};
let library: string;
let clinic: string;
let ahuConditions: string;
let otherConditions: string;
const UNKNOWN = "00000000-0000-4000-8000-00000000beef";
const as = (email: string | null) => {
  session.userId = email === null ? undefined : ids[email];
};
const draw = (body: unknown, projectId = library) => callRoute(samplesRoute.POST, { method: "POST", params: { projectId }, body });
const getSample = (sampleId: string, projectId = library) => callRoute(sampleRoute.GET, { params: { projectId, sampleId } });
const read = (sampleId: string, itemId: string, body: unknown) => callRoute(readingRoute.PUT, { method: "PUT", params: { projectId: library, sampleId, itemId }, body });

beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  for (const u of await db.select().from(s.users)) ids[u.email] = u.id;
  for (const p of await db.select().from(s.projects)) {
    if (p.siteName === "Wrenfield Community Library") library = p.id;
    else clinic = p.id;
  }
  for (const sys of await db.select().from(s.airSystems).where(eq(s.airSystems.projectId, library))) systems[sys.tag] = sys.id;
  const latest = (await db.select().from(s.operatingConditions).where(eq(s.operatingConditions.systemId, systems["AHU-1"]!))).sort((a, b) => +b.recordedAt - +a.recordedAt)[0]!;
  // The demo's traverses name the latest conditions; the agent's readings under the same conditions compare.
  ahuConditions = latest.id;
  const [other] = await db
    .insert(s.operatingConditions)
    .values({ systemId: systems["AHU-1"]!, fanSpeedRpm: (latest.fanSpeedRpm ?? 1000) * 0.9, vfdHz: latest.vfdHz, boxes: latest.boxes, outsideAirDamperPct: latest.outsideAirDamperPct, ductStaticSetpointPa: latest.ductStaticSetpointPa, filterState: latest.filterState })
    .returning();
  otherConditions = other!.id;
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

describe("drawing a verification sample", () => {
  it("lets only commissioning agents draw; a system with nothing submitted is 409, an unknown one 400", async () => {
    for (const email of ["tech@example.test", "engineer@example.test", "owner@example.test", "admin@example.test"]) {
      as(email);
      expect((await callRoute(samplesRoute.POST, { method: "POST", params: { projectId: library }, rawBody: "{" })).status, email).toBe(403);
    }
    as("cx@example.test");
    expect((await draw({ systemId: systems["EF-1"] })).status).toBe(409);
    expect((await draw({ systemId: UNKNOWN })).body.error.fields.systemId).toMatch(/names no air system/);
    expect((await draw({ systemId: systems["AHU-1"], seed: -1 })).body.error.fields.seed).toMatch(/0 to 4294967295/);
  });

  it("draws by the project's rule from a stored seed, and the same seed gives the same items", async () => {
    as("cx@example.test");
    const a = await draw({ systemId: systems["AHU-1"], seed: 20261124 });
    expect(a.status).toBe(201);
    const sample = a.body.sample;
    // AHU-1: four sections with a submitted or approved traverse, no submitted or approved terminal set.
    expect(sample.populationCount).toBe(4);
    expect(sample.rule).toEqual({ samplePct: 10, minCount: 3, tolerancePct: 10, allowedFailures: 0 });
    expect(sample.items.length).toBe(3);
    expect(sample.seed).toBe(20261124);
    expect(sample.reproduced).toBe(true);
    const b = await draw({ systemId: systems["AHU-1"], seed: 20261124 });
    expect(b.body.sample.items.map((i: { tag: string }) => i.tag)).toEqual(sample.items.map((i: { tag: string }) => i.tag));
    const shown = await getSample(sample.id);
    expect(shown.body.sample.items.map((i: { tag: string }) => i.tag)).toEqual(sample.items.map((i: { tag: string }) => i.tag));
    // Members read samples; another project's id answers 404.
    as("owner@example.test");
    expect((await getSample(sample.id)).status).toBe(200);
    expect((await getSample(UNKNOWN)).status).toBe(404);
    as("engineer@example.test");
    expect((await getSample(sample.id, clinic)).status).toBe(404);
  });

  it("follows the project's settings: a larger minimum draws every section", async () => {
    as("engineer@example.test");
    const patched = await callRoute(projectRoute.PATCH, { method: "PATCH", params: { projectId: library }, body: { sampleMinCount: 10, sampleAllowedFailures: 1 } });
    expect(patched.status).toBe(200);
    expect((await callRoute(projectRoute.PATCH, { method: "PATCH", params: { projectId: library }, body: { sampleTolerancePct: 0 } })).body.error.fields.sampleTolerancePct).toMatch(/above 0/);
    as("cx@example.test");
    const res = await draw({ systemId: systems["AHU-1"] });
    expect(res.body.sample.items.length).toBe(4);
    expect(typeof res.body.sample.seed).toBe("number");
    as("engineer@example.test");
    await callRoute(projectRoute.PATCH, { method: "PATCH", params: { projectId: library }, body: { sampleMinCount: 3, sampleAllowedFailures: 0 } });
  });
});

describe("the agent's readings", () => {
  it("compares each with the technician's within the tolerance, names conditions that differ, and recommends returning the system", async () => {
    as("cx@example.test");
    const sample = (await draw({ systemId: systems["AHU-1"], seed: 7 })).body.sample;
    const [first, second, third] = sample.items as { id: string; tag: string; technician: { flowM3S: number } }[];
    as("tech@example.test");
    expect((await read(sample.id, first!.id, { method: "spot_traverse", standardFlowM3S: 1, conditionsId: ahuConditions })).status).toBe(403);
    as("cx@example.test");
    expect((await read(sample.id, first!.id, { method: "hood", standardFlowM3S: 1, conditionsId: ahuConditions })).body.error.fields.method).toMatch(/spot_traverse/);
    expect((await read(sample.id, first!.id, { method: "spot_traverse", conditionsId: ahuConditions })).body.error.fields.standardFlowM3S).toBeDefined();
    expect((await read(sample.id, UNKNOWN, { method: "spot_traverse", standardFlowM3S: 1, conditionsId: ahuConditions })).status).toBe(404);

    // 5 % above the technician's: agrees.
    const agree = await read(sample.id, first!.id, { method: "spot_traverse", standardFlowM3S: first!.technician.flowM3S * 1.05, conditionsId: ahuConditions });
    expect(agree.status).toBe(200);
    expect(agree.body.item).toMatchObject({ agrees: true, differencePct: expect.closeTo(5, 6), conditionsDiffer: [] });
    expect(agree.body.outcome).toMatchObject({ agreed: 1, disagreed: 0, recommendReturn: false });

    // Under other operating conditions: kept, not judged, and the answer says how they differ.
    const differ = await read(sample.id, second!.id, { method: "spot_traverse", standardFlowM3S: second!.technician.flowM3S, conditionsId: otherConditions });
    expect(differ.body.item.agrees).toBeNull();
    expect(differ.body.warnings.join(" ")).toMatch(/Fan speed/);

    // 15 % low: disagrees, and with none allowed the app recommends returning the whole system.
    const low = await read(sample.id, third!.id, { method: "spot_traverse", standardFlowM3S: third!.technician.flowM3S * 0.85, conditionsId: ahuConditions });
    expect(low.body.item).toMatchObject({ agrees: false, differencePct: expect.closeTo(-15, 6) });
    expect(low.body.outcome.recommendReturn).toBe(true);
    expect(low.body.sample.recommendReturn).toBe(true);
    expect(low.body.outcome.message).toMatch(/return the whole system/);
    const db = await getDb();
    const [row] = await db.select().from(s.verificationSamples).where(eq(s.verificationSamples.id, sample.id));
    expect(row).toMatchObject({ agreedCount: 1, disagreedCount: 1, recommendReturn: true });
  });

  it("marks an item witnessed, and records it", async () => {
    as("cx@example.test");
    const sample = (await draw({ systemId: systems["AHU-1"], seed: 99 })).body.sample;
    const res = await callRoute(itemRoute.PATCH, { method: "PATCH", params: { projectId: library, sampleId: sample.id, itemId: sample.items[0].id }, body: { witnessed: true } });
    expect(res.status).toBe(200);
    expect(res.body.sample.items[0].witnessed).toBe(true);
    const db = await getDb();
    const entries = await db.select().from(s.auditLog).where(eq(s.auditLog.action, "sample.witnessed"));
    expect(entries.length).toBe(1);
  });
});

describe("the demo's review story", () => {
  it("holds a drawn sample of the approved branches with the agent's readings, reproduced from its seed", async () => {
    as("owner@example.test");
    const res = await callRoute(samplesRoute.GET, { path: `/api/v1/projects/${library}/samples?systemId=${systems["AHU-1"]}`, params: { projectId: library } });
    const demo = res.body.samples.find((x: { seed: number }) => x.seed === 2026112401);
    expect(demo.items.map((i: { tag: string }) => i.tag)).toEqual(["S1.1", "S1.2"]);
    expect(demo.reproduced).toBe(true);
    expect(demo.items.every((i: { agrees: boolean; witnessed: boolean }) => i.agrees && i.witnessed)).toBe(true);
    expect(demo.outcome).toMatchObject({ agreed: 2, disagreed: 0, recommendReturn: false });
  });
});
