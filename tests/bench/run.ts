/**
 * `npm run bench`: every performance figure with its budget, in one command. Builds the production app
 * when the sources are newer (through the launcher), prints a table, writes bench/results.json, and
 * exits 1 when a budget is missed.
 *
 *   npm run bench -- [--only engine,report,pages,api] [--load-seconds 20] [--load-runs 3]
 *
 * Sections: engine and report (in this process), pages and browser (the production build on loopback with the
 * demo, driven by Debian's Chromium), api (`npm run load` --load-runs times for --load-seconds each, a
 * fresh server every time). Each figure is the median of repeated runs, printed with its range.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { browserFigures } from "./browser";
import { engineFigures } from "./engine";
import { reportFigures } from "./report";
import { figure, type Figure } from "./figures";
import { signIn, startAppServer } from "../support/app-server";

const ROOT = path.resolve(import.meta.dirname, "../..");
const SECTIONS = ["engine", "report", "pages", "api"] as const;

function option(name: string): string | undefined {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? process.argv[i + 1] : undefined;
}
const only = (option("only") ?? SECTIONS.join(",")).split(",");
for (const s of only) if (!(SECTIONS as readonly string[]).includes(s)) throw new Error(`--only takes ${SECTIONS.join(", ")}; "${s}" is not one of them.`);
const loadSeconds = Number(option("load-seconds") ?? "20");
if (!(loadSeconds >= 5 && loadSeconds <= 300)) throw new Error("--load-seconds is 5 to 300.");
const loadRuns = Number(option("load-runs") ?? "3");
if (!(Number.isInteger(loadRuns) && loadRuns >= 1 && loadRuns <= 9)) throw new Error("--load-runs is a whole number, 1 to 9.");

/** The demo's library project, a fully read traverse on its exhaust trunk, and the pages to measure. */
async function preparePages(base: string) {
  const tech = await signIn(base, "tech@example.test");
  const get = async (url: string) => (await fetch(base + url, { headers: { cookie: tech } })).json();
  const { projects } = (await get("/api/v1/projects")) as { projects: { id: string; name: string }[] };
  const library = projects.find((p) => p.name.startsWith("Wrenfield"));
  if (!library) throw new Error("the demo's library project is missing");
  const design = (await get(`/api/v1/projects/${library.id}`)) as { sections: { id: string; tag: string }[] };
  const section = design.sections.find((s) => s.tag === "X1");
  if (!section) throw new Error("the demo's exhaust trunk X1 is missing");
  const headers = { cookie: tech, "content-type": "application/json", origin: base };
  const started = await fetch(`${base}/api/v1/projects/${library.id}/traverses`, {
    method: "POST",
    headers,
    body: JSON.stringify({ sectionId: section.id, method: "log-linear", air: { dryBulbC: 18, relativeHumidityPct: 45, staticPa: -150 } }),
  });
  if (started.status !== 201) throw new Error(`starting the bench traverse answered ${started.status}`);
  const { traverse } = (await started.json()) as { traverse: { id: string; version: number; readings: (number | null)[][] } };
  // A full grid of a developed profile (a bench fixture, not a measurement).
  const readings = traverse.readings.map((row, k) => row.map((_, i) => Math.round(10 * (22 + 6 * Math.sin(((i + 0.5) / row.length) * Math.PI) + k)) / 10));
  const saved = await fetch(`${base}/api/v1/projects/${library.id}/traverses/${traverse.id}/readings`, { method: "PUT", headers, body: JSON.stringify({ version: traverse.version, readings }) });
  if (saved.status !== 200) throw new Error(`saving the bench traverse's readings answered ${saved.status}`);
  return { signIn: "/sign-in", traverseEntry: `/projects/${library.id}/traverses/${traverse.id}`, systemView: `/projects/${library.id}/systems` };
}

interface LoadFigures {
  /** Null when the load run did not start the server itself. */
  cpuMsPerRequest: number | null;
  results: { label: string; requests: number; rps: number; p50: number; p95: number; p99: number; errors: number; non2xx: number; timeouts: number }[];
}

