/**
 * A throwaway PostgreSQL cluster for the database tests (unless AIRTALLY_TEST_DATABASE_URL names an
 * empty database to use instead): started in a temporary folder on a free port, stopped and deleted
 * afterwards. No data of anyone's is touched.
 */
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";

function pgBinDir(): string {
  const debian = "/usr/lib/postgresql";
  if (fs.existsSync(debian)) {
    const versions = fs
      .readdirSync(debian)
      .filter((v) => fs.existsSync(path.join(debian, v, "bin", "initdb")))
      .sort((a, b) => Number(a) - Number(b));
    const newest = versions.at(-1);
    if (newest) return path.join(debian, newest, "bin");
  }
  const found = spawnSync("pg_config", ["--bindir"], { encoding: "utf8" });
  if (found.status === 0 && fs.existsSync(path.join(found.stdout.trim(), "initdb"))) return found.stdout.trim();
  throw new Error("PostgreSQL server binaries not found: run tests/support/ensure-postgres.sh, or set AIRTALLY_TEST_DATABASE_URL.");
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
    server.on("error", reject);
  });
}

export interface PostgresServer {
  url: string;
  stop(): void;
}

export async function startPostgres(): Promise<PostgresServer> {
  const given = process.env.AIRTALLY_TEST_DATABASE_URL;
  if (given) return { url: given, stop: () => undefined };
  const bin = pgBinDir();
  const asRoot = process.getuid?.() === 0;
  // initdb refuses to run as root: the cluster belongs to the postgres user, in a folder it can reach.
  const run = (cmd: string, args: string[]) =>
    asRoot ? execFileSync("runuser", ["-u", "postgres", "--", path.join(bin, cmd), ...args], { stdio: "pipe" }) : execFileSync(path.join(bin, cmd), args, { stdio: "pipe" });
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-pg-"));
  fs.chmodSync(dir, 0o755);
  if (asRoot) execFileSync("chown", ["postgres:postgres", dir]);
  const port = await freePort();
  run("initdb", ["-D", path.join(dir, "data"), "-U", "postgres", "--auth=trust", "-E", "UTF8", "--locale=C.UTF-8"]);
  run("pg_ctl", ["-D", path.join(dir, "data"), "-l", path.join(dir, "log"), "-o", `-c listen_addresses=127.0.0.1 -p ${port} -k ${dir} -c fsync=off`, "-w", "start"]);
  run("createdb", ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", "airtally_test"]);
  return {
    url: `postgres://postgres@127.0.0.1:${port}/airtally_test`,
    stop: () => {
      try {
        run("pg_ctl", ["-D", path.join(dir, "data"), "-m", "fast", "-w", "stop"]);
      } finally {
        fs.rmSync(dir, { recursive: true, force: true });
      }
    },
  };
}
