/**
 * `npm run load`: the production build on loopback, driven by autocannon with signed-in users,
 * a mix of reads and saves. Bounded in time; sends traffic to 127.0.0.1 only.
 *
 *   npm run load -- [--duration 30] [--connections 50] [--writers 5] [--write readings|preference] [--postgres | --database postgres-url | --url http://127.0.0.1:port] [--json out.json]
 *
 * Prints requests/s, p50/p95/p99 latency and errors for reads and writes separately, and exits 1
 * when any request failed. The server runs on a fresh embedded database in a temporary directory
 * (or on a throwaway PostgreSQL cluster with --postgres, or on --database, a PostgreSQL database it
 * may seed), and is stopped and removed afterwards. With --url it drives a server already running on
 * loopback with the demo data (one started under a profiler, say) and leaves it running.
 */
import fs from "node:fs";
import os from "node:os";
import autocannon, { type Request as CannonRequest } from "autocannon";
import { cpuSeconds, signIn, startAppServer } from "../support/app-server";
import { startPostgres, type PostgresServer } from "../support/postgres-cluster";
import { DEFAULT_WRITE_MIX, WRITE_MIXES, type LoadContext } from "./writes";

const ACCOUNTS = ["tech@example.test", "cx@example.test", "engineer@example.test", "owner@example.test"];

function option(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1]! : fallback;
}
const duration = Number(option("duration", "30"));
const connections = Number(option("connections", "50"));
const writers = Number(option("writers", "5"));
const writeMix = option("write", DEFAULT_WRITE_MIX);
let databaseUrl = option("database", "");
/** Also write the figures as JSON to this file (npm run bench reads them). */
const jsonOut = option("json", "");
const throwawayPostgres = process.argv.includes("--postgres");
const runningUrl = option("url", "");
if (runningUrl && !/^http:\/\/(127\.0\.0\.1|localhost|\[::1\]):\d+$/.test(runningUrl)) throw new Error("--url must be a loopback address with its port, e.g. http://127.0.0.1:3999.");
if (!(duration > 0 && duration <= 600)) throw new Error("--duration is in seconds, 1 to 600.");
if (!(writers >= 0 && writers < connections && connections <= 500)) throw new Error("--connections 1–500, --writers fewer than connections.");
if (!WRITE_MIXES[writeMix]) throw new Error(`--write must be one of: ${Object.keys(WRITE_MIXES).join(", ")}.`);

const round = (n: number) => (Number.isFinite(n) ? Math.round(n) : "—");

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

interface Summary {
  label: string;
  requests: number;
  rps: number;
  p50: number;
  p95: number;
  p99: number;
  max: number;
  errors: number;
  non2xx: number;
  timeouts: number;
}

function drive(label: string, url: string, conns: number, requests: CannonRequest[]): Promise<Summary> {
  const latencies: number[] = [];
  return new Promise((resolve, reject) => {
    const instance = autocannon({ url, connections: conns, duration, requests, timeout: 10 }, (err, result) => {
      if (err) return reject(err);
      latencies.sort((a, b) => a - b);
      resolve({
        label,
        requests: result.requests.total,
        rps: result.requests.total / duration,
        p50: percentile(latencies, 50),
        p95: percentile(latencies, 95),
        p99: percentile(latencies, 99),
        max: latencies.at(-1) ?? NaN,
        errors: result.errors,
        non2xx: result.non2xx,
        timeouts: result.timeouts,
      });
    });
    instance.on("response", (_client: unknown, _status: number, _bytes: number, responseTime: number) => latencies.push(responseTime));
  });
}

