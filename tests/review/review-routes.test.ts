/**
 * The review cycle over the API: submission and decisions on traverses, terminal sets and whole
 * systems for every role; locks on readings; a re-traverse voiding an approval on every screen's query;
 * notifications in the same transaction; the audit route and the audit table's trigger.
 */
import { and, desc, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { listProjectsForUser } from "@/db/queries/projects";
import { getProjectDesign, listTraversesForProject } from "@/db/queries/airflow";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { callRoute } from "../support/route-call";

const session = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), session));

const traversesRoute = await import("@/app/api/v1/projects/[projectId]/traverses/route");
const oneTraverse = await import("@/app/api/v1/projects/[projectId]/traverses/[traverseId]/route");
const readingsRoute = await import("@/app/api/v1/projects/[projectId]/traverses/[traverseId]/readings/route");
const submitRoute = await import("@/app/api/v1/projects/[projectId]/traverses/[traverseId]/submit/route");
const reviewRoute = await import("@/app/api/v1/projects/[projectId]/traverses/[traverseId]/review/route");
const setSubmitRoute = await import("@/app/api/v1/projects/[projectId]/terminal-sets/[setId]/submit/route");
const setReviewRoute = await import("@/app/api/v1/projects/[projectId]/terminal-sets/[setId]/review/route");
const systemReviewRoute = await import("@/app/api/v1/projects/[projectId]/systems/[systemId]/review/route");
const terminalReadingsRoute = await import("@/app/api/v1/projects/[projectId]/terminals/[terminalId]/readings/route");
const queueRoute = await import("@/app/api/v1/projects/[projectId]/review-queue/route");
const auditRoute = await import("@/app/api/v1/projects/[projectId]/audit/route");
const { buildAirflowView } = await import("@/lib/server/airflow-view");
const { reviewQueue } = await import("@/lib/server/review-queue");
const { samplePopulation } = await import("@/lib/server/verification");

const ids: Record<string, string> = {};
const sections: Record<string, string> = {};
const systems: Record<string, string> = {};
const terminals: Record<string, string> = {};
const instrumentIds: Record<string, string> = {};
let library: string;
let clinic: string;
let efConditions: string;
let ahuConditions: string;
let hood: string;
const UNKNOWN = "00000000-0000-4000-8000-00000000beef";
const ROLES = ["tech@example.test", "cx@example.test", "engineer@example.test", "owner@example.test", "admin@example.test"] as const;
const as = (email: string | null) => {
  session.userId = email === null ? undefined : ids[email];
};

beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  for (const u of await db.select().from(s.users)) ids[u.email] = u.id;
  for (const p of await db.select().from(s.projects)) {
    if (p.siteName === "Wrenfield Community Library") library = p.id;
    else clinic = p.id;
  }
  for (const sys of await db.select().from(s.airSystems).where(eq(s.airSystems.projectId, library))) systems[sys.tag] = sys.id;
  for (const sec of await db.select({ id: s.ductSections.id, tag: s.ductSections.tag }).from(s.ductSections).innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId)).where(eq(s.airSystems.projectId, library)))
    sections[sec.tag] = sec.id;
  for (const t of await db
    .select({ id: s.terminals.id, tag: s.terminals.tag })
    .from(s.terminals)
    .innerJoin(s.ductSections, eq(s.ductSections.id, s.terminals.sectionId))
    .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
    .where(eq(s.airSystems.projectId, library)))
    terminals[t.tag] = t.id;
  for (const i of await db.select().from(s.instruments)) instrumentIds[i.serial] = i.id;
  const cond = await db.select().from(s.operatingConditions);
  efConditions = cond.find((c) => c.systemId === systems["EF-1"])!.id;
  ahuConditions = cond.filter((c) => c.systemId === systems["AHU-1"]).sort((a, b) => +b.recordedAt - +a.recordedAt)[0]!.id;
  // Instruments in calibration for as long as these tests may run.
  const made = await db
    .insert(s.instruments)
    .values([
      { kind: "capture_hood", serial: "R-HOOD", calibrationDueOn: "2099-01-01", rangeMin: 0.012, rangeMax: 0.94, hoodCorrectionFactor: 1 },
      { kind: "manometer", serial: "R-MANO", calibrationDueOn: "2099-01-01", rangeMin: -3700, rangeMax: 3700 },
      { kind: "pitot_tube", serial: "R-PITOT", calibrationDueOn: "2099-01-01" },
      { kind: "thermo_hygrometer", serial: "R-TH", calibrationDueOn: "2099-01-01" },
    ])
    .returning();
  hood = made[0]!.id;
  instrumentIds["R-MANO"] = made[1]!.id;
  instrumentIds["R-PITOT"] = made[2]!.id;
  instrumentIds["R-TH"] = made[3]!.id;
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

