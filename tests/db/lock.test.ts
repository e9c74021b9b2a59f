import { spawn } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { acquireDataDirLock } from "@/db/client";

const dirs: string[] = [];
const tempDir = () => {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-lock-"));
  dirs.push(d);
  return d;
};
afterEach(() => {
  for (const d of dirs.splice(0)) fs.rmSync(d, { recursive: true, force: true });
});

describe("PGlite data directory lock", () => {
  it("refuses a directory held by another live process, naming it", async () => {
    const dir = tempDir();
    const other = spawn(process.execPath, ["-e", "setTimeout(() => {}, 30000)"]);
    try {
      fs.writeFileSync(path.join(dir, "airtally.lock"), String(other.pid));
      expect(() => acquireDataDirLock(dir)).toThrow(new RegExp(`in use by process ${other.pid}`));
    } finally {
      other.kill();
    }
  });

  it("takes over a lock left by a process that has ended, and releases its own", async () => {
    const dir = tempDir();
    const ended = spawn(process.execPath, ["-e", ""]);
    await new Promise((r) => ended.on("exit", r));
    fs.writeFileSync(path.join(dir, "airtally.lock"), String(ended.pid));
    const release = acquireDataDirLock(dir);
    expect(fs.readFileSync(path.join(dir, "airtally.lock"), "utf8")).toBe(String(process.pid));
    release();
    expect(fs.existsSync(path.join(dir, "airtally.lock"))).toBe(false);
  });
});
