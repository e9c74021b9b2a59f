/**
 * `npm run dev`: the Next development server with the demo seed, and the local S3-compatible store
 * beside it when no object storage is configured. Stop it before `db:migrate`/`db:seed`.
 */
import { spawn } from "node:child_process";
import path from "node:path";
import { defaultDataDir } from "@/db/client";
import { storageConfigFromEnv } from "@/lib/server/storage";
import { startLocalObjectStore } from "./local-object-store";

async function main() {
  const env: NodeJS.ProcessEnv = { ...process.env, AIRTALLY_DEMO: "1" };
  const store = storageConfigFromEnv(env) ? undefined : await startLocalObjectStore({ dataDir: defaultDataDir() });
  if (store) Object.assign(env, store.env);
  const child = spawn(path.join(process.cwd(), "node_modules", ".bin", "next"), ["dev", ...process.argv.slice(2)], { stdio: "inherit", env });
  for (const signal of ["SIGINT", "SIGTERM"] as const) process.on(signal, () => child.kill(signal));
  child.on("exit", (code) => void (store?.stop() ?? Promise.resolve()).finally(() => process.exit(code ?? 0)));
}

void main();