const air = { dryBulbC: 21.5, relativeHumidityPct: 42, staticPa: -180 };
const instrument = () => ({ readingInstrumentId: instrumentIds["R-MANO"], probeInstrumentId: instrumentIds["R-PITOT"], airInstrumentId: instrumentIds["R-TH"] });
/** Exhaust velocity pressures (Pa) across Ø 450 mm, 2 diameters × 8 log-linear points: invented. */
const X1_GRID = [
  [18.2, 26.4, 29.8, 33.1, 33.6, 30.2, 27.0, 19.1],
  [17.5, 25.9, 30.4, 32.7, 34.0, 29.6, 26.1, 18.4],
];
const start = (sectionTag: string) =>
  callRoute(traversesRoute.POST, { method: "POST", params: { projectId: library }, body: { sectionId: sections[sectionTag], method: "log-linear", lines: 2, pointsPerLine: 8, air, instrument: instrument(), conditionsId: sectionTag.startsWith("X") ? efConditions : ahuConditions } });
const get = (traverseId: string) => callRoute(oneTraverse.GET, { params: { projectId: library, traverseId } });
const put = (traverseId: string, body: unknown) => callRoute(readingsRoute.PUT, { method: "PUT", params: { projectId: library, traverseId }, body });
const patch = (traverseId: string, body: unknown) => callRoute(oneTraverse.PATCH, { method: "PATCH", params: { projectId: library, traverseId }, body });
const submit = (traverseId: string, projectId = library, body: unknown = {}) => callRoute(submitRoute.POST, { method: "POST", params: { projectId, traverseId }, body });
const review = (traverseId: string, body: unknown, projectId = library) => callRoute(reviewRoute.POST, { method: "POST", params: { projectId, traverseId }, body });
const submitSet = (setId: string, projectId = library) => callRoute(setSubmitRoute.POST, { method: "POST", params: { projectId, setId }, body: {} });
const reviewSet = (setId: string, body: unknown, projectId = library) => callRoute(setReviewRoute.POST, { method: "POST", params: { projectId, setId }, body });
const reviewSystem = (systemId: string, body: unknown) => callRoute(systemReviewRoute.POST, { method: "POST", params: { projectId: library, systemId }, body });
const hoodReading = (tag: string, flow = 0.125) =>
  callRoute(terminalReadingsRoute.POST, {
    method: "POST",
    params: { projectId: library, terminalId: terminals[tag]! },
    body: { phase: "initial", method: "hood", hoodFlowM3S: flow, hoodDensityCorrected: true, hoodBackPressureCompensated: true, dryBulbC: 18, relativeHumidityPct: 40, conditionsId: tag.startsWith("EG") ? efConditions : ahuConditions, instrumentId: hood },
  });
const audit = (query = "", projectId = library) => callRoute(auditRoute.GET, { path: `/api/v1/projects/${projectId}/audit${query}`, params: { projectId } });

async function noticesFor(email: string) {
  const db = await getDb();
  return db.select().from(s.notifications).where(eq(s.notifications.userId, ids[email]!)).orderBy(desc(s.notifications.createdAt));
}

