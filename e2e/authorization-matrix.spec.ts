import { expect, test, type APIRequestContext, type APIResponse } from "@playwright/test";
import { can, type Actor } from "../lib/auth/policy";
import type { MemberRole } from "../db/schema";
import { DEMO_PASSWORD } from "./pages/sign-in-page";
import { ENDPOINTS, type Endpoint } from "./support/endpoints";

/**
 * Every endpoint (e2e/support/endpoints.ts) called as every role, as a site administrator, as a
 * member of another project, and signed out, against the project itself, another project and a
 * project that does not exist. The expected answer comes from the policy table: the test and the
 * server read the same rules, and the server must keep to them.
 */
const LIBRARY = "Wrenfield Library — air balance";
const CLINIC = "Marlow Quay Clinic — fit-out";
const UNKNOWN_PROJECT = "00000000-0000-4000-8000-000000000000";

interface Caller {
  name: string;
  email: string | null;
  actor: Actor;
  /** Role per project name; absent → not a member. */
  roles: Partial<Record<string, MemberRole>>;
}

const CALLERS: Caller[] = [
  { name: "signed out", email: null, actor: { isAdmin: false }, roles: {} },
  { name: "technician", email: "tech@example.test", actor: { isAdmin: false }, roles: { [LIBRARY]: "technician" } },
  { name: "commissioning agent", email: "cx@example.test", actor: { isAdmin: false }, roles: { [LIBRARY]: "commissioning_agent" } },
  { name: "engineer", email: "engineer@example.test", actor: { isAdmin: false }, roles: { [LIBRARY]: "engineer", [CLINIC]: "engineer" } },
  { name: "owner", email: "owner@example.test", actor: { isAdmin: false }, roles: { [LIBRARY]: "owner" } },
  { name: "site administrator", email: "admin@example.test", actor: { isAdmin: true }, roles: {} },
];

/** The status the policy says this caller gets, and the 404 body when the project must stay hidden. */
function expected(row: Endpoint, caller: Caller, project: string | null): number {
  if ("outsideProject" in row.rule) {
    if (row.rule.outsideProject === "public") return row.ok;
    if (!caller.email) return 401;
    if (row.only && !(row.only.admins && caller.actor.isAdmin) && !Object.values(caller.roles).some((r) => r && row.only!.rolesAnywhere.includes(r))) return 403;
    return row.ok;
  }
  if (!caller.email) return 401;
  if (project === null) return 404;
  const role = caller.roles[project] ?? null;
  if (!can(caller.actor, role, "project.view")) return 404;
  if (!can(caller.actor, role, row.rule.action)) return 403;
  return project === CLINIC && row.okOnSecondProject !== undefined ? row.okOnSecondProject : row.ok;
}

async function call(api: APIRequestContext, row: Endpoint, path: string, headers: Record<string, string> = {}): Promise<APIResponse> {
  // A fresh unknown e-mail per sign-in call, so the matrix never trips the sign-in throttle.
  const body = typeof row.body === "function" ? (row.body as () => unknown)() : row.body;
  return api.fetch(path, { method: row.method, data: body, headers: body === undefined ? headers : { "content-type": "application/json", ...headers } });
}

test("every endpoint answers every caller as the policy says, and never reveals another project", async ({ playwright, baseURL }) => {
  test.setTimeout(120_000);
  // Project ids, from the one account that belongs to both.
  const probe = await playwright.request.newContext({ baseURL });
  expect((await probe.post("/api/auth/sign-in", { data: { email: "engineer@example.test", password: DEMO_PASSWORD } })).status()).toBe(204);
  const { projects } = (await (await probe.get("/api/v1/projects")).json()) as { projects: { id: string; name: string }[] };
  await probe.dispose();
  const ids: Record<string, string> = Object.fromEntries(projects.map((p) => [p.name, p.id]));
  const targets: { label: string; project: string | null; id: string }[] = [
    { label: "its project", project: LIBRARY, id: ids[LIBRARY]! },
    { label: "another project", project: CLINIC, id: ids[CLINIC]! },
    { label: "no project", project: null, id: UNKNOWN_PROJECT },
  ];

  const failures: string[] = [];
  for (const caller of CALLERS) {
    const api = await playwright.request.newContext({ baseURL });
    if (caller.email) expect((await api.post("/api/auth/sign-in", { data: { email: caller.email, password: DEMO_PASSWORD } })).status()).toBe(204);
    for (const row of ENDPOINTS) {
      const perProject = row.path.includes("{projectId}");
      for (const target of perProject ? targets : [targets[0]!]) {
        const path = row.path.replace("{projectId}", target.id);
        const label = `${caller.name} ${row.method} ${row.route}${perProject ? ` on ${target.label}` : ""}`;
        const want = expected(row, caller, perProject ? target.project : LIBRARY);
        // Calls that would end the caller's session, or change the demo whatever they are sent, are
        // checked only where they must be refused.
        if ((row.endsSessions || row.changesDemo) && want === row.ok) continue;
        const res = await call(api, row, path);
        if (res.status() !== want) failures.push(`${label}: ${res.status()}, expected ${want}`);
        if (res.headers()["cache-control"] !== "no-store") failures.push(`${label}: Cache-Control ${res.headers()["cache-control"]}`);
        if (res.status() >= 400) {
          const body = await res.json();
          if (typeof body?.error?.message !== "string") failures.push(`${label}: no error body`);
          // A hidden project answers exactly like one that does not exist (a row whose own answer is 404,
          // an unknown child id in a visible project, names the child instead).
          const projectHidden = perProject && (target.project === null || !can(caller.actor, caller.roles[target.project] ?? null, "project.view"));
          if (res.status() === 404 && projectHidden) expect(body).toEqual({ error: { message: "No such project, or you are not a member of it." } });
        }
        // From another site, every state-changing call is refused before anything else happens.
        if (row.method !== "GET" && caller.email && want !== 401) {
          const foreign = await call(api, row, path, { origin: "https://evil.example" });
          if (foreign.status() !== 403) failures.push(`${label} from another origin: ${foreign.status()}, expected 403`);
        }
      }
    }
    await api.dispose();
  }
  expect(failures).toEqual([]);
});
