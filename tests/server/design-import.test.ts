import { and, count, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDatabaseHandle, getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";
import { callRoute } from "../support/route-call";

const auth = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), auth));

const importRoute = await import("@/app/api/v1/projects/[projectId]/design/import/route");
const exportRoute = await import("@/app/api/v1/projects/[projectId]/design/export.csv/route");

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

async function counts(projectId: string) {
  const db = await getDb();
  const [sections] = await db
    .select({ n: count() })
    .from(s.ductSections)
    .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
    .where(eq(s.airSystems.projectId, projectId));
  const [terminals] = await db
    .select({ n: count() })
    .from(s.terminals)
    .innerJoin(s.ductSections, eq(s.ductSections.id, s.terminals.sectionId))
    .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
    .where(eq(s.airSystems.projectId, projectId));
  return { sections: sections!.n, terminals: terminals!.n };
}

const post = (projectId: string, text: string, mode?: string, contentType = "text/csv") =>
  callRoute(importRoute.POST, { method: "POST", path: `/api/v1/projects/${projectId}/design/import${mode ? `?mode=${mode}` : ""}`, params: { projectId }, text, contentType });

const HEADER = "record,system,tag,parent,terminal_type,shape,diameter_in,width_in,height_in,design_airflow_cfm,min_airflow_cfm";
const CLEAN = [HEADER, "section,EF-1,X1.3,X1,,round,10,,,300,", "terminal,EF-1,EG-221,X1.3,grille,rectangular,,12,12,150,", "terminal,EF-1,EG-222,X1.3,grille,rectangular,,12,12,150,"].join("\n");

describe("design schedule import and export over the API", () => {
  it("exports the clinic in whole inches and round cfm, and the file previews with nothing to change", async () => {
    as("engineer");
    const res = await callRoute(exportRoute.GET, { path: `/api/v1/projects/${clinic}/design/export.csv`, params: { projectId: clinic } });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(res.headers.get("content-disposition")).toContain("design-schedule.csv");
    const lines = res.text.replace(/^\uFEFF/, "").split("\r\n");
    expect(lines[0]).toContain("design_airflow_cfm");
    expect(lines).toContain("section,RTU-2,C1,,,,rectangular,,24,16,2400,,,,,10,3,\"Corridor ceiling, level 1, below the roof curb\",,");
    expect(lines).toContain("terminal,RTU-2,VAV-1,C1.1,vav_box,supply,round,10,,,700,210,350,,0.87,,,,Consulting rooms 1–4,\"Single-duct VAV box, hot-water reheat\"");
    const before = await counts(clinic);
    const preview = await post(clinic, res.text);
    expect(preview.status).toBe(200);
    expect(preview.body.preview).toMatchObject({ ok: true, counts: { add: 0, update: 0, unchanged: before.sections + before.terminals, withErrors: 0 } });
    const si = await callRoute(exportRoute.GET, { path: `/api/v1/projects/${clinic}/design/export.csv?units=SI`, params: { projectId: clinic } });
    expect(si.text).toContain("design_airflow_l_s");
    expect((await post(clinic, si.text, "commit")).body.applied).toEqual({ added: { sections: [], terminals: [] }, updated: { sections: [], terminals: [] } });
  });

  it("previews without saving, commits a clean file in one go, and audits the import", async () => {
    as("engineer");
    const before = await counts(library);
    const preview = await post(library, CLEAN);
    expect(preview.status).toBe(200);
    expect(preview.body.preview.rows.map((r: { tag: string; action: string }) => [r.tag, r.action])).toEqual([
      ["X1.3", "add"],
      ["EG-221", "add"],
      ["EG-222", "add"],
    ]);
    expect(await counts(library)).toEqual(before);
    const commit = await post(library, CLEAN, "commit");
    expect(commit.status).toBe(200);
    expect(commit.body.applied).toEqual({ added: { sections: ["X1.3"], terminals: ["EG-221", "EG-222"] }, updated: { sections: [], terminals: [] } });
    expect(await counts(library)).toEqual({ sections: before.sections + 1, terminals: before.terminals + 2 });
    const db = await getDb();
    const [grille] = await db.select().from(s.terminals).where(eq(s.terminals.tag, "EG-221"));
    // An exhaust system's terminals take its service when the file leaves it empty; 12 in. = 304.8 mm.
    expect(grille).toMatchObject({ type: "grille", service: "exhaust", sizeShape: "rectangular", widthMm: expect.closeTo(304.8, 9) });
    const [audit] = await db.select().from(s.auditLog).where(and(eq(s.auditLog.action, "design.imported"), eq(s.auditLog.projectId, library))).orderBy(desc(s.auditLog.id));
    expect(audit!.detail.after).toMatchObject({ added: { sections: ["X1.3"] }, rows: 3 });
  });

  it("saves nothing from a file with any error, and says how many rows are wrong", async () => {
    as("engineer");
    const before = await counts(library);
    const bad = [HEADER, "section,EF-1,X1.4,X1,,round,10,,,250,", "section,EF-1,X1.5,X1.9,,round,10,,,250,", "terminal,EF-1,EG-230,X1.4,grille,rectangular,,12,,100,"].join("\n");
    const res = await post(library, bad, "commit");
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe("2 of 3 rows have errors; nothing was saved. Fix them and upload the file again.");
    expect(res.body.preview.rows[1].errors).toEqual([{ column: "parent", message: "No section X1.9 in EF-1, in the file or the project." }]);
    expect(res.body.preview.rows[2].errors).toEqual([{ column: "height_in", message: "Enter the height of the rectangular neck." }]);
    expect(await counts(library)).toEqual(before);
  });

  it("updates what a re-imported file changes and moves a section to its new parent", async () => {
    as("engineer");
    const moved = [HEADER, "section,EF-1,X1.3,X1.2,,round,12,,,300,"].join("\n");
    const res = await post(library, moved, "commit");
    expect(res.status).toBe(200);
    expect(res.body.applied.updated.sections).toEqual(["X1.3"]);
    const db = await getDb();
    const [x13] = await db.select().from(s.ductSections).where(eq(s.ductSections.tag, "X1.3"));
    const [x12] = await db.select().from(s.ductSections).where(eq(s.ductSections.tag, "X1.2"));
    expect(x13).toMatchObject({ parentId: x12!.id, diameterMm: expect.closeTo(304.8, 9) });
  });

  it("refuses other roles before reading the file, and bounds the upload", async () => {
    for (const who of ["tech", "cx", "owner"]) {
      as(who);
      expect((await post(library, CLEAN, "commit")).status, who).toBe(403);
    }
    as(null);
    expect((await post(library, CLEAN)).status).toBe(401);
    as("tech");
    expect((await post(clinic, CLEAN)).status).toBe(404);
    // Every member may read the schedule, owners included (design against measured is in their report).
    expect((await callRoute(exportRoute.GET, { params: { projectId: library } })).status).toBe(200);
    as("owner");
    expect((await callRoute(exportRoute.GET, { params: { projectId: library } })).status).toBe(200);
    as("engineer");
    expect((await post(library, CLEAN, "apply")).body.error.fields).toHaveProperty("mode");
    expect((await post(library, CLEAN, undefined, "application/json")).status).toBe(415);
    expect((await post(library, "a".repeat(1_048_577))).status).toBe(413);
    const latin1 = await callRoute(importRoute.POST, { method: "POST", params: { projectId: library }, text: "record\n\xff", contentType: "text/csv" });
    expect([200, 400]).toContain(latin1.status);
    expect((await callRoute(exportRoute.GET, { path: "/x?units=metric", params: { projectId: library } })).status).toBe(400);
  });
});
