import { and, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { callRoute } from "../support/route-call";

// The signed-in user is whoever the test says; everything after the session is the real code.
const auth = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), auth));

const projects = await import("@/app/api/v1/projects/route");
const project = await import("@/app/api/v1/projects/[projectId]/route");
const systems = await import("@/app/api/v1/projects/[projectId]/systems/route");
const system = await import("@/app/api/v1/projects/[projectId]/systems/[systemId]/route");
const sections = await import("@/app/api/v1/projects/[projectId]/sections/route");
const section = await import("@/app/api/v1/projects/[projectId]/sections/[sectionId]/route");
const terminals = await import("@/app/api/v1/projects/[projectId]/terminals/route");
const terminal = await import("@/app/api/v1/projects/[projectId]/terminals/[terminalId]/route");

let users: Record<string, string>;
let library: string;
let clinic: string;
const as = (who: string | null) => {
  auth.userId = who === null ? undefined : users[who];
};

beforeAll(async () => {
  const db = await getDb();
  await seedDemo(db);
  const rows = await db.select({ id: s.users.id, email: s.users.email }).from(s.users);
  users = Object.fromEntries(rows.map((r) => [r.email.split("@")[0]!, r.id]));
  const ps = await db.select().from(s.projects);
  library = ps.find((p) => p.siteName === "Wrenfield Community Library")!.id;
  clinic = ps.find((p) => p.siteName === "Marlow Quay Clinic")!.id;
});
afterAll(async () => {
  await (await getDatabaseHandle()).close();
});

async function lastAudit(action: string) {
  const db = await getDb();
  const [row] = await db.select().from(s.auditLog).where(eq(s.auditLog.action, action)).orderBy(desc(s.auditLog.id)).limit(1);
  return row;
}
async function sectionByTag(projectId: string, tag: string) {
  const db = await getDb();
  const [row] = await db
    .select({ section: s.ductSections })
    .from(s.ductSections)
    .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
    .where(and(eq(s.airSystems.projectId, projectId), eq(s.ductSections.tag, tag)));
  return row!.section;
}
async function systemByTag(projectId: string, tag: string) {
  const db = await getDb();
  const [row] = await db.select().from(s.airSystems).where(and(eq(s.airSystems.projectId, projectId), eq(s.airSystems.tag, tag)));
  return row!;
}

const NEW_PROJECT = { name: "Harbour Lofts — air balance", siteName: "Harbour Lofts", unitSystem: "IP" };

describe("POST /api/v1/projects", () => {
  it("answers 401 signed out and 403 to users who are not an engineer anywhere, before reading the body", async () => {
    as(null);
    expect((await callRoute(projects.POST, { method: "POST", json: NEW_PROJECT })).status).toBe(401);
    for (const who of ["owner", "tech", "cx"]) {
      as(who);
      const res = await callRoute(projects.POST, { method: "POST", text: "not json at all", contentType: "application/json" });
      expect(res.status, who).toBe(403);
      expect(res.body.error.message).toContain("site administrators and project engineers");
    }
  });

  it("lets an engineer start a project, makes them its engineer and records it", async () => {
    as("engineer");
    const res = await callRoute(projects.POST, { method: "POST", json: NEW_PROJECT });
    expect(res.status).toBe(201);
    expect(res.body.project).toMatchObject({ name: NEW_PROJECT.name, unitSystem: "IP", altitudeM: 0, outletToleranceMinusPct: 10 });
    // 0.075 lb/ft³ × 16.018 463 kg/m³ per lb/ft³ (NIST SP 811 B.8) = 1.201 385 kg/m³: US standard air when none is given.
    expect(res.body.project.standardDensityKgM3).toBeCloseTo(1.201385, 6);
    const db = await getDb();
    const [member] = await db.select().from(s.projectMembers).where(eq(s.projectMembers.projectId, res.body.project.id));
    expect(member).toMatchObject({ userId: users.engineer, role: "engineer" });
    const audit = await lastAudit("project.created");
    expect(audit).toMatchObject({ userId: users.engineer, projectId: res.body.project.id });
    expect((audit!.detail.after as { name: string }).name).toBe(NEW_PROJECT.name);
  });

  it("lets a site administrator start a project", async () => {
    as("admin");
    const res = await callRoute(projects.POST, { method: "POST", json: { ...NEW_PROJECT, name: "Admin's project", unitSystem: "SI" } });
    expect(res.status).toBe(201);
    expect(res.body.project.standardDensityKgM3).toBe(1.204);
  });

  it("names each bad field with what is allowed", async () => {
    as("engineer");
    const res = await callRoute(projects.POST, { method: "POST", json: { name: "X", unitSystem: "US", standardDensityKgM3: 7, color: "red" } });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(["siteName", "unitSystem", "standardDensityKgM3"]));
    expect(res.body.error.fields.standardDensityKgM3).toBe("Standard air density must be at least 1 kg/m³ and at most 1.4 kg/m³; 7 kg/m³ was entered.");
    expect(res.body.error.fields.unitSystem).toContain('"US" is not');
  });
});

