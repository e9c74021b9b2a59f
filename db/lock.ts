/**
 * One writer per PGlite data directory. PGlite has no lock of its own: two processes on one
 * directory silently lose writes. Two locks together make sure of it:
 *
 * - an OS advisory lock (flock(2), taken through util-linux `flock` on a descriptor this process
 *   keeps open) on `.airtally.flock`: atomic, released by the kernel when the holder dies however it
 *   dies, shared with child processes that inherit the descriptor (the launcher hands it to the
 *   server, so the directory stays locked from before the build until the server exits);
 * - an owner record `airtally.lock`, created exclusively (O_EXCL), naming the holder's PID, host
 *   and boot id, so that a refusal can say who holds the directory, and so that a server on another
 *   machine sharing the volume (where flock may not reach) is not mistaken for a dead one.
 *
 * A record left by a holder that died is recovered when this machine's kernel says nobody holds the
 * advisory lock (same boot id) or the machine has rebooted since; a record from another machine is
 * never overridden automatically.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

export const LOCK_RECORD = "airtally.lock";
export const FLOCK_FILE = ".airtally.flock";
/** Set by the launcher for the server it starts: the inherited descriptor that holds the lock, and the directory it locks. */
export const LOCK_FD_ENV = "AIRTALLY_LOCK_FD";
export const LOCK_DIR_ENV = "AIRTALLY_LOCK_DIR";

export interface LockRecord {
  pid: number;
  host: string;
  bootId: string;
  startedAt: string;
  /** The launcher that took the lock and handed it to this server, when there is one. */
  launcherPid?: number;
}

export class DataDirLockedError extends Error {}

export interface DataDirLock {
  /** The descriptor holding the advisory lock (pass it to a child as fd 3 to hand the lock over). */
  fd: number | null;
  release(): void;
}

export function bootId(): string {
  try {
    return fs.readFileSync("/proc/sys/kernel/random/boot_id", "utf8").trim();
  } catch {
    return "unknown";
  }
}

function readRecord(file: string): LockRecord | null {
  try {
    const value = JSON.parse(fs.readFileSync(file, "utf8")) as LockRecord;
    return Number.isInteger(value.pid) && typeof value.host === "string" ? value : null;
  } catch {
    return null;
  }
}

/**
 * The record of the process holding the advisory lock. It takes the lock first and writes its record
 * just after, so a process refused in between waits a moment (at most a second) to name it.
 */
function recordOfHolder(recordPath: string): LockRecord | null {
  const pause = new Int32Array(new SharedArrayBuffer(4));
  for (let waited = 0; ; waited += 50) {
    const found = readRecord(recordPath);
    if (found || waited >= 1_000) return found;
    Atomics.wait(pause, 0, 0, 50);
  }
}

function describe(record: LockRecord | null): string {
  if (!record) return "another process";
  const by = record.launcherPid ? `process ${record.pid} (started by ${record.launcherPid})` : `process ${record.pid}`;
  return `${by} on host ${record.host} since ${record.startedAt}`;
}

type FlockResult = "held" | "busy" | "unavailable";

/** flock(LOCK_EX|LOCK_NB) on an open descriptor, through util-linux `flock`; the lock stays with the descriptor after the helper exits. */
function flockNonBlocking(fd: number): FlockResult {
  const r = spawnSync("flock", ["--nonblock", "--conflict-exit-code", "75", "3"], { stdio: ["ignore", "ignore", "pipe", fd], timeout: 10_000 });
  if (r.error && (r.error as NodeJS.ErrnoException).code === "ENOENT") return "unavailable";
  if (r.status === 0) return "held";
  if (r.status === 75) return "busy";
  throw new Error(`flock failed on the data directory lock: ${r.stderr?.toString().trim() || r.error?.message || `exit ${r.status}`}`);
}

let warnedNoFlock = false;

/**
 * Takes the data directory for this process, or throws DataDirLockedError with a message that says
 * who holds it and what to do. A server started by the launcher adopts the lock the launcher holds.
 */
export function acquireDataDirLock(dataDir: string): () => void {
  return lockDataDir(dataDir).release;
}