/** One `npm run load` on a fresh server and database, its figures as it wrote them. */
function loadRun(): LoadFigures {
  const out = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "airtally-bench-")), "load.json");
  const run = spawnSync(process.execPath, ["--import", "tsx", "tests/load/run.ts", "--duration", String(loadSeconds), "--json", out], { cwd: ROOT, stdio: "inherit", timeout: (loadSeconds + 600) * 1000 });
  if (!fs.existsSync(out)) throw new Error(`npm run load wrote no figures (exit ${run.status})`);
  const load = JSON.parse(fs.readFileSync(out, "utf8")) as LoadFigures;
  fs.rmSync(path.dirname(out), { recursive: true, force: true });
  return load;
}

function apiFigures(): Figure[] {
  const loads = Array.from({ length: loadRuns }, loadRun);
  const reads = loads.map((load) => load.results.find((r) => r.label === "reads")!);
  const failed = loads.reduce((n, load) => n + load.results.reduce((m, r) => m + r.errors + r.non2xx + r.timeouts, 0), 0);
  // Each run's percentiles come from every request it made; the median and spread are over the runs.
  return [
    figure("api", `reads at 50 connections, p95 (runs of ${loadSeconds} s)`, "ms", reads.map((r) => r.p95), { atMost: 100 }),
    figure("api", "reads at 50 connections, p50", "ms", reads.map((r) => r.p50)),
    figure("api", "reads at 50 connections, p99", "ms", reads.map((r) => r.p99)),
    figure("api", "reads per second", "req/s", reads.map((r) => r.rps)),
    figure("api", "server CPU time per request", "ms", loads.flatMap((load) => (load.cpuMsPerRequest === null ? [] : [load.cpuMsPerRequest]))),
    // Summed over the runs; the name is the one earlier results carry.
    figure("api", "failed requests (errors, non-2xx, time-outs)", "requests", [failed], { atMost: 0 }),
  ];
}

const fmt = (x: number) => (Math.abs(x) >= 100 ? Math.round(x).toLocaleString("en-US") : x.toPrecision(3));

async function main() {
  const figures: Figure[] = [];
  if (only.includes("engine")) figures.push(...(await engineFigures()));
  if (only.includes("report")) figures.push(...(await reportFigures()));
  if (only.includes("pages")) {
    const app = await startAppServer({ timeLimitS: 1800, label: "bench" });
    try {
      figures.push(...(await browserFigures(app.base, await preparePages(app.base), { technician: "tech@example.test", engineer: "engineer@example.test" })));
    } finally {
      await app.stop();
    }
  }
  if (only.includes("api")) figures.push(...apiFigures());

  console.log(`\nAirtally bench · ${new Date().toISOString().slice(0, 10)} · ${os.cpus().length} × ${os.cpus()[0]?.model.trim()} · Node ${process.version} · load average ${os.loadavg()[0]!.toFixed(1)}\n`);
  console.log("| section | figure | median | range | runs | budget | |");
  console.log("|---|---|---|---|---|---|---|");
  for (const f of figures) {
    const budget = f.budget ? (f.budget.atMost !== undefined ? `≤ ${fmt(f.budget.atMost)}` : `≥ ${fmt(f.budget.atLeast!)}`) : "";
    console.log(`| ${f.section} | ${f.name} | ${fmt(f.median)} ${f.unit} | ${fmt(f.min)} … ${fmt(f.max)} | ${f.runs} | ${budget} | ${f.ok === null ? "" : f.ok ? "met" : "MISSED"} |`);
  }
  const results = { date: new Date().toISOString(), machine: { cpus: os.cpus().length, model: os.cpus()[0]?.model.trim(), memoryGiB: Math.round(os.totalmem() / 2 ** 30), node: process.version, loadAverage: os.loadavg() }, sections: only, figures };
  fs.mkdirSync(path.join(ROOT, "bench"), { recursive: true });
  fs.writeFileSync(path.join(ROOT, "bench", "results.json"), `${JSON.stringify(results, null, 2)}\n`);
  const missed = figures.filter((f) => f.ok === false);
  console.log(missed.length === 0 ? "\nEvery budget holds." : `\n${missed.length} budget${missed.length === 1 ? "" : "s"} missed: ${missed.map((f) => f.name).join("; ")}.`);
  process.exit(missed.length === 0 ? 0 : 1);
}

main().catch((err: Error) => {
  console.error(`bench: ${err.message}`);
  process.exit(2);
});
