import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";

const ROOT = path.resolve(import.meta.dirname, "../..");

describe("npm start (lib/cli/serve.ts) outside demo mode", () => {
  it("refuses to start without AIRTALLY_SESSION_SECRET and says how to set it", () => {
    const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-serve-"));
    try {
      const env: NodeJS.ProcessEnv = { ...process.env, AIRTALLY_DATA_DIR: dataDir, PORT: "39999" };
      delete env.AIRTALLY_SESSION_SECRET;
      delete env.AIRTALLY_DEMO;
      const r = spawnSync(path.join(ROOT, "node_modules/.bin/tsx"), ["lib/cli/serve.ts"], { cwd: ROOT, env, encoding: "utf8", timeout: 60_000 });
      expect(r.status).toBe(1);
      expect(r.stderr).toContain("AIRTALLY_SESSION_SECRET is not set");
      expect(r.stderr).toContain('export AIRTALLY_SESSION_SECRET="$(openssl rand -base64 48)"');
      expect(fs.existsSync(path.join(dataDir, "session-secret"))).toBe(false);
    } finally {
      fs.rmSync(dataDir, { recursive: true, force: true });
    }
  });
});
