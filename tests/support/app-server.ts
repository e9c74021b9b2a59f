/**
 * The production build on loopback for measurements (`npm run load`, `npm run bench`): the launcher
 * (`lib/cli/serve.ts --demo`, which builds when the sources are newer) on a free port with a fresh
 * embedded database in a temporary directory, or on `databaseUrl`. `stop()` ends it and removes its data.
 */
import { spawn } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";

const ROOT = path.resolve(import.meta.dirname, "../..");
export const DEMO_PASSWORD = "airtally-demo";

export interface AppServer {
  base: string;
  /** The Next.js server process (the launcher's child), for its CPU time; null when it cannot be found. */
  serverPid(): number | null;
  stop(): Promise<void>;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.listen(0, "127.0.0.1", () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
    s.on("error", reject);
  });
}

/** CPU seconds (user + system) a process has used, from /proc (Linux). */
export function cpuSeconds(pid: number): number {
  const fields = fs.readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1]!.split(" ");
  // utime and stime are fields 14 and 15 of stat; after "pid (comm) " they are at 11 and 12.
  return (Number(fields[11]) + Number(fields[12])) / 100;
}

export async function startAppServer(options: { databaseUrl?: string; timeLimitS: number; label: string }): Promise<AppServer> {
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), `airtally-${options.label}-`));
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    PORT: String(port),
    AIRTALLY_DATA_DIR: path.join(dataDir, "data"),
    AIRTALLY_SESSION_SECRET: crypto.randomBytes(32).toString("base64url"),
    ...(options.databaseUrl ? { DATABASE_URL: options.databaseUrl } : {}),
  };
  if (!options.databaseUrl) delete env.DATABASE_URL;
  // The launcher itself (node --import tsx): one process to signal; it stops the server and releases the lock.
  const server = spawn(process.execPath, ["--import", "tsx", "lib/cli/serve.ts", "--demo"], { cwd: ROOT, env, stdio: ["ignore", "pipe", "inherit"] });
  const exited = new Promise<void>((r) => server.on("exit", () => r()));
  const hardStop = setTimeout(() => {
    console.error(`${options.label}: giving up after the time limit`);
    server.kill("SIGKILL");
    process.exit(2);
  }, options.timeLimitS * 1000);
  const stop = async () => {
    server.kill("SIGTERM");
    await exited;
    clearTimeout(hardStop);
    fs.rmSync(dataDir, { recursive: true, force: true });
  };
  try {
    await new Promise<void>((resolve, reject) => {
      let out = "";
      server.stdout!.on("data", (d) => {
        out += String(d);
        if (out.includes("Airtally is ready")) resolve();
      });
      server.on("exit", (code) => reject(new Error(`the server exited (${code}) before it was ready:\n${out}`)));
    });
  } catch (err) {
    await stop();
    throw err;
  }
  const serverPid = () => {
    try {
      const launcher = server.pid!;
      const kids = fs.readFileSync(`/proc/${launcher}/task/${launcher}/children`, "utf8").trim().split(/\s+/).filter(Boolean);
      return kids.length > 0 ? Number(kids[0]) : null;
    } catch {
      return null;
    }
  };
  return { base, serverPid, stop };
}

/** Signs a demo user in; returns the session cookie ("name=value"). */
export async function signIn(base: string, email: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/sign-in`, { method: "POST", headers: { "content-type": "application/json", origin: base }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  if (res.status !== 204) throw new Error(`sign-in as ${email} answered ${res.status}`);
  return res.headers.get("set-cookie")!.split(";")[0]!;
}
