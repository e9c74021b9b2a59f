/**
 * A second production server for tests that stop and start one (crash, shutdown): the build made
 * for the suite, `next start` on a free loopback port with its own data directory. The process
 * spawned is the server itself, so a signal reaches it directly.
 */
import { spawn, type ChildProcess } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";

const ROOT = path.resolve(import.meta.dirname, "../..");

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.listen(0, "127.0.0.1", () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
    s.on("error", reject);
  });
}

export interface TestServer {
  baseURL: string;
  child: ChildProcess;
  output: () => string;
  /** Resolves with the exit code or signal once the process has ended. */
  exited: Promise<number | string>;
}

export function tempDataDir(): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), "airtally-e2e-data-"));
}

export async function startServer({ dataDir, secret = crypto.randomBytes(32).toString("base64url"), demo = true }: { dataDir: string; secret?: string; demo?: boolean }): Promise<TestServer> {
  const port = await freePort();
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "production",
    NEXT_TELEMETRY_DISABLED: "1",
    NEXT_MANUAL_SIG_HANDLE: "1",
    PORT: String(port),
    AIRTALLY_DATA_DIR: dataDir,
    AIRTALLY_SESSION_SECRET: secret,
    AIRTALLY_DEMO: demo ? "1" : "",
  };
  delete env.AIRTALLY_LOCK_FD;
  const child = spawn(path.join(ROOT, "node_modules/.bin/next"), ["start", "-p", String(port), "-H", "127.0.0.1"], { cwd: ROOT, env, stdio: ["ignore", "pipe", "pipe"] });
  let out = "";
  child.stdout!.on("data", (d) => (out += String(d)));
  child.stderr!.on("data", (d) => (out += String(d)));
  const exited = new Promise<number | string>((resolve) => child.on("exit", (code, signal) => resolve(code ?? signal ?? -1)));
  const baseURL = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited early:\n${out}`);
    try {
      if ((await fetch(`${baseURL}/api/health`)).ok) return { baseURL, child, output: () => out, exited };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  child.kill("SIGKILL");
  throw new Error(`server did not become healthy within 60 s:\n${out}`);
}
