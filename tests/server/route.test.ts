import { NextRequest } from "next/server";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { z } from "zod";
import type { ProjectAccess } from "@/db/queries/projects";
import type { SessionUser } from "@/db/queries/users";

// The session and the database stand in for a signed-in caller; the wrapper's own logic is real.
const auth = vi.hoisted(() => ({ user: null as SessionUser | null, access: null as ProjectAccess | null }));
const audited = vi.hoisted(() => [] as unknown[]);
vi.mock("@/lib/auth/guards", async (original) => ({
  ...(await original<typeof import("@/lib/auth/guards")>()),
  currentUser: async () => auth.user,
  currentUserWithProject: async () => (auth.user ? { user: auth.user, access: auth.access } : null),
}));
vi.mock("@/db/queries/audit", async (original) => ({
  ...(await original<typeof import("@/db/queries/audit")>()),
  recordAuditQuietly: async (entry: unknown) => void audited.push(entry),
}));

const { defineRoute, routeDeclaration } = await import("@/lib/server/route");

const USER: SessionUser = { id: "u1", email: "tech@example.test", name: "T", isAdmin: false, unitSystem: null, sessionVersion: 1 };
const PROJECT = { id: "p1" } as ProjectAccess["project"];

const handler = vi.fn(async () => Response.json({ ok: true }));
const route = defineRoute({ project: { param: "projectId", action: "traverse.record" }, body: z.object({ n: z.number().max(10) }) }, handler);
const call = (init: { body?: BodyInit; headers?: Record<string, string>; method?: string } = {}) => {
  const req = new NextRequest("http://app.test/api/v1/projects/p1/x", { method: init.method ?? "POST", body: init.body, headers: { host: "app.test", ...init.headers }, duplex: "half" } as never);
  return { req, res: route(req, { params: Promise.resolve({ projectId: "p1" }) }) };
};
const json = { "content-type": "application/json" };

beforeEach(() => {
  auth.user = USER;
  auth.access = { project: PROJECT, role: "technician" };
  handler.mockClear();
  audited.length = 0;
});

describe("defineRoute", () => {
  it("declares its rule on the handler", () => {
    expect(routeDeclaration(route)).toEqual({ scope: "project", param: "projectId", action: "traverse.record" });
    expect(routeDeclaration(async () => new Response())).toBeNull();
    // The first calling shape still compiles and requires a session; the route test flags it as undeclared.
    expect(routeDeclaration(defineRoute({}, async () => new Response()))).toEqual({ scope: "signed-in", declared: false });
  });

  it("answers 401 to a caller without a session", async () => {
    auth.user = null;
    expect((await call({ body: "{}", headers: json }).res).status).toBe(401);
  });

  it("checks the role before reading the body: a forbidden or hidden caller's body is never read", async () => {
    auth.access = { project: PROJECT, role: "owner" };
    const forbidden = call({ body: "{ not json", headers: json });
    expect((await forbidden.res).status).toBe(403);
    expect(forbidden.req.bodyUsed).toBe(false);

    auth.access = null;
    const hidden = call({ body: "x".repeat(5_000_000), headers: json });
    const res = await hidden.res;
    expect(res.status).toBe(404);
    expect(await res.json()).toEqual({ error: { message: "No such project, or you are not a member of it." } });
    expect(hidden.req.bodyUsed).toBe(false);
    // Another project's existence is not revealed either: a member of none of its roles gets the same 404.
    auth.access = { project: PROJECT, role: null };
    expect((await call({ body: "{}", headers: json }).res).status).toBe(404);
    expect(handler).not.toHaveBeenCalled();
    expect(audited).toHaveLength(3);
    expect(audited[0]).toMatchObject({ action: "request.denied", userId: "u1", actorEmail: "tech@example.test", detail: { status: 403 } });
  });

  it("refuses a state-changing request from another site, and records it", async () => {
    const { res } = call({ body: '{"n":1}', headers: { ...json, origin: "https://evil.example" } });
    expect((await res).status).toBe(403);
    expect(audited[0]).toMatchObject({ detail: { reason: "foreign origin https://evil.example" } });
    expect((await call({ body: '{"n":1}', headers: { ...json, origin: "http://app.test" } }).res).status).toBe(200);
  });

  it("requires JSON (415), caps the body by its declared length and while streaming (413), then validates (400)", async () => {
    expect((await call({ body: '{"n":1}', headers: { "content-type": "text/plain" } }).res).status).toBe(415);
    expect((await call({ body: "{}", headers: { ...json, "content-length": String(2 * 1024 * 1024) } }).res).status).toBe(413);
    const chunks = new ReadableStream<Uint8Array>({
      start(c) {
        for (let i = 0; i < 20; i++) c.enqueue(new Uint8Array(100_000));
        c.close();
      },
    });
    expect((await call({ body: chunks, headers: json }).res).status).toBe(413);
    const bad = await call({ body: '{"n":99}', headers: json }).res;
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.fields).toHaveProperty("n");
    expect((await call({ body: "{ nope", headers: json }).res).status).toBe(400);
    expect(handler).not.toHaveBeenCalled();
  });

  it("acts for an allowed caller and marks the answer not to be stored", async () => {
    const res = await call({ body: '{"n":3}', headers: { ...json, "content-type": "application/json; charset=utf-8" } }).res;
    expect(res.status).toBe(200);
    expect(res.headers.get("cache-control")).toBe("no-store");
    expect(handler).toHaveBeenCalledOnce();
  });

  it("keeps the body cap per route", async () => {
    const small = defineRoute({ outsideProject: "public", body: z.object({}).passthrough(), maxBodyBytes: 100 }, async () => Response.json({}));
    const req = new NextRequest("http://app.test/api/x", { method: "POST", body: JSON.stringify({ pad: "x".repeat(200) }), headers: json });
    const res = await small(req, { params: Promise.resolve({}) });
    expect(res.status).toBe(413);
    expect((await res.json()).error.message).toContain("larger than this endpoint accepts");
  });
});
