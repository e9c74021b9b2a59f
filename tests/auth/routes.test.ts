import { describe, expect, it } from "vitest";
import { ACTIONS, ROUTES_OUTSIDE_PROJECTS } from "@/lib/auth/policy";
import { routeDeclaration } from "@/lib/server/route";
import { ENDPOINTS } from "../../e2e/support/endpoints";
import { dynamicSegments, HTTP_METHODS, listApiRouteFiles } from "../support/api-routes";

// Walks app/api on disk, so a route added later is checked without anyone editing this file.
const files = listApiRouteFiles();

describe("every API route declares its rule", () => {
  it("finds the route files", () => {
    expect(files.map((f) => f.pattern)).toContain("/api/v1/projects/[projectId]");
    expect(files.length).toBeGreaterThanOrEqual(10);
  });

  it("builds every handler with defineRoute, and declares a project action or is listed outside projects", async () => {
    const problems: string[] = [];
    const seen = new Set<string>();
    for (const { file, pattern } of files) {
      const mod = (await import(/* @vite-ignore */ file)) as Record<string, unknown>;
      const methods = HTTP_METHODS.filter((m) => m in mod);
      if (methods.length === 0) problems.push(`${pattern}: exports no HTTP method`);
      for (const method of methods) {
        const key = `${method} ${pattern}`;
        seen.add(key);
        const d = routeDeclaration(mod[method]);
        if (!d) {
          problems.push(`${key}: not built with defineRoute (lib/server/route.ts)`);
          continue;
        }
        if (d.scope === "project") {
          if (!dynamicSegments(pattern).includes(d.param)) problems.push(`${key}: project param "${d.param}" is not a segment of the path`);
          if (!(ACTIONS as readonly string[]).includes(d.action)) problems.push(`${key}: action "${d.action}" is not in the policy`);
          if (key in ROUTES_OUTSIDE_PROJECTS) problems.push(`${key}: declares a project but is listed in ROUTES_OUTSIDE_PROJECTS`);
        } else {
          if (d.scope === "signed-in" && !d.declared) problems.push(`${key}: declares neither \`project: { param, action }\` nor \`outsideProject\` in defineRoute`);
          if (dynamicSegments(pattern).includes("projectId")) problems.push(`${key}: has [projectId] in its path but declares no project action`);
          const listed = ROUTES_OUTSIDE_PROJECTS[key];
          if (!listed) problems.push(`${key}: declares no project action and is not listed in ROUTES_OUTSIDE_PROJECTS (lib/auth/policy.ts)`);
          else if (listed !== d.scope) problems.push(`${key}: listed as ${listed} but declared ${d.scope}`);
        }
      }
    }
    for (const key of Object.keys(ROUTES_OUTSIDE_PROJECTS)) if (!seen.has(key)) problems.push(`${key}: listed in ROUTES_OUTSIDE_PROJECTS but no such route exists`);
    expect(problems).toEqual([]);
  });

  it("has a row in the authorization matrix (e2e/support/endpoints.ts) for every route and method, with the route's own declaration", async () => {
    const problems: string[] = [];
    for (const { file, pattern } of files) {
      const mod = (await import(/* @vite-ignore */ file)) as Record<string, unknown>;
      for (const method of HTTP_METHODS.filter((m) => m in mod)) {
        const d = routeDeclaration(mod[method]);
        const rows = ENDPOINTS.filter((e) => e.method === method && e.route === pattern);
        if (rows.length === 0) problems.push(`${method} ${pattern}: no row in e2e/support/endpoints.ts`);
        for (const row of rows) {
          const declared = d?.scope === "project" ? { action: d.action } : d ? { outsideProject: d.scope } : null;
          if (JSON.stringify(declared) !== JSON.stringify(row.rule)) problems.push(`${method} ${pattern}: the matrix says ${JSON.stringify(row.rule)}, the route ${JSON.stringify(declared)}`);
        }
      }
    }
    const known = new Set(files.map((f) => f.pattern));
    for (const row of ENDPOINTS) if (!known.has(row.route)) problems.push(`${row.method} ${row.route}: in the matrix but no such route`);
    expect(problems).toEqual([]);
  });
});