async function main() {
  let cluster: PostgresServer | null = null;
  if (throwawayPostgres) {
    cluster = await startPostgres();
    databaseUrl = cluster.url;
  }
  const app = runningUrl
    ? { base: runningUrl, serverPid: () => null, stop: async () => undefined }
    : await startAppServer({ databaseUrl: databaseUrl || undefined, timeLimitS: duration + 300, label: "load" });
  const base = app.base;
  const stop = async () => {
    await app.stop();
    cluster?.stop();
  };
  try {
    const cookies: Record<string, string> = {};
    for (const email of ACCOUNTS) cookies[email] = await signIn(base, email);
    const list = (await (await fetch(`${base}/api/v1/projects`, { headers: { cookie: cookies["engineer@example.test"]! } })).json()) as { projects: { id: string; name: string }[] };
    const ctx: LoadContext = { cookies, projects: Object.fromEntries(list.projects.map((p) => [p.name, p.id])), base, writers };
    const library = list.projects.find((p) => p.name.startsWith("Wrenfield"))!.id;

    const reads: CannonRequest[] = Object.values(cookies).flatMap((cookie) => [
      { method: "GET", path: "/api/v1/projects", headers: { cookie } },
      { method: "GET", path: `/api/v1/projects/${library}`, headers: { cookie } },
      { method: "GET", path: "/api/auth/me", headers: { cookie } },
    ]);
    const writes = await WRITE_MIXES[writeMix]!(ctx);

    console.log(`\nDriving ${base} for ${duration} s: ${connections - writers} read connections, ${writers} write connections (${writeMix})…`);
    const pid = app.serverPid();
    const cpuBefore = pid ? cpuSeconds(pid) : NaN;
    const loadBefore = os.loadavg()[0]!;
    const results = await Promise.all([
      drive("reads", base, connections - writers, reads),
      ...(writers > 0 ? [drive(`writes (${writeMix})`, base, writers, writes)] : []),
    ]);

    const cpuUsed = pid ? cpuSeconds(pid) - cpuBefore : NaN;
    const total = results.reduce((n, r) => n + r.requests, 0);
    console.log("\n| traffic | requests | req/s | p50 ms | p95 ms | p99 ms | max ms | errors | non-2xx | timeouts |");
    console.log("|---|---|---|---|---|---|---|---|---|---|");
    for (const r of results) {
      console.log(`| ${r.label} | ${r.requests} | ${r.rps.toFixed(0)} | ${round(r.p50)} | ${round(r.p95)} | ${round(r.p99)} | ${round(r.max)} | ${r.errors} | ${r.non2xx} | ${r.timeouts} |`);
    }
    // CPU per request does not depend on what else the machine is doing; latency does.
    console.log(
      Number.isFinite(cpuUsed)
        ? `\nServer CPU: ${cpuUsed.toFixed(1)} s for ${total} requests = ${((cpuUsed * 1000) / total).toFixed(2)} ms per request.`
        : `\nServer CPU: not measured (a server this run did not start).`,
    );
    console.log(`Load average (1 min) before/after: ${loadBefore.toFixed(1)} / ${os.loadavg()[0]!.toFixed(1)} on ${os.cpus().length} cores.`);
    console.log(`\n${new Date().toISOString().slice(0, 10)} · ${os.cpus().length} × ${os.cpus()[0]?.model.trim()} · ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB · Node ${process.version} · ${databaseUrl ? "PostgreSQL" : "embedded PGlite"}`);
    const failed = results.reduce((n, r) => n + r.errors + r.non2xx + r.timeouts, 0);
    const reads95 = results[0]!.p95;
    console.log(`Target: zero errors (${failed === 0 ? "met" : `${failed} failed`}), read p95 under 100 ms (${reads95 < 100 ? "met" : `not met: ${reads95} ms`}).`);
    if (jsonOut) {
      const summary = { date: new Date().toISOString(), database: databaseUrl ? "postgresql" : "pglite", durationS: duration, connections, writers, writeMix, cpuMsPerRequest: Number.isFinite(cpuUsed) ? (cpuUsed * 1000) / total : null, loadAverage: os.loadavg()[0], results };
      fs.writeFileSync(jsonOut, JSON.stringify(summary, null, 2));
    }
    await stop();
    process.exit(failed === 0 ? 0 : 1);
  } catch (err) {
    await stop();
    throw err;
  }
}

main().catch((err: Error) => {
  console.error(`load: ${err.message}`);
  process.exit(2);
});