/** The four places that say whether a section is approved, from their own queries. */
async function approvalEverywhere(sectionTag: string) {
  const project = (await (await getDb()).select().from(s.projects).where(eq(s.projects.id, library)))[0]!;
  const [list] = (await listProjectsForUser({ userId: ids["cx@example.test"]!, isAdmin: false })).filter((p) => p.id === library);
  const view = buildAirflowView(project, await getProjectDesign({ projectId: library }), await listTraversesForProject({ projectId: library }));
  const section = view.flatMap((v) => v.sections).find((x) => x.section.tag === sectionTag)!;
  const queue = await reviewQueue(project);
  const queued = queue.items.find((i) => i.type === "traverse" && i.tag === sectionTag);
  const population = await samplePopulation(project, view.find((v) => v.sections.includes(section))!.system);
  return {
    approvedSections: list!.approvedSectionCount,
    screenStatus: section.latest?.status ?? null,
    queueStatus: queued?.status ?? null,
    inSamplePopulation: population.population.some((p) => p.tag === sectionTag),
  };
}

describe("traverse submission and review", () => {
  let id: string;

  it("lets only technicians submit (403 for every other role before the body is read, 401 signed out); another project's id is 404", async () => {
    as("tech@example.test");
    const res = await start("X1");
    expect(res.status).toBe(201);
    id = res.body.traverse.id;
    for (const email of ROLES.filter((r) => r !== "tech@example.test")) {
      as(email);
      expect((await callRoute(submitRoute.POST, { method: "POST", params: { projectId: library, traverseId: id }, rawBody: "{" })).status, email).toBe(403);
    }
    as(null);
    expect((await submit(id)).status).toBe(401);
    as("tech@example.test");
    expect((await submit(UNKNOWN)).status).toBe(404);
    expect((await submit("not-a-uuid")).status).toBe(404);
    // The traverse exists, but in the library: asked through the clinic, the technician (not a member there) gets the project's 404.
    expect((await submit(id, clinic)).status).toBe(404);
  });

  it("refuses an incomplete traverse with 400 naming the fields, and changes nothing", async () => {
    as("tech@example.test");
    const half = X1_GRID.map((row, k) => row.map((v, i) => (k === 1 && i > 3 ? null : v)));
    const saved = await put(id, { version: 1, readings: half });
    expect(saved.status).toBe(200);
    const res = await submit(id);
    expect(res.status).toBe(400);
    expect(res.body.error.fields.readings).toMatch(/4 of 16 points are neither read nor marked unreadable \(line 2 point 5/);
    expect((await get(id)).body.traverse.status).toBe("draft");
  });

  it("submits a complete draft (200, status submitted), tells the commissioning agent, and locks the readings", async () => {
    as("tech@example.test");
    const full = await put(id, { version: 2, readings: X1_GRID });
    expect(full.status).toBe(200);
    const before = await noticesFor("cx@example.test");
    const res = await submit(id, library, { notes: "Read from the roof curb ports." });
    expect(res.status).toBe(200);
    expect(res.body.traverse.status).toBe("submitted");
    const after = await noticesFor("cx@example.test");
    expect(after.length).toBe(before.length + 1);
    expect(after[0]!.kind).toBe("traverse.submitted");
    expect(after[0]!.message).toContain("EF-1 / X1");
    // Locked while submitted: readings and every other change answer 409, nothing changes.
    const locked = await put(id, { version: 3, readings: X1_GRID.map((r) => r.map((v) => v + 1)) });
    expect(locked.status).toBe(409);
    expect((await patch(id, { version: 3, notes: "changed" })).status).toBe(409);
    expect((await get(id)).body.traverse.readings).toEqual(X1_GRID);
    // Submitting twice is a conflict.
    expect((await submit(id)).status).toBe(409);
  });

  it("lets only commissioning agents decide; a return needs a comment (400 naming comment)", async () => {
    for (const email of ROLES.filter((r) => r !== "cx@example.test")) {
      as(email);
      expect((await review(id, { decision: "approve" })).status, email).toBe(403);
    }
    as("cx@example.test");
    const bare = await review(id, { decision: "return" });
    expect(bare.status).toBe(400);
    expect(Object.keys(bare.body.error.fields)).toEqual(["comment"]);
    expect((await review(id, { decision: "return", comment: "   " })).body.error.fields.comment).toMatch(/required when returning/);
    expect((await review(id, { decision: "maybe" })).body.error.fields.decision).toMatch(/"approve", "return"/);
    expect((await review(UNKNOWN, { decision: "approve" })).status).toBe(404);
  });

  it("returns with the comment to the technician; a returned traverse is editable and can be resubmitted", async () => {
    as("cx@example.test");
    const res = await review(id, { decision: "return", comment: "Line 2 point 8 reads low against line 1: re-read it." });
    expect(res.status).toBe(200);
    expect(res.body.traverse.status).toBe("returned");
    const db = await getDb();
    const [row] = await db.select().from(s.reviews).where(eq(s.reviews.traverseId, id));
    expect(row).toMatchObject({ decision: "returned", reason: "Line 2 point 8 reads low against line 1: re-read it.", traverseVersion: res.body.traverse.version, reviewerId: ids["cx@example.test"] });
    const [notice] = await noticesFor("tech@example.test");
    expect(notice!.kind).toBe("traverse.returned");
    expect(notice!.message).toContain("re-read it");
    // A decision on a traverse that is no longer submitted is a conflict.
    expect((await review(id, { decision: "approve" })).status).toBe(409);

    as("tech@example.test");
    const version = res.body.traverse.version;
    const grid = X1_GRID.map((r) => [...r]);
    grid[1]![7] = 18.9;
    expect((await put(id, { version, readings: grid })).status).toBe(200);
    const again = await submit(id);
    expect(again.status).toBe(200);
    expect(again.body.traverse.status).toBe("submitted");
  });

  it("approves: the engineer and owner are told, and PUT readings answers 409 saying to re-traverse, nothing changed", async () => {
    as("cx@example.test");
    const res = await review(id, { decision: "approve", comment: "Witnessed line 2.", witnessed: true });
    expect(res.status).toBe(200);
    expect(res.body.traverse.status).toBe("approved");
    expect((await noticesFor("engineer@example.test"))[0]!.kind).toBe("traverse.approved");
    expect((await noticesFor("owner@example.test"))[0]!.kind).toBe("traverse.approved");
    const db = await getDb();
    const decisions = await db.select().from(s.reviews).where(eq(s.reviews.traverseId, id)).orderBy(s.reviews.createdAt);
    expect(decisions.map((d) => d.decision)).toEqual(["returned", "approved"]);
    expect(decisions[1]!.witnessed).toBe(true);

    as("tech@example.test");
    const current = (await get(id)).body.traverse;
    const locked = await put(id, { version: current.version, readings: X1_GRID });
    expect(locked.status).toBe(409);
    expect(locked.body.error.message).toMatch(/re-traverse/i);
    expect((await get(id)).body.traverse.readings).toEqual(current.readings);
    expect((await get(id)).body.traverse.version).toBe(current.version);
    expect((await submit(id)).status).toBe(409);
  });

  it("a re-traverse voids the approval on the project list, the screens, the review queue and the sample population alike, until it is approved", async () => {
    const before = await approvalEverywhere("S1.1");
    expect(before).toEqual({ approvedSections: expect.any(Number), screenStatus: "approved", queueStatus: "approved", inSamplePopulation: true });
    as("tech@example.test");
    const res = await start("S1.1");
    expect(res.status).toBe(201);
    expect(res.body.traverse.revision).toBe(2);
    const after = await approvalEverywhere("S1.1");
    expect(after.approvedSections).toBe(before.approvedSections - 1);
    expect(after.screenStatus).toBe("draft");
    expect(after.queueStatus).toBeNull();
    expect(after.inSamplePopulation).toBe(false);
    // Read, submitted and approved, the new revision makes the section approved again everywhere.
    const retraverse = res.body.traverse.id;
    expect((await put(retraverse, { version: 1, readings: X1_GRID })).status).toBe(200);
    expect((await submit(retraverse)).status).toBe(200);
    expect((await approvalEverywhere("S1.1")).queueStatus).toBe("submitted");
    as("cx@example.test");
    expect((await review(retraverse, { decision: "approve" })).status).toBe(200);
    expect(await approvalEverywhere("S1.1")).toEqual(before);
    // The re-traverse is in the audit trail.
    as("cx@example.test");
    const events = (await audit("?kind=field")).body.events;
    expect(events.some((e: { action: string }) => e.action === "traverse.retraversed")).toBe(true);
  });
});

describe("terminal sets", () => {
  let setId: string;

  it("refuses a set with outlets not read (400 naming terminals), then submits once every outlet is read", async () => {
    const db = await getDb();
    const [open] = await db.select().from(s.terminalSets).where(and(eq(s.terminalSets.systemId, systems["EF-1"]!), eq(s.terminalSets.status, "draft")));
    setId = open!.id;
    as("engineer@example.test");
    expect((await submitSet(setId)).status).toBe(403);
    as("tech@example.test");
    expect((await submitSet(UNKNOWN)).status).toBe(404);
    const refused = await submitSet(setId);
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.terminals).toMatch(/EG-211, EG-212/);
    expect((await hoodReading("EG-211", 0.19)).status).toBe(201);
    expect((await hoodReading("EG-212", 0.21)).status).toBe(201);
    const res = await submitSet(setId);
    expect(res.status).toBe(200);
    expect(res.body.terminalSet.status).toBe("submitted");
  });

  it("locks the system's terminal readings while submitted (409, nothing recorded)", async () => {
    const db = await getDb();
    const [{ n: before }] = (await db.select({ n: sql<number>`count(*)::int` }).from(s.terminalReadings)) as [{ n: number }];
    as("tech@example.test");
    const res = await hoodReading("EG-201");
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/submitted for review and locked/);
    const [{ n: after }] = (await db.select({ n: sql<number>`count(*)::int` }).from(s.terminalReadings)) as [{ n: number }];
    expect(after).toBe(before);
  });

  it("reviews with the traverse's rules, then new readings open the next set", async () => {
    as("tech@example.test");
    expect((await reviewSet(setId, { decision: "approve" })).status).toBe(403);
    as("cx@example.test");
    expect((await reviewSet(setId, { decision: "return" })).body.error.fields.comment).toBeDefined();
    const res = await reviewSet(setId, { decision: "approve" });
    expect(res.status).toBe(200);
    expect(res.body.terminalSet.status).toBe("approved");
    expect((await reviewSet(setId, { decision: "approve" })).status).toBe(409);
    const db = await getDb();
    const [decision] = await db.select().from(s.reviews).where(eq(s.reviews.terminalSetId, setId));
    expect(decision).toMatchObject({ decision: "approved", traverseId: null, traverseVersion: res.body.terminalSet.version });
    as("tech@example.test");
    const reading = await hoodReading("EG-201", 0.13);
    expect(reading.status).toBe(201);
    const [next] = await db.select().from(s.terminalSets).where(eq(s.terminalSets.id, reading.body.reading.setId));
    expect(next).toMatchObject({ status: "draft", revision: 2 });
  });
});

