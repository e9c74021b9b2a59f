import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { MissingSecretError, resolveSessionSecret, SECRET_ENV } from "@/lib/auth/secret";

let dir: string;
beforeEach(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-secret-"));
  vi.stubEnv(SECRET_ENV, "");
  vi.stubEnv("AIRTALLY_DEMO", "");
});
afterEach(() => {
  vi.unstubAllEnvs();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("session secret", () => {
  it("refuses a production start without a secret and says how to set one", () => {
    vi.stubEnv("NODE_ENV", "production");
    expect(() => resolveSessionSecret(dir)).toThrow(MissingSecretError);
    expect(() => resolveSessionSecret(dir)).toThrow(/AIRTALLY_SESSION_SECRET.*openssl rand/s);
    expect(fs.existsSync(path.join(dir, "session-secret"))).toBe(false);
  });

  it("refuses a secret shorter than 32 characters", () => {
    vi.stubEnv(SECRET_ENV, "too-short");
    expect(() => resolveSessionSecret(dir)).toThrow(/only 9 characters/);
  });

  it("uses the environment's secret when given", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv(SECRET_ENV, "x".repeat(40));
    expect(resolveSessionSecret(dir)).toBe("x".repeat(40));
  });

  it("generates one secret for the demo, private to its owner, and keeps it across restarts", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("AIRTALLY_DEMO", "1");
    const first = resolveSessionSecret(dir);
    expect(first.length).toBeGreaterThanOrEqual(32);
    expect(fs.statSync(path.join(dir, "session-secret")).mode & 0o077).toBe(0);
    expect(resolveSessionSecret(dir)).toBe(first);
  });
});
