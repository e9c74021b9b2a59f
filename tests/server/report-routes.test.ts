import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { LocalObjectStore } from "@/lib/cli/local-object-store";
import { seedDemoReport } from "@/db/seed/report";
import { demoDatabase } from "../support/db";
import { useLocalObjectStore } from "../support/object-store";
import { callRoute } from "../support/route-call";

// The session is whoever the test says; everything after it (users, roles, database, object store) is real.
const session = vi.hoisted(() => ({ userId: undefined as string | undefined }));
vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), session));

const reports = await import("@/app/api/v1/projects/[projectId]/reports/route");
const draft = await import("@/app/api/v1/projects/[projectId]/reports/draft.pdf/route");
const readiness = await import("@/app/api/v1/projects/[projectId]/reports/readiness/route");
const approvals = await import("@/app/api/v1/projects/[projectId]/reports/approvals/route");

let store: LocalObjectStore;
let demo: Awaited<ReturnType<typeof demoDatabase>>;
const as = (user: { id: string } | null) => {
  session.userId = user?.id;
};

beforeAll(async () => {
  store = await useLocalObjectStore();
  demo = await demoDatabase();
  await seedDemoReport();
}, 120_000);
afterAll(async () => {
  await store.stop();
});

describe("the report routes", () => {
  it("give every member a draft PDF and the readiness in words", async () => {
    as(demo.owner);
    const pdf = await callRoute(draft.GET, { params: { projectId: demo.library.id } });
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    expect(pdf.text.slice(0, 5)).toBe("%PDF-");
    const ready = await callRoute(readiness.GET, { params: { projectId: demo.library.id } });
    expect(ready.status).toBe(200);
    expect(ready.body.readiness).toMatchObject({ ready: false, revision: 2, supervisor: { designated: true, signed: true } });
    expect(ready.body.readiness.blockers).toEqual([
      "The commissioning agent has not approved the report's content for revision 2 yet.",
      "The engineer of record has not approved the report's content for revision 2 yet.",
    ]);
  });

  it("let only the commissioning agent and the engineer approve, and name a bad field", async () => {
    as(demo.owner);
    expect((await callRoute(approvals.POST, { method: "POST", params: { projectId: demo.library.id }, json: {} })).status).toBe(403);
    as(demo.cx);
    const bad = await callRoute(approvals.POST, { method: "POST", params: { projectId: demo.library.id }, json: { comment: 5 } });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(["comment"]);
    const ok = await callRoute(approvals.POST, { method: "POST", params: { projectId: demo.library.id }, json: { comment: "Checked the draft." } });
    expect(ok.status).toBe(201);
    expect(ok.body.readiness.approvals[0]).toMatchObject({ role: "commissioning_agent", current: true, approval: { name: "Ines Karlsson", comment: "Checked the draft." } });
  });

  it("refuse an issue with 409 and the blockers, ask for the reason with 400, then issue with 201", async () => {
    as(demo.engineer);
    const early = await callRoute(reports.POST, { method: "POST", params: { projectId: demo.library.id }, json: { reason: "Early." } });
    expect(early.status).toBe(409);
    expect(early.body.blockers).toEqual(["The engineer of record has not approved the report's content for revision 2 yet."]);
    expect(early.body.error.message).toMatch(/cannot be issued yet/);
    expect((await callRoute(approvals.POST, { method: "POST", params: { projectId: demo.library.id }, json: {} })).status).toBe(201);
    const noReason = await callRoute(reports.POST, { method: "POST", params: { projectId: demo.library.id }, json: {} });
    expect(noReason.status).toBe(400);
    expect(Object.keys(noReason.body.error.fields)).toEqual(["reason"]);
    as(demo.owner);
    expect((await callRoute(reports.POST, { method: "POST", params: { projectId: demo.library.id }, json: { reason: "x" } })).status).toBe(403);
    as(demo.admin);
    const issued = await callRoute(reports.POST, { method: "POST", params: { projectId: demo.library.id }, json: { reason: "Reissued after the supply side review." } });
    expect(issued.status).toBe(201);
    expect(issued.body.report).toMatchObject({ revision: 2, reason: "Reissued after the supply side review.", superseded: false });
    const list = await callRoute(reports.GET, { params: { projectId: demo.library.id } });
    expect(list.body.reports.map((r: { revision: number; superseded: boolean }) => [r.revision, r.superseded])).toEqual([
      [2, false],
      [1, true],
    ]);
  });
});