describe("a whole system at once", () => {
  it("approves or returns every submitted item of a system in one action, a comment required on return", async () => {
    as("tech@example.test");
    expect((await reviewSystem(systems["AHU-1"]!, { decision: "return", comment: "x".repeat(10) })).status).toBe(403);
    as("cx@example.test");
    expect((await reviewSystem(systems["AHU-1"]!, { decision: "return" })).body.error.fields.comment).toBeDefined();
    expect((await reviewSystem(UNKNOWN, { decision: "approve" })).status).toBe(404);
    const res = await reviewSystem(systems["AHU-1"]!, { decision: "return", comment: "Static set point differs from the design conditions: re-read under design conditions." });
    expect(res.status).toBe(200);
    expect(res.body.traverses.map((t: { sectionTag: string }) => t.sectionTag).sort()).toEqual(["S1", "S1.3"]);
    const db = await getDb();
    const decisions = await db.select().from(s.reviews).where(eq(s.reviews.systemWide, true));
    expect(decisions.length).toBe(2);
    expect(decisions.every((d) => d.decision === "returned")).toBe(true);
    // Nothing left submitted: a second system-wide action is a conflict.
    expect((await reviewSystem(systems["AHU-1"]!, { decision: "approve" })).status).toBe(409);
  });

  it("lists the queue with counts per status, each item's numbers and its last decision", async () => {
    as("owner@example.test");
    const res = await callRoute(queueRoute.GET, { params: { projectId: library } });
    expect(res.status).toBe(200);
    const s1 = res.body.items.find((i: { tag: string }) => i.tag === "S1");
    expect(s1.status).toBe("returned");
    expect(s1.lastReview.comment).toMatch(/design conditions/);
    expect(s1.uncertaintyShown).toMatch(/^± \d+\.\d % \(k = 2, about 95 %\)$/);
    expect(res.body.counts.returned).toBeGreaterThanOrEqual(2);
    expect(res.body.counts.submitted + res.body.counts.returned + res.body.counts.approved).toBe(res.body.items.length);
  });
});