export function lockDataDir(dataDir: string): DataDirLock {
  fs.mkdirSync(dataDir, { recursive: true });
  const dir = path.resolve(dataDir);
  const recordPath = path.join(dir, LOCK_RECORD);
  const flockPath = path.join(dir, FLOCK_FILE);
  const me: LockRecord = { pid: process.pid, host: os.hostname(), bootId: bootId(), startedAt: new Date().toISOString() };

  const inherited = adoptInheritedLock(dir, flockPath, recordPath, me);
  if (inherited) return inherited;

  const fd = fs.openSync(flockPath, fs.constants.O_RDWR | fs.constants.O_CREAT, 0o600);
  let flocked: FlockResult;
  try {
    flocked = flockNonBlocking(fd);
  } catch (err) {
    fs.closeSync(fd);
    throw err;
  }
  if (flocked === "busy") {
    fs.closeSync(fd);
    throw new DataDirLockedError(
      `The data directory ${dir} is in use by ${describe(recordOfHolder(recordPath))} (a running Airtally server or script). ` +
        `Stop it first, or point AIRTALLY_DATA_DIR at another directory.`,
    );
  }
  if (flocked === "unavailable" && !warnedNoFlock) {
    warnedNoFlock = true;
    console.warn("[lock] util-linux `flock` is not installed: the data directory is guarded by its lock record alone.");
  }

  try {
    writeRecordExclusive(recordPath, me, flocked === "held");
  } catch (err) {
    fs.closeSync(fd);
    throw err;
  }
  let released = false;
  return {
    fd,
    release: () => {
      if (released) return;
      released = true;
      removeRecordIfMine(recordPath);
      try {
        fs.closeSync(fd);
      } catch {
        // already closed
      }
    },
  };
}

function writeRecordExclusive(recordPath: string, me: LockRecord, flockHeld: boolean): void {
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      fs.writeFileSync(recordPath, JSON.stringify(me), { flag: "wx", mode: 0o600 });
      return;
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== "EEXIST") throw err;
    }
    const found = readRecord(recordPath);
    const stale = staleReason(recordPath, found, me, flockHeld);
    if (!stale) {
      const where = found && found.host !== me.host ? ` Airtally cannot tell from this machine whether it still runs.` : "";
      throw new DataDirLockedError(
        `The data directory ${path.dirname(recordPath)} is in use by ${describe(found)}.${where} ` +
          `If that server is stopped, delete ${recordPath} and start again; otherwise point AIRTALLY_DATA_DIR at another directory.`,
      );
    }
    console.warn(`[lock] Recovered the data directory lock: ${stale}`);
    fs.rmSync(recordPath, { force: true });
  }
  throw new DataDirLockedError(`Another process took the data directory ${path.dirname(recordPath)} at the same moment; try again.`);
}

/** Why a record found in place is no longer anyone's, or null when it may still be. */
function staleReason(recordPath: string, found: LockRecord | null, me: LockRecord, flockHeld: boolean): string | null {
  if (!found) {
    // Empty or half-written: a record is written in one small write, so only a moment's race sees it so.
    const ageMs = Date.now() - fs.statSync(recordPath).mtimeMs;
    if (flockHeld && ageMs > 2_000) return "its record was unreadable and nobody holds the advisory lock.";
    return ageMs > 60_000 ? "its record was unreadable and a minute old." : null;
  }
  if (found.bootId === me.bootId && me.bootId !== "unknown") {
    // Same kernel: the advisory lock is authoritative, and we hold it, so the recorded holder is gone
    // (even if its PID now belongs to another process).
    if (flockHeld) return `${describe(found)} ended without releasing it.`;
    // Without flock, fall back to asking whether the PID is alive.
    return pidAlive(found.pid) ? null : `${describe(found)} is no longer running.`;
  }
  if (found.host === me.host) return `${describe(found)} ran before this machine last restarted.`;
  return null;
}

function pidAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === "EPERM";
  }
}

function removeRecordIfMine(recordPath: string): void {
  const found = readRecord(recordPath);
  if (found && (found.pid === process.pid || found.launcherPid === process.pid)) fs.rmSync(recordPath, { force: true });
}

/** A server started by the launcher: the launcher's descriptor, inherited as fd N, already holds the lock for this directory. */
function adoptInheritedLock(dir: string, flockPath: string, recordPath: string, me: LockRecord): DataDirLock | null {
  const fdText = process.env[LOCK_FD_ENV];
  if (!fdText || process.env[LOCK_DIR_ENV] !== dir) return null;
  const fd = Number(fdText);
  try {
    if (!Number.isInteger(fd) || fs.fstatSync(fd).ino !== fs.statSync(flockPath).ino) return null;
  } catch {
    return null;
  }
  // Taking the lock again on the shared open file description succeeds only if it is ours.
  if (flockNonBlocking(fd) === "busy") return null;
  const launcher = readRecord(recordPath);
  fs.writeFileSync(recordPath, JSON.stringify({ ...me, launcherPid: launcher?.pid }), { mode: 0o600 });
  // Used once: a process this server starts must take its own lock.
  delete process.env[LOCK_FD_ENV];
  return { fd, release: () => removeRecordIfMine(recordPath) };
}
