/**
 * Engine figures: a 100-point traverse (10 lines × 10 points, equal-area rectangular, 1200 × 800 mm)
 * reduced by the engine alone and through the calc command (validation + reduction + JSON shaping),
 * against a bare loop that computes the same 100 compressible point velocities and their mean; layouts
 * per second; continuity over 2,000 sections; how fast an oversized input is turned away.
 *
 * The engine is measured as it ships: lib/airflow bundled by esbuild into one module (what the
 * production build does with it), not minified and without tsx's name-keeping wrappers. The bare loop
 * calls the bundle's own velocity function, so both sides of every ratio run the same kind of code. The
 * same traverse through tsx, as `npm run calc` runs it, is printed beside for reference (no budget).
 *
 * Each call takes the next of eight reading sets (same duct and air, different readings, as a technician's
 * tablet recalculates while readings land), so nothing can answer from a result kept for the same readings.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { pathToFileURL } from "node:url";
import { buildSync } from "esbuild";
import type { NetworkNode } from "@/lib/airflow/network";
import type { TraverseInput } from "@/lib/airflow/traverse";
import * as sourceKernel from "./engine-kernel";
import { figure, type Figure } from "./figures";

const ROOT = path.resolve(import.meta.dirname, "../..");
const WARM_UP_MS = 300;
const ROUNDS = 9;
const ROUND_MS = 200;

type Kernel = typeof sourceKernel;

/** The bench's kernel and lib/airflow as the production build ships them: one esbuild bundle, not minified, no name keeping. */
async function bundledKernel(): Promise<Kernel> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-bench-engine-"));
  try {
    const outfile = path.join(dir, "engine.mjs");
    buildSync({
      entryPoints: [path.join(import.meta.dirname, "engine-kernel.ts")],
      bundle: true,
      platform: "node",
      format: "esm",
      target: `node${process.versions.node}`,
      tsconfig: path.join(ROOT, "tsconfig.json"),
      outfile,
      logLevel: "warning",
    });
    return (await import(pathToFileURL(outfile).href)) as Kernel;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Calls between two looks at the clock: reading it costs about as much as a few percent of a bare loop. */
const BATCH = 8;

/** Operations per second in each of `rounds` rounds of ~ROUND_MS, after a warm-up. */
function rates(fn: () => void, rounds = ROUNDS): number[] {
  return interleavedRates([fn], rounds)[0]!;
}

/**
 * Operations per second of each function in each of `rounds` rounds of ~ROUND_MS per function, after a
 * warm-up. Within a round the functions take turns in slices of ROUND_MS / SLICES, so a busy moment of the
 * (shared) machine weighs on each alike and their ratios hold even when the load changes.
 */
const SLICES = 10;
function interleavedRates(fns: readonly (() => void)[], rounds = ROUNDS): number[][] {
  for (const fn of fns) {
    const until = performance.now() + WARM_UP_MS;
    while (performance.now() < until) for (let b = 0; b < BATCH; b++) fn();
  }
  const out = fns.map(() => [] as number[]);
  const sliceMs = ROUND_MS / SLICES;
  for (let r = 0; r < rounds; r++) {
    const calls = fns.map(() => 0);
    const ms = fns.map(() => 0);
    for (let slice = 0; slice < SLICES; slice++) {
      fns.forEach((fn, j) => {
        const start = performance.now();
        let now = start;
        let n = 0;
        while (now - start < sliceMs) {
          for (let b = 0; b < BATCH; b++) fn();
          n += BATCH;
          now = performance.now();
        }
        calls[j]! += n;
        ms[j]! += now - start;
      });
    }
    fns.forEach((_, j) => out[j]!.push(calls[j]! / (ms[j]! / 1000)));
  }
  return out;
}

/** A plausible plane: fuller in the middle, weaker at the walls, a little noise (deterministic). */
function plane(strength: number, noise: number): number[][] {
  return Array.from({ length: 10 }, (_, k) =>
    Array.from({ length: 10 }, (_, i) => {
      const s = (k + 0.5) / 10;
      const t = (i + 0.5) / 10;
      return Math.round(strength * (4 * s * (1 - s)) ** 0.3 * (4 * t * (1 - t)) ** 0.3 + ((k * 7 + i * 3 + noise) % 5) - 2);
    }),
  );
}
/** Eight reading sets of the same plane: the fan a little faster or slower, the noise elsewhere. */
const READING_SETS = [80, 74, 86, 77, 83, 71, 89, 80].map((strength, n) => plane(strength, n));
const air = { dry_bulb_c: 18, barometric_pa: 99_800, static_pa: 320, relative_humidity_pct: 55 };
const traverseJsons = READING_SETS.map((readings) => ({ duct: { shape: "rectangular", width_mm: 1200, height_mm: 800 }, method: "equal-area", air, readings }));
const engineInputs: TraverseInput[] = READING_SETS.map((readings) => ({
  duct: { shape: "rectangular", widthM: 1.2, heightM: 0.8 },
  method: "equal-area",
  air: { dryBulbC: 18, barometricPa: 99_800, staticPa: 320, relativeHumidityPct: 55 },
  readings,
}));

const nodes: Record<string, unknown>[] = [{ id: "fan", parent: null, mass_flow_kg_s: 48 }];
for (let b = 0; b < 40; b++) {
  nodes.push({ id: `branch-${b}`, parent: "fan", mass_flow_kg_s: 1.2 });
  for (let t = 0; t < 49; t++) {
    nodes.push(t % 2 === 0 ? { id: `t-${b}-${t}`, parent: `branch-${b}`, mass_flow_kg_s: 0.0245 } : { id: `t-${b}-${t}`, parent: `branch-${b}`, flow_m3_s: 0.0204, density_kg_m3: 1.2 });
  }
}
const networkJson = { nodes: nodes.slice(0, 2000) };
/** The same network as the engine takes it (mass flow, or volume flow with its density). */
const networkNodes: NetworkNode[] = networkJson.nodes.map((n) => ({
  id: n.id as string,
  parent: n.parent as string | null,
  massFlowKgS: (n.mass_flow_kg_s as number | undefined) ?? (n.flow_m3_s as number) * (n.density_kg_m3 as number),
  flowM3S: n.flow_m3_s as number | undefined,
  densityKgM3: n.density_kg_m3 as number | undefined,
}));

const hugeRow = new Array<number>(10_000).fill(50);
const hugeJson = { ...traverseJsons[0]!, readings: new Array<number[]>(10_000).fill(hugeRow) };

/**
 * The traverse measurements of one kernel: the engine and the calc command each taking turns with the bare
 * loop, slice by slice (see interleavedRates). In pairs, so that neither is charged for collecting the
 * other's garbage (the command's JSON is most of what a round allocates).
 */
function traverseRates(kernel: Kernel, rounds: number) {
  const w = kernel.traverseWorkloads(READING_SETS, engineInputs, traverseJsons);
  const [bareByEngine, engine] = interleavedRates([w.bareLoop, w.engine], rounds);
  const [bareByCommand, command] = interleavedRates([w.bareLoop, w.command], rounds);
  return { bareByEngine: bareByEngine!, engine: engine!, bareByCommand: bareByCommand!, command: command!, sink: w.sink() };
}

export async function engineFigures(): Promise<Figure[]> {
  const kernel = await bundledKernel();
  const { runCalcCommand, buildLayout, checkContinuity } = kernel;
  if (!runCalcCommand("network", networkJson).ok) throw new Error("network bench input is invalid");
  if (runCalcCommand("traverse", hugeJson).ok) throw new Error("the oversized bench input was accepted");

  const shipped = traverseRates(kernel, 3 * ROUNDS);
  const viaTsx = traverseRates(sourceKernel, ROUNDS);
  let sink = shipped.sink + viaTsx.sink;
  const us = (perSecond: number[]) => perSecond.map((r) => 1e6 / r);
  /** Time of b ÷ time of a, round by round, from their rates. */
  const ratio = (a: number[], b: number[]) => a.map((x, i) => x / b[i]!);

  /** Layouts of varied ducts, so no cache answers them: a new duct size every call. */
  let layoutCounter = 0;
  const oneLayout = () => {
    const w = 0.4 + (layoutCounter++ % 1000) * 0.001;
    sink += buildLayout({ duct: { shape: "rectangular", widthM: w, heightM: 0.5 }, method: "log-linear", lines: 5, pointsPerLine: 5 }).lineCount;
  };
  const network = rates(() => checkContinuity(networkNodes));
  const networkCommand = rates(() => runCalcCommand("network", networkJson));
  const refusal = rates(() => runCalcCommand("traverse", hugeJson));
  const figures = [
    figure("engine", "100-point traverse, bare loop (velocities and their mean)", "µs", us(shipped.bareByEngine)),
    figure("engine", "100-point traverse, engine alone (reduceTraverse)", "reductions/s", shipped.engine, { atLeast: 100_000 }),
    figure("engine", "engine alone ÷ bare loop", "×", ratio(shipped.bareByEngine, shipped.engine), { atMost: 2 }),
    figure("engine", "100-point traverse through the calc command", "reductions/s", shipped.command),
    figure("engine", "calc command ÷ bare loop", "×", ratio(shipped.bareByCommand, shipped.command), { atMost: 5 }),
    figure("engine", "the same through tsx: bare loop", "µs", us(viaTsx.bareByEngine)),
    figure("engine", "the same through tsx: engine alone", "reductions/s", viaTsx.engine),
    figure("engine", "the same through tsx: engine alone ÷ bare loop", "×", ratio(viaTsx.bareByEngine, viaTsx.engine)),
    figure("engine", "the same through tsx: calc command ÷ bare loop", "×", ratio(viaTsx.bareByCommand, viaTsx.command)),
    figure("engine", "layouts (5 × 5 log-Tchebycheff, a new duct each)", "layouts/s", rates(oneLayout)),
    figure("engine", "continuity of a 2,000-section network, engine alone", "ms", network.map((r) => 1000 / r), { atMost: 2 }),
    figure("engine", "continuity of a 2,000-section network through the calc command", "ms", networkCommand.map((r) => 1000 / r)),
    figure("engine", "refusing a 10,000 × 10,000 reading grid", "ms", refusal.map((r) => 1000 / r)),
  ];
  if (sink === 42) console.log("");
  return figures;
}
