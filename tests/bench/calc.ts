/**
 * `npm run bench:calc`: throughput of the engine on typical jobs, median of several timed rounds after a warm-up.
 * - traverse: a 100-point reduction (10 lines × 10 points, equal-area rectangular, 1200 × 800 mm; log-Tchebycheff
 *   stops at 7 per side), through runCalcCommand (validation + reduction + JSON shaping) and the engine alone;
 * - network: continuity over 2 000 sections (a fan, 40 branches of 49 terminals, mixed mass and volume input);
 * - refusal: how fast an oversized input (a 10 000 × 10 000 reading grid) is turned away.
 */
import { performance } from "node:perf_hooks";
import { runCalcCommand } from "@/lib/airflow/commands";
import { reduceTraverse } from "@/lib/airflow/traverse";

const WARM_UP_MS = 300;
const ROUNDS = 7;
const ROUND_MS = 250;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)] ?? NaN;
}

/** Operations per second: median over ROUNDS rounds of ~ROUND_MS each, after a warm-up. */
function opsPerSecond(fn: () => void): number {
  const until = performance.now() + WARM_UP_MS;
  while (performance.now() < until) fn();
  const rates: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    let n = 0;
    const start = performance.now();
    while (performance.now() - start < ROUND_MS) {
      fn();
      n++;
    }
    rates.push(n / ((performance.now() - start) / 1000));
  }
  return median(rates);
}

/** A plausible plane: fuller in the middle, weaker at the walls, a little noise (deterministic). */
const readings = Array.from({ length: 10 }, (_, k) =>
  Array.from({ length: 10 }, (_, i) => {
    const s = (k + 0.5) / 10;
    const t = (i + 0.5) / 10;
    return Math.round(80 * (4 * s * (1 - s)) ** 0.3 * (4 * t * (1 - t)) ** 0.3 + ((k * 7 + i * 3) % 5) - 2);
  }),
);
const air = { dry_bulb_c: 18, barometric_pa: 99_800, static_pa: 320, relative_humidity_pct: 55 };
const traverseJson = { duct: { shape: "rectangular", width_mm: 1200, height_mm: 800 }, method: "equal-area", air, readings };

const nodes: Record<string, unknown>[] = [{ id: "fan", parent: null, mass_flow_kg_s: 48 }];
for (let b = 0; b < 40; b++) {
  nodes.push({ id: `branch-${b}`, parent: "fan", mass_flow_kg_s: 1.2 });
  for (let t = 0; t < 49; t++) {
    nodes.push(t % 2 === 0 ? { id: `t-${b}-${t}`, parent: `branch-${b}`, mass_flow_kg_s: 0.0245 } : { id: `t-${b}-${t}`, parent: `branch-${b}`, flow_m3_s: 0.0204, density_kg_m3: 1.2 });
  }
}
const networkJson = { nodes: nodes.slice(0, 2000) };

function mustSucceed(command: string, input: unknown): void {
  const r = runCalcCommand(command, input);
  if (!r.ok) throw new Error(`${command} bench input is invalid: ${JSON.stringify(r.error)}`);
}
mustSucceed("traverse", traverseJson);
mustSucceed("network", networkJson);

const engineInput = {
  duct: { shape: "rectangular", widthM: 1.2, heightM: 0.8 } as const,
  method: "equal-area" as const,
  air: { dryBulbC: 18, barometricPa: 99_800, staticPa: 320, relativeHumidityPct: 55 },
  readings,
};

const hugeRow = new Array<number>(10_000).fill(50);
const hugeJson = { ...traverseJson, readings: new Array<number[]>(10_000).fill(hugeRow) };
function mustRefuse(): void {
  if (runCalcCommand("traverse", hugeJson).ok) throw new Error("the oversized bench input was accepted");
}

const traverseCommand = opsPerSecond(() => mustSucceed("traverse", traverseJson));
const traverseEngine = opsPerSecond(() => reduceTraverse(engineInput));
const networkRate = opsPerSecond(() => mustSucceed("network", networkJson));
const refuseRate = opsPerSecond(mustRefuse);

const fmt = (x: number, digits = 0) => x.toLocaleString("en-US", { maximumFractionDigits: digits, minimumFractionDigits: digits });
console.log(`Airtally calc bench (Node ${process.version}; median of ${ROUNDS} rounds of ${ROUND_MS} ms after ${WARM_UP_MS} ms warm-up)`);
console.log(`traverse, 100 points (10 × 10 equal-area rectangular), runCalcCommand: ${fmt(traverseCommand)} reductions/s (${fmt(1000 / traverseCommand, 3)} ms each)`);
console.log(`traverse, 100 points, reduceTraverse alone:                   ${fmt(traverseEngine)} reductions/s (${fmt(1000 / traverseEngine, 3)} ms each)`);
console.log(`network continuity, 2,000 sections, runCalcCommand:           ${fmt(1000 / networkRate, 2)} ms per check (${fmt(networkRate)} checks/s)`);
console.log(`refusing a 10,000 × 10,000 reading grid, runCalcCommand:      ${fmt(1000 / refuseRate, 4)} ms per refusal`);
