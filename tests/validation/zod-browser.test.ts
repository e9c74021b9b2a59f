import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

/**
 * zod must be told not to probe eval before any schema is built in the browser (our CSP forbids
 * eval, and the probe is reported as a violation). No page-wide provider does that, so that pages
 * with no schema load no zod: every module that imports zod's values imports the setting first
 * (lib/validation/zod-browser.ts). A module that forgot would build its schemas unconfigured on
 * whichever page loads it first.
 */
const ROOT = path.resolve(import.meta.dirname, "../..");
const SETTING = /^import\s+"(?:\.\/zod-browser|@\/lib\/validation\/zod-browser)";$/m;
const ZOD_VALUES = /^import\s+(?!type\b)(?:\{[^}]*\}|\*\s+as\s+\w+|\w+)[^;]*from\s+"zod(?:\/[^"]*)?";$/gm;

function sources(dir: string): string[] {
  return fs.readdirSync(path.join(ROOT, dir), { withFileTypes: true }).flatMap((e) => {
    const rel = path.join(dir, e.name);
    if (e.isDirectory()) return sources(rel);
    return /\.tsx?$/.test(e.name) ? [rel] : [];
  });
}

describe("zod's browser setting", () => {
  const files = ["app", "components", "lib"].flatMap(sources).filter((f) => f !== path.join("lib", "validation", "zod-browser.ts"));
  const withZod = files.filter((f) => {
    const text = fs.readFileSync(path.join(ROOT, f), "utf8");
    return [...text.matchAll(ZOD_VALUES)].some((m) => !/^import\s+\{\s*(type\s+\w+\s*,?\s*)+\}/.test(m[0]));
  });

  it("finds the modules that build schemas", () => {
    expect(withZod).toContain(path.join("lib", "validation", "calc.ts"));
    expect(withZod).toContain(path.join("lib", "validation", "traverses.ts"));
  });

  it.each(withZod)("%s imports the setting before zod itself", (file) => {
    const text = fs.readFileSync(path.join(ROOT, file), "utf8");
    const setting = text.match(SETTING);
    expect(setting, `${file} builds zod schemas without importing lib/validation/zod-browser first`).not.toBeNull();
    const firstZod = [...text.matchAll(ZOD_VALUES)][0]!;
    expect(setting!.index!).toBeLessThan(firstZod.index!);
  });
});
