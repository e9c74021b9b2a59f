import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { OPERATIONS, openApiDocument } from "@/lib/openapi";

const apiRoot = path.join(import.meta.dirname, "../../app/api");

/** Every route file under app/api with the HTTP methods it exports, as OpenAPI paths. */
function routeMethods(): { path: string; method: string }[] {
  const out: { path: string; method: string }[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (entry.name === "route.ts") {
        const rel = path.relative(apiRoot, dir).split(path.sep);
        if (rel[0] === "[...path]") continue; // the JSON 404 for unknown paths
        const apiPath = "/api/" + rel.map((seg) => seg.replace(/^\[(\w+)\]$/, "{$1}")).join("/");
        const source = fs.readFileSync(full, "utf8");
        for (const m of source.matchAll(/export (?:const|async function|function) (GET|POST|PUT|PATCH|DELETE)\b/g)) out.push({ path: apiPath, method: m[1]!.toLowerCase() });
      }
    }
  };
  walk(apiRoot);
  return out;
}

/** Whether an operation path documents a route path ({command} routes are documented per command). */
function documents(opPath: string, routePath: string): boolean {
  const pattern = new RegExp("^" + routePath.replace(/\{\w+\}/g, "[^/]+").replace(/[.]/g, "\\.") + "$");
  return pattern.test(opPath);
}

describe("GET /api/v1/openapi.json", () => {
  it("documents every route the app serves, and nothing it does not", () => {
    const routes = routeMethods();
    expect(routes.length).toBeGreaterThan(5);
    for (const route of routes) {
      const documented = OPERATIONS.some((op) => op.method === route.method && documents(op.path, route.path));
      expect(documented, `${route.method.toUpperCase()} ${route.path} is not in lib/openapi`).toBe(true);
    }
    for (const op of OPERATIONS) {
      const served = routes.some((r) => r.method === op.method && documents(op.path, r.path));
      expect(served, `${op.method.toUpperCase()} ${op.path} is documented but not served`).toBe(true);
    }
  });

  it("is an OpenAPI 3.1 document whose request bodies come from the validation schemas", () => {
    const doc = openApiDocument();
    expect(doc.openapi).toBe("3.1.0");
    const calc = doc.paths["/api/v1/calc/traverse"]!.post as { requestBody: { content: { "application/json": { schema: { properties: Record<string, unknown>; required: string[] } } } } };
    const schema = calc.requestBody.content["application/json"].schema;
    expect(schema.required).toEqual(expect.arrayContaining(["duct", "method", "air", "readings"]));
    expect(Object.keys(schema.properties)).toEqual(expect.arrayContaining(["readings_kind", "standard_density_kg_m3"]));
    // Serialisable as JSON without loss (no functions or cycles).
    expect(JSON.parse(JSON.stringify(doc))).toEqual(doc);
  });
});