describe("GET …/audit", () => {
  it("answers commissioning agents, engineers and site administrators; technicians and owners get 403", async () => {
    for (const email of ["cx@example.test", "engineer@example.test", "admin@example.test"]) {
      as(email);
      expect((await audit()).status, email).toBe(200);
    }
    for (const email of ["tech@example.test", "owner@example.test"]) {
      as(email);
      expect((await audit()).status, email).toBe(403);
    }
    as(null);
    expect((await audit()).status).toBe(401);
  });

  it("lists newest first, with who, what, when and before/after, every submission and decision with its comment", async () => {
    as("cx@example.test");
    const res = await audit("?limit=200");
    expect(res.status).toBe(200);
    const events = res.body.events as { id: number; at: string; action: string; who: { email: string; name: string }; before: unknown; after: unknown; detail: Record<string, unknown>; summary: string }[];
    for (let i = 1; i < events.length; i++) expect(events[i - 1]!.id).toBeGreaterThan(events[i]!.id);
    const actions = events.map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(["traverse.submitted", "traverse.returned", "traverse.resubmitted", "traverse.approved", "terminal_set.submitted", "terminal_set.approved", "system.returned", "terminal.reading_recorded", "traverse.readings_saved"]));
    const returned = events.find((e) => e.action === "traverse.returned" && e.detail.sectionTag === "X1")!;
    expect(returned.who).toEqual({ userId: ids["cx@example.test"], name: "Ines Karlsson", email: "cx@example.test" });
    expect(returned.before).toEqual({ status: "submitted" });
    expect(returned.after).toEqual({ status: "returned" });
    expect(returned.summary).toMatch(/Returned the traverse of EF-1 \/ X1 revision 1: “Line 2 point 8/);
  });

  it("pages with before and limit (at most 200), filters by kind, and refuses bad bounds with 400", async () => {
    as("engineer@example.test");
    const first = await audit("?limit=3");
    expect(first.body.events.length).toBe(3);
    const next = await audit(`?limit=3&before=${first.body.nextBefore}`);
    expect(next.body.events[0].id).toBeLessThan(first.body.events[2].id);
    expect((await audit("?limit=201")).body.error.fields.limit).toMatch(/at most 200/);
    expect((await audit("?limit=0")).status).toBe(400);
    expect((await audit("?before=abc")).status).toBe(400);
    expect((await audit("?kind=nonsense")).status).toBe(400);
    expect((await audit("?sneaky=1")).status).toBe(400);
    const review = await audit("?kind=review&limit=200");
    expect(review.body.events.every((e: { kind: string }) => e.kind === "review")).toBe(true);
    // Another project's audit is not the caller's to read (the engineer belongs to the clinic: its own events only).
    const clinicEvents = await audit("?limit=200", clinic);
    expect(clinicEvents.body.events.some((e: { action: string }) => e.action === "traverse.approved")).toBe(false);
  });

  it("only grows: the database refuses UPDATE and DELETE on the audit table", async () => {
    const db = await getDb();
    await expect(db.execute(sql`update audit_log set action = 'rewritten' where project_id = ${library}`)).rejects.toThrow();
    await expect(db.execute(sql`delete from audit_log where project_id = ${library}`)).rejects.toThrow();
  });
});
