/**
 * Starts Airtally's production server: builds first when the build is missing or older than the
 * sources, then runs `next start` and waits until the database is open and migrated.
 *
 *   npm run demo    → demo mode: embedded database in .data/, demo project seeded once,
 *                     a session secret generated into the data directory if none is set
 *   npm start       → production: AIRTALLY_SESSION_SECRET is required
 *
 * Environment: PORT (3000), AIRTALLY_DATA_DIR (.data), DATABASE_URL (PostgreSQL instead of PGlite),
 * S3_* (object storage; without them a local S3-compatible store runs on loopback beside the server,
 * its files in <data dir>/objects, started and stopped here), SMTP_URL, AIRTALLY_PUBLIC_URL.
 * Only demo mode creates the demo accounts: production starts with none (`npm run admin:create`).
 */
import { spawn, spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { defaultDataDir } from "@/db/client";
import { LOCK_DIR_ENV, LOCK_FD_ENV, lockDataDir, type DataDirLock } from "@/db/lock";
import { MissingSecretError, resolveSessionSecret, SECRET_ENV } from "@/lib/auth/secret";
import { storageConfigFromEnv } from "@/lib/server/storage";
import { launcherEnv } from "./launcher-env";
import { startLocalObjectStore, type LocalObjectStore } from "./local-object-store";

const root = process.cwd();
const demo = process.argv.includes("--demo");
const port = Number.parseInt(process.env.PORT ?? "3000", 10);
const nextBin = path.join(root, "node_modules", ".bin", "next");
const stampFile = path.join(root, ".next", "airtally-source-hash");

const BUILD_INPUTS = ["app", "components", "lib", "db", "drizzle", "public", "fonts"];
const BUILD_FILES = ["package-lock.json", "next.config.mjs", "tailwind.config.ts", "postcss.config.mjs", "tsconfig.json"];

function listFiles(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    return entry.isDirectory() ? listFiles(full) : [full];
  });
}

/** A hash of everything the production build is made from. */
function sourceHash(): string {
  const hash = crypto.createHash("sha256");
  const files = [...BUILD_INPUTS.flatMap((d) => listFiles(path.join(root, d))), ...BUILD_FILES.map((f) => path.join(root, f))]
    .filter((f) => fs.existsSync(f))
    .sort();
  for (const file of files) {
    hash.update(path.relative(root, file));
    hash.update(fs.readFileSync(file));
  }
  return hash.digest("hex");
}

function fail(message: string): never {
  console.error(`\nAirtally cannot start: ${message}\n`);
  process.exit(1);
}

function ensureBuild(env: NodeJS.ProcessEnv) {
  const wanted = sourceHash();
  const built = fs.existsSync(path.join(root, ".next", "BUILD_ID")) && fs.existsSync(stampFile) ? fs.readFileSync(stampFile, "utf8") : "";
  if (built === wanted) {
    console.log("Production build is up to date.");
    return;
  }
  console.log(built ? "Sources changed since the last build: rebuilding…" : "No production build yet: building (a minute or two)…");
  const result = spawnSync(nextBin, ["build"], { stdio: "inherit", env });
  if (result.status !== 0) fail("the production build failed (see above).");
  fs.writeFileSync(stampFile, wanted);
}

async function waitForHealth(child: ReturnType<typeof spawn>): Promise<void> {
  const url = `http://127.0.0.1:${port}/api/health`;
  const deadline = Date.now() + 120_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) fail(`the server exited with code ${child.exitCode}.`);
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 500));
  }
  fail(`the server did not answer ${url} within two minutes.`);
}

async function main() {
  if (!Number.isInteger(port) || port < 1 || port > 65535) fail(`PORT must be a whole number from 1 to 65535; it is "${process.env.PORT}".`);
  const env = launcherEnv({ demo, port, env: process.env });
  const dataDir = defaultDataDir();

  // Take the data directory now and keep it through the build until the server exits: the server
  // inherits the locked descriptor (fd 3), so no `npm run dev` or `db:seed` can slip in between.
  let lock: DataDirLock | null = null;
  if (!env.DATABASE_URL && !dataDir.startsWith("memory://")) {
    try {
      lock = lockDataDir(dataDir);
    } catch (err) {
      fail((err as Error).message);
    }
    if (lock.fd !== null) Object.assign(env, { [LOCK_FD_ENV]: "3", [LOCK_DIR_ENV]: path.resolve(dataDir) });
  }
  const releaseLock = () => lock?.release();
  process.on("exit", releaseLock);

  try {
    // The secret rules read the mode from the environment, as the server will.
    Object.assign(process.env, { NODE_ENV: "production" }, demo ? { AIRTALLY_DEMO: "1" } : {});
    if (!demo) delete process.env.AIRTALLY_DEMO;
    env[SECRET_ENV] = resolveSessionSecret(dataDir);
  } catch (err) {
    if (err instanceof MissingSecretError) fail(err.message);
    throw err;
  }

  ensureBuild(env);

  let store: LocalObjectStore | undefined;
  if (!storageConfigFromEnv(env)) {
    store = await startLocalObjectStore({ dataDir });
    Object.assign(env, store.env);
    console.log(`No S3_BUCKET set: uploads and reports go to a local S3-compatible store on ${store.env.S3_ENDPOINT} (files in ${store.directory}).`);
    if (!demo) console.log("For several app servers, or backups apart from this machine, set S3_ENDPOINT, S3_BUCKET and credentials instead.");
  }

  // The server closes the database itself on SIGTERM/SIGINT (instrumentation.ts), instead of the
  // framework's own handler exiting first.
  env.NEXT_MANUAL_SIG_HANDLE = "1";
  const child = spawn(nextBin, ["start", "-p", String(port)], { stdio: ["inherit", "inherit", "inherit", lock?.fd ?? "ignore"], env });
  for (const signal of ["SIGINT", "SIGTERM"] as const) process.on(signal, () => child.kill(signal));
  child.on("exit", (code, signal) => {
    releaseLock();
    const status = code ?? (signal ? 128 + (signal === "SIGINT" ? 2 : signal === "SIGKILL" ? 9 : 15) : 0);
    // The object store outlives the server only long enough to close cleanly.
    void (store?.stop() ?? Promise.resolve()).finally(() => process.exit(status));
  });

  await waitForHealth(child);
  const where = env.DATABASE_URL ? "PostgreSQL (DATABASE_URL)" : `embedded PGlite in ${dataDir}`;
  console.log(`\nAirtally is ready on http://localhost:${port}  (database: ${where})`);
  if (demo) console.log("Demo accounts: tech@, cx@, engineer@, owner@, admin@example.test — password airtally-demo\n");
  else console.log("No account yet? Create the first site administrator with: npm run admin:create\n");
}

void main();
