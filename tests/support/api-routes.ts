/** Every API route file under app/api, found on disk, with its URL pattern ("/api/v1/projects/[projectId]"). */
import fs from "node:fs";
import path from "node:path";

export const HTTP_METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"] as const;

const ROOT = path.resolve(import.meta.dirname, "../..");

export interface RouteFile {
  file: string;
  /** "/api/…" with the folder names as written; route groups "(x)" dropped. */
  pattern: string;
}

export function listApiRouteFiles(dir = path.join(ROOT, "app", "api")): RouteFile[] {
  const out: RouteFile[] = [];
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...listApiRouteFiles(full));
    else if (/^route\.(ts|tsx|js|mjs)$/.test(entry.name)) {
      const rel = path.relative(path.join(ROOT, "app"), path.dirname(full)).split(path.sep);
      out.push({ file: full, pattern: "/" + rel.filter((s) => !/^\(.*\)$/.test(s)).join("/") });
    }
  }
  return out.sort((a, b) => a.pattern.localeCompare(b.pattern));
}

/** Names of the dynamic segments of a pattern: [projectId] → projectId, [...path] → path. */
export function dynamicSegments(pattern: string): string[] {
  return [...pattern.matchAll(/\[(?:\.\.\.)?([^\]]+)\]/g)].map((m) => m[1]!);
}