describe("PATCH /api/v1/projects/{projectId}", () => {
  it("changes settings for the engineer and records before and after", async () => {
    as("engineer");
    const res = await callRoute(project.PATCH, { method: "PATCH", params: { projectId: library }, json: { outletToleranceMinusPct: 5, outletTolerancePlusPct: 10, address: "14 Aldous Lane" } });
    expect(res.status).toBe(200);
    expect(res.body.project).toMatchObject({ outletToleranceMinusPct: 5, outletTolerancePlusPct: 10 });
    const audit = await lastAudit("project.updated");
    expect(audit!.detail).toEqual({
      // Only what changed: the plus band was already 10 %.
      before: { address: "14 Aldous Lane, Wrenfield", outletToleranceMinusPct: 10 },
      after: { address: "14 Aldous Lane", outletToleranceMinusPct: 5 },
    });
  });

  it("refuses other roles (403), hides other projects (404) and names bad fields (400)", async () => {
    for (const who of ["tech", "cx", "owner"]) {
      as(who);
      expect((await callRoute(project.PATCH, { method: "PATCH", params: { projectId: library }, json: { address: "x" } })).status, who).toBe(403);
    }
    as("tech");
    expect((await callRoute(project.PATCH, { method: "PATCH", params: { projectId: clinic }, json: { address: "x" } })).status).toBe(404);
    expect((await callRoute(project.PATCH, { method: "PATCH", params: { projectId: "not-a-uuid" }, json: { address: "x" } })).status).toBe(404);
    as("admin");
    expect((await callRoute(project.PATCH, { method: "PATCH", params: { projectId: clinic }, json: { siteName: "Marlow Quay Clinic" } })).status).toBe(200);
    as("engineer");
    const bad = await callRoute(project.PATCH, { method: "PATCH", params: { projectId: library }, json: { fanTolerancePlusPct: 140 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.fanTolerancePlusPct).toBe("Fan tolerance above design must be 0 to 100 %; 140 % was entered.");
  });

  it("answers GET with terminals described by kind", async () => {
    as("tech");
    const res = await callRoute(project.GET, { params: { projectId: library } });
    expect(res.status).toBe(200);
    expect(res.body.terminals[0]).toHaveProperty("kind");
    expect(res.body.terminals[0]).not.toHaveProperty("type");
  });
});

describe("air systems", () => {
  it("creates a system with its fan and motor data, refusing a duplicate tag", async () => {
    as("engineer");
    const body = { tag: "RF-1", name: "Return fan", kind: "return", designFlowM3S: 3.6, fanSpeedRpm: 900, motorPowerKw: 4, motorPhases: 3, hasVfd: true };
    const res = await callRoute(systems.POST, { method: "POST", params: { projectId: library }, json: body });
    expect(res.status).toBe(201);
    expect(res.body.system).toMatchObject({ tag: "RF-1", projectId: library, hasVfd: true, motorPhases: 3 });
    expect((await lastAudit("system.created"))!.entityId).toBe(res.body.system.id);
    const again = await callRoute(systems.POST, { method: "POST", params: { projectId: library }, json: { ...body, tag: "rf-1" } });
    expect(again.status).toBe(409);
    expect(again.body.error.fields.tag).toContain("RF-1 is already used");
  });

  it("names a bad motor field and an outside airflow above the design", async () => {
    as("engineer");
    const res = await callRoute(systems.POST, {
      method: "POST",
      params: { projectId: library },
      json: { tag: "AHU-9", name: "x", kind: "supply", designFlowM3S: 1, designOutsideAirM3S: 2, motorPhases: 2 },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.motorPhases).toBe("Motor phases must be 1 or 3; 2 was entered.");
    const merged = await callRoute(systems.POST, { method: "POST", params: { projectId: library }, json: { tag: "AHU-9", name: "x", kind: "supply", designFlowM3S: 1, designOutsideAirM3S: 2 } });
    expect(merged.body.error.fields.designOutsideAirM3S).toContain("cannot exceed the design airflow");
  });

  it("edits a system; another project's system id answers 404 like an unknown one", async () => {
    as("engineer");
    const ahu = await systemByTag(library, "AHU-1");
    const rtu = await systemByTag(clinic, "RTU-2");
    const ok = await callRoute(system.PATCH, { method: "PATCH", params: { projectId: library, systemId: ahu.id }, json: { fanSpeedRpm: 1160 } });
    expect(ok.status).toBe(200);
    expect((await lastAudit("system.updated"))!.detail).toEqual({ before: { fanSpeedRpm: 1150 }, after: { fanSpeedRpm: 1160 } });
    const foreign = await callRoute(system.PATCH, { method: "PATCH", params: { projectId: library, systemId: rtu.id }, json: { fanSpeedRpm: 1 } });
    const unknown = await callRoute(system.PATCH, { method: "PATCH", params: { projectId: library, systemId: "00000000-0000-4000-8000-000000000000" }, json: { fanSpeedRpm: 1 } });
    expect(foreign.status).toBe(404);
    expect(foreign.body).toEqual(unknown.body);
    as("tech");
    expect((await callRoute(system.PATCH, { method: "PATCH", params: { projectId: library, systemId: ahu.id }, json: { fanSpeedRpm: 1 } })).status).toBe(403);
  });

  it("refuses to delete a system that holds traverses (409, saying what), and deletes an empty one", async () => {
    as("engineer");
    const ahu = await systemByTag(library, "AHU-1");
    const held = await callRoute(system.DELETE, { method: "DELETE", params: { projectId: library, systemId: ahu.id } });
    expect(held.status).toBe(409);
    expect(held.body.error.message).toContain("4 traverses (on S1, S1.1, S1.2, S1.3)");
    expect(held.body.held.traverses).toBe(4);
    expect(await systemByTag(library, "AHU-1")).toBeDefined();
    const rf = await systemByTag(library, "RF-1");
    const gone = await callRoute(system.DELETE, { method: "DELETE", params: { projectId: library, systemId: rf.id } });
    expect(gone.status).toBe(200);
    expect(gone.body.deleted.systems).toEqual(["RF-1"]);
    expect((await lastAudit("system.deleted"))!.detail.before).toMatchObject({ tag: "RF-1" });
  });
});

describe("duct sections", () => {
  it("adds a trunk and a branch, deriving trunk and branch from the parent", async () => {
    as("engineer");
    const ef = await systemByTag(library, "EF-1");
    const trunk = await callRoute(sections.POST, { method: "POST", params: { projectId: library }, json: { systemId: ef.id, tag: "X2", shape: "rectangular", widthMm: 400, heightMm: 300, designFlowM3S: 0.3 } });
    expect(trunk.status).toBe(201);
    expect(trunk.body.section).toMatchObject({ kind: "trunk", parentId: null, diameterMm: null });
    const branch = await callRoute(sections.POST, {
      method: "POST",
      params: { projectId: library },
      json: { systemId: ef.id, parentId: trunk.body.section.id, tag: "X2.1", shape: "round", diameterMm: 250, designFlowM3S: 0.15, straightUpstreamMm: 2000 },
    });
    expect(branch.status).toBe(201);
    expect(branch.body.section.kind).toBe("branch");
    const sub = await callRoute(sections.POST, {
      method: "POST",
      params: { projectId: library },
      json: { systemId: ef.id, parentId: branch.body.section.id, tag: "X2.1.1", shape: "round", diameterMm: 200, designFlowM3S: 0.1 },
    });
    expect(sub.status).toBe(201);
    expect((await lastAudit("section.created"))!.detail.after).toMatchObject({ tag: "X2.1.1" });
  });

  it("names missing and wrong sizes, and refuses parents from another system (400) or project (404)", async () => {
    as("engineer");
    const ef = await systemByTag(library, "EF-1");
    const bad = await callRoute(sections.POST, { method: "POST", params: { projectId: library }, json: { systemId: ef.id, tag: "X3", shape: "rectangular", widthMm: 400, designFlowM3S: 0 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toMatchObject({ heightMm: "Enter the height of the rectangular duct.", designFlowM3S: "Design airflow must be more than 0 m³/s and at most 200 m³/s; 0 m³/s was entered." });
    const s1 = await sectionByTag(library, "S1");
    const other = await callRoute(sections.POST, { method: "POST", params: { projectId: library }, json: { systemId: ef.id, parentId: s1.id, tag: "X3", shape: "round", diameterMm: 200, designFlowM3S: 0.1 } });
    expect(other.status).toBe(400);
    expect(other.body.error.fields.parentId).toBe("S1 belongs to AHU-1, not EF-1.");
    const c1 = await sectionByTag(clinic, "C1");
    const foreign = await callRoute(sections.POST, { method: "POST", params: { projectId: library }, json: { systemId: ef.id, parentId: c1.id, tag: "X3", shape: "round", diameterMm: 200, designFlowM3S: 0.1 } });
    expect(foreign.status).toBe(404);
    expect(foreign.body.error.fields).toHaveProperty("parentId");
    const rtu = await systemByTag(clinic, "RTU-2");
    const foreignSystem = await callRoute(sections.POST, { method: "POST", params: { projectId: library }, json: { systemId: rtu.id, tag: "X3", shape: "round", diameterMm: 200, designFlowM3S: 0.1 } });
    expect(foreignSystem.status).toBe(404);
    expect(foreignSystem.body.error.fields).toHaveProperty("systemId");
  });

  it("moves a section under another parent but never below its own branches", async () => {
    as("engineer");
    const x2 = await sectionByTag(library, "X2");
    const x211 = await sectionByTag(library, "X2.1.1");
    const loop = await callRoute(section.PATCH, { method: "PATCH", params: { projectId: library, sectionId: x2.id }, json: { parentId: x211.id } });
    expect(loop.status).toBe(400);
    expect(loop.body.error.fields.parentId).toBe("X2.1.1 is downstream of X2 (X2 → X2.1 → X2.1.1); a section cannot sit below its own branches.");
    const self = await callRoute(section.PATCH, { method: "PATCH", params: { projectId: library, sectionId: x2.id }, json: { parentId: x2.id } });
    expect(self.status).toBe(400);
    // Moving X2.1.1 up to X2 is fine, and X2 becomes a branch when it is put under X1.
    expect((await callRoute(section.PATCH, { method: "PATCH", params: { projectId: library, sectionId: x211.id }, json: { parentId: x2.id } })).status).toBe(200);
    const x1 = await sectionByTag(library, "X1");
    const moved = await callRoute(section.PATCH, { method: "PATCH", params: { projectId: library, sectionId: x2.id }, json: { parentId: x1.id } });
    expect(moved.status).toBe(200);
    expect(moved.body.section).toMatchObject({ parentId: x1.id, kind: "branch" });
    expect((await lastAudit("section.updated"))!.detail).toEqual({ before: { parentId: null, kind: "trunk" }, after: { parentId: x1.id, kind: "branch" } });
  });

  it("clears the old shape's dimensions when the shape changes", async () => {
    as("engineer");
    const x2 = await sectionByTag(library, "X2");
    const res = await callRoute(section.PATCH, { method: "PATCH", params: { projectId: library, sectionId: x2.id }, json: { shape: "round", diameterMm: 355 } });
    expect(res.status).toBe(200);
    expect(res.body.section).toMatchObject({ shape: "round", diameterMm: 355, widthMm: null, heightMm: null });
    const half = await callRoute(section.PATCH, { method: "PATCH", params: { projectId: library, sectionId: x2.id }, json: { shape: "rectangular", widthMm: 300 } });
    expect(half.status).toBe(400);
    expect(half.body.error.fields.heightMm).toBe("Enter the height of the rectangular duct.");
  });

  it("refuses to delete a section whose subtree holds traverses, and deletes a clean subtree with its terminals", async () => {
    as("engineer");
    const s11 = await sectionByTag(library, "S1.1");
    const held = await callRoute(section.DELETE, { method: "DELETE", params: { projectId: library, sectionId: s11.id } });
    expect(held.status).toBe(409);
    expect(held.body.error.message).toMatch(/^Section S1\.1 cannot be deleted: it holds field data \(1 traverse \(on S1\.1\)\)/);
    const s1 = await sectionByTag(library, "S1");
    const trunk = await callRoute(section.DELETE, { method: "DELETE", params: { projectId: library, sectionId: s1.id } });
    expect(trunk.status).toBe(409);
    expect(trunk.body.error.message).toContain("or the 3 sections below it");

    const x2 = await sectionByTag(library, "X2");
    const gone = await callRoute(section.DELETE, { method: "DELETE", params: { projectId: library, sectionId: x2.id } });
    expect(gone.status).toBe(200);
    expect(gone.body.deleted.sections.sort()).toEqual(["X2", "X2.1", "X2.1.1"]);
    expect((await lastAudit("section.deleted"))!.detail.before).toMatchObject({ tag: "X2", sectionsBelow: expect.arrayContaining(["X2.1", "X2.1.1"]) });
    as("owner");
    expect((await callRoute(section.DELETE, { method: "DELETE", params: { projectId: library, sectionId: s11.id } })).status).toBe(403);
  });
});

describe("terminals", () => {
  it("lists terminals for every member and filters by section", async () => {
    const s13 = await sectionByTag(library, "S1.3");
    as("tech");
    const res = await callRoute(terminals.GET, { path: `/api/v1/projects/${library}/terminals?sectionId=${s13.id}`, params: { projectId: library } });
    expect(res.status).toBe(200);
    expect(res.body.terminals.map((t: { tag: string }) => t.tag)).toEqual(["SD-121", "SD-122", "SD-123", "SD-124"]);
    expect(res.body.terminals[0].kind).toBe("diffuser");
    const bad = await callRoute(terminals.GET, { path: `/api/v1/projects/${library}/terminals?sectionId=nope`, params: { projectId: library } });
    expect(bad.status).toBe(400);
    as("owner");
    expect((await callRoute(terminals.GET, { params: { projectId: library } })).status).toBe(200);
    as(null);
    expect((await callRoute(terminals.GET, { params: { projectId: library } })).status).toBe(401);
  });

  it("adds a VAV box with its setpoints and refuses a minimum above the maximum", async () => {
    as("engineer");
    const s13 = await sectionByTag(library, "S1.3");
    const body = { sectionId: s13.id, tag: "VAV-13", kind: "vav_box", sizeShape: "round", diameterMm: 250, designFlowM3S: 0.3, designMinFlowM3S: 0.09, designHeatingFlowM3S: 0.15, controllerFlowFactor: 0.9 };
    const res = await callRoute(terminals.POST, { method: "POST", params: { projectId: library }, json: body });
    expect(res.status).toBe(201);
    expect(res.body.terminal).toMatchObject({ kind: "vav_box", service: "supply", designMinFlowM3S: 0.09 });
    const bad = await callRoute(terminals.POST, { method: "POST", params: { projectId: library }, json: { ...body, tag: "VAV-14", designMinFlowM3S: 0.4, effectiveAreaM2: 0.1 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.designMinFlowM3S).toBe("The minimum (0.4 m³/s) cannot exceed the design maximum (0.3 m³/s).");
    expect(bad.body.error.fields.effectiveAreaM2).toContain("not a terminal unit");
    const dup = await callRoute(terminals.POST, { method: "POST", params: { projectId: library }, json: { ...body, tag: "SD-101" } });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.tag).toContain("SD-101 is already used in AHU-1");
  });

  it("turns a VAV box into a diffuser, dropping the fields that no longer apply, and audits the change", async () => {
    as("engineer");
    const listed = await callRoute(terminals.GET, { params: { projectId: library } });
    const vav = listed.body.terminals.find((t: { tag: string }) => t.tag === "VAV-13");
    const res = await callRoute(terminal.PATCH, { method: "PATCH", params: { projectId: library, terminalId: vav.id }, json: { kind: "diffuser", effectiveAreaM2: 0.05 } });
    expect(res.status).toBe(200);
    expect(res.body.terminal).toMatchObject({ kind: "diffuser", designMinFlowM3S: null, designHeatingFlowM3S: null, controllerFlowFactor: null, effectiveAreaM2: 0.05 });
    const audit = await lastAudit("terminal.updated");
    expect(audit!.detail.before).toMatchObject({ kind: "vav_box", designMinFlowM3S: 0.09 });
    expect(audit!.detail.after).toMatchObject({ kind: "diffuser", designMinFlowM3S: null });
    const rtuTerminal = (await callRoute(terminals.GET, { params: { projectId: library } })).body.terminals[0];
    as("admin");
    const clinicTerminals = (await callRoute(terminals.GET, { params: { projectId: clinic } })).body.terminals;
    as("engineer");
    // A terminal of another project answers 404, and so does moving one onto another project's section.
    expect((await callRoute(terminal.PATCH, { method: "PATCH", params: { projectId: library, terminalId: clinicTerminals[0].id }, json: { room: "x" } })).status).toBe(404);
    const c1 = await sectionByTag(clinic, "C1");
    expect((await callRoute(terminal.PATCH, { method: "PATCH", params: { projectId: library, terminalId: rtuTerminal.id }, json: { sectionId: c1.id } })).status).toBe(404);
  });

  it("refuses to delete a terminal with readings (409) and deletes one without", async () => {
    as("engineer");
    const db = await getDb();
    const listed = (await callRoute(terminals.GET, { params: { projectId: library } })).body.terminals;
    const read = listed.find((t: { tag: string }) => t.tag === "SD-101");
    const ahu = await systemByTag(library, "AHU-1");
    const [set] = await db.insert(s.terminalSets).values({ systemId: ahu.id }).returning();
    await db.insert(s.terminalReadings).values({ terminalId: read.id, setId: set!.id, phase: "initial", method: "hood", hoodFlowM3S: 0.36, flowM3S: 0.36, standardFlowM3S: 0.36 });
    const held = await callRoute(terminal.DELETE, { method: "DELETE", params: { projectId: library, terminalId: read.id } });
    expect(held.status).toBe(409);
    expect(held.body.error.message).toContain("1 terminal reading (of SD-101)");
    const [still] = await db.select().from(s.terminalReadings).where(eq(s.terminalReadings.terminalId, read.id));
    expect(still).toBeDefined();
    // The system now holds a set of terminal readings as well.
    const sys = await callRoute(system.DELETE, { method: "DELETE", params: { projectId: library, systemId: ahu.id } });
    expect(sys.body.error.message).toContain("1 set of terminal readings");

    const plain = listed.find((t: { tag: string }) => t.tag === "VAV-13");
    const gone = await callRoute(terminal.DELETE, { method: "DELETE", params: { projectId: library, terminalId: plain.id } });
    expect(gone.status).toBe(200);
    expect(gone.body.deleted.terminals).toEqual(["VAV-13"]);
    expect((await lastAudit("terminal.deleted"))!.detail.before).toMatchObject({ tag: "VAV-13", kind: "diffuser" });
    as("cx");
    expect((await callRoute(terminal.DELETE, { method: "DELETE", params: { projectId: library, terminalId: read.id } })).status).toBe(403);
  });
});
