import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it, vi } from "vitest";
import { bootId, DataDirLockedError, FLOCK_FILE, LOCK_DIR_ENV, LOCK_FD_ENV, LOCK_RECORD, lockDataDir, type LockRecord } from "@/db/lock";

const ROOT = path.resolve(import.meta.dirname, "../..");
const HOLD = path.join(ROOT, "tests/support/hold-lock.ts");

const dirs: string[] = [];
const children: ChildProcess[] = [];
const tempDir = () => {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-lock-"));
  dirs.push(d);
  return d;
};
afterEach(() => {
  for (const c of children.splice(0)) c.kill("SIGKILL");
  for (const d of dirs.splice(0)) fs.rmSync(d, { recursive: true, force: true });
  vi.restoreAllMocks();
});

/** A separate process that tries to take the lock; resolves with its first line ("held" or "refused: …"). */
function holder(dir: string, env: Record<string, string> = {}, stdio: (number | "pipe" | "ignore" | "inherit")[] = ["ignore", "pipe", "inherit"]): Promise<{ line: string; child: ChildProcess }> {
  // node --import tsx: one process, so its PID is the one the lock records.
  const child = spawn(process.execPath, ["--import", "tsx", HOLD, dir], { env: { ...process.env, ...env }, stdio: stdio as never });
  children.push(child);
  return new Promise((resolve) => {
    let out = "";
    child.stdout!.on("data", (d) => {
      out += String(d);
      if (out.includes("\n")) resolve({ line: out.split("\n")[0]!, child });
    });
  });
}

const record = (dir: string) => JSON.parse(fs.readFileSync(path.join(dir, LOCK_RECORD), "utf8")) as LockRecord;

describe("PGlite data directory lock", () => {
  it("lets exactly one of several processes starting together take the directory", async () => {
    const dir = tempDir();
    const results = await Promise.all(Array.from({ length: 4 }, () => holder(dir)));
    const lines = results.map((r) => r.line);
    expect(lines.filter((l) => l === "held")).toHaveLength(1);
    const winner = results.find((r) => r.line === "held")!.child.pid;
    for (const l of lines.filter((l) => l !== "held")) expect(l).toMatch(new RegExp(`refused: .*in use by process ${winner} on host ${os.hostname()}`));
  });

  it("records PID, host and boot id, and removes the record on release", () => {
    const dir = tempDir();
    const lock = lockDataDir(dir);
    expect(record(dir)).toMatchObject({ pid: process.pid, host: os.hostname(), bootId: bootId() });
    expect(() => lockDataDir(dir)).toThrow(DataDirLockedError);
    lock.release();
    expect(fs.existsSync(path.join(dir, LOCK_RECORD))).toBe(false);
    lockDataDir(dir).release();
  });

  it("recovers a record left by a holder that died, even when its PID now belongs to a live process", () => {
    const warn = vi.spyOn(console, "warn").mockImplementation(() => undefined);
    const dir = tempDir();
    // PID 1 is always alive: a reused PID must not block start-up for good.
    const left: LockRecord = { pid: 1, host: os.hostname(), bootId: bootId(), startedAt: "2026-01-01T00:00:00.000Z" };
    fs.writeFileSync(path.join(dir, LOCK_RECORD), JSON.stringify(left));
    const lock = lockDataDir(dir);
    expect(record(dir).pid).toBe(process.pid);
    expect(warn).toHaveBeenCalledWith(expect.stringContaining("Recovered the data directory lock: process 1 on host"));
    lock.release();
  });

  it("recovers a record from before this machine restarted, and an unreadable one nobody holds", () => {
    vi.spyOn(console, "warn").mockImplementation(() => undefined);
    const dir = tempDir();
    fs.writeFileSync(path.join(dir, LOCK_RECORD), JSON.stringify({ pid: 4242, host: os.hostname(), bootId: "an-earlier-boot", startedAt: "x" }));
    lockDataDir(dir).release();
    fs.writeFileSync(path.join(dir, LOCK_RECORD), "");
    const old = new Date(Date.now() - 10_000);
    fs.utimesSync(path.join(dir, LOCK_RECORD), old, old);
    lockDataDir(dir).release();
  });

  it("never overrides a record from another machine sharing the volume, and says what to do", () => {
    const dir = tempDir();
    fs.writeFileSync(path.join(dir, LOCK_RECORD), JSON.stringify({ pid: 77, host: "other-host", bootId: "other-boot", startedAt: "2026-12-01T08:00:00Z" }));
    expect(() => lockDataDir(dir)).toThrow(/in use by process 77 on host other-host.*cannot tell from this machine.*delete .*airtally\.lock/);
  });

  it("hands the lock to a child that inherits the descriptor, and refuses everyone else meanwhile", async () => {
    const dir = tempDir();
    const lock = lockDataDir(dir);
    const child = await holder(dir, { [LOCK_FD_ENV]: "3", [LOCK_DIR_ENV]: path.resolve(dir) }, ["ignore", "pipe", "inherit", lock.fd!]);
    expect(child.line).toBe("held");
    expect(record(dir)).toMatchObject({ pid: child.child.pid, launcherPid: process.pid });
    // The launcher's descriptor goes (as if the launcher were killed): the child still holds the directory.
    fs.closeSync(lock.fd!);
    expect((await holder(dir)).line).toMatch(/refused: .*in use by process \d+ \(started by \d+\)/);
    child.child.kill("SIGKILL");
    await new Promise((r) => child.child.on("exit", r));
    vi.spyOn(console, "warn").mockImplementation(() => undefined);
    lockDataDir(dir).release();
  });

  it("uses the kernel's advisory lock on its own file", () => {
    const dir = tempDir();
    const lock = lockDataDir(dir);
    const probe = spawnSync("flock", ["--nonblock", "--conflict-exit-code", "75", path.join(dir, FLOCK_FILE), "true"]);
    expect(probe.status).toBe(75);
    lock.release();
    expect(spawnSync("flock", ["--nonblock", path.join(dir, FLOCK_FILE), "true"]).status).toBe(0);
  });
});
