/**
 * Engine figures: a 100-point traverse (10 lines × 10 points, equal-area rectangular, 1200 × 800 mm)
 * reduced by the engine alone and through the calc command (validation + reduction + JSON shaping),
 * against a bare loop that computes the same 100 compressible point velocities and their mean; layouts
 * per second; continuity over 2,000 sections; how fast an oversized input is turned away.
 */
import { performance } from "node:perf_hooks";
import { runCalcCommand } from "@/lib/airflow/commands";
import { buildLayout } from "@/lib/airflow/layout";
import { checkContinuity, type NetworkNode } from "@/lib/airflow/network";
import { reduceTraverse } from "@/lib/airflow/traverse";
import { velocityFromPressureMS } from "@/lib/airflow/velocity";
import { figure, type Figure } from "./figures";

const WARM_UP_MS = 300;
const ROUNDS = 9;
const ROUND_MS = 200;

/** Operations per second in each of ROUNDS rounds of ~ROUND_MS, after a warm-up. */
function rates(fn: () => void): number[] {
  const until = performance.now() + WARM_UP_MS;
  while (performance.now() < until) fn();
  const out: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    let n = 0;
    const start = performance.now();
    while (performance.now() - start < ROUND_MS) {
      fn();
      n++;
    }
    out.push(n / ((performance.now() - start) / 1000));
  }
  return out;
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
const engineInput = {
  duct: { shape: "rectangular", widthM: 1.2, heightM: 0.8 } as const,
  method: "equal-area" as const,
  air: { dryBulbC: 18, barometricPa: 99_800, staticPa: 320, relativeHumidityPct: 55 },
  readings,
};

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
const hugeJson = { ...traverseJson, readings: new Array<number[]>(10_000).fill(hugeRow) };

function mustSucceed(command: string, input: unknown): void {
  const r = runCalcCommand(command, input);
  if (!r.ok) throw new Error(`${command} bench input is invalid: ${JSON.stringify(r.error)}`);
}

let sink = 0;
/** The floor: the 100 compressible velocities at the air's density and pressure, and their mean. */
function bareLoop(): void {
  let sum = 0;
  for (const row of readings) for (const pv of row) sum += velocityFromPressureMS(pv, 1.1904, 100_120);
  sink += sum / 100;
}

/** Layouts of varied ducts, so no cache answers them: a new duct size every call. */
let layoutCounter = 0;
function oneLayout(): void {
  const w = 0.4 + (layoutCounter++ % 1000) * 0.001;
  sink += buildLayout({ duct: { shape: "rectangular", widthM: w, heightM: 0.5 }, method: "log-linear", lines: 5, pointsPerLine: 5 }).lineCount;
}

export function engineFigures(): Figure[] {
  mustSucceed("traverse", traverseJson);
  mustSucceed("network", networkJson);
  if (runCalcCommand("traverse", hugeJson).ok) throw new Error("the oversized bench input was accepted");

  // Interleave the three traverse measurements round by round, so a busy moment of the machine
  // weighs on each alike and the ratios stay meaningful.
  const bare: number[] = [];
  const engine: number[] = [];
  const command: number[] = [];
  for (let r = 0; r < 3; r++) {
    bare.push(...rates(bareLoop));
    engine.push(...rates(() => reduceTraverse(engineInput)));
    command.push(...rates(() => mustSucceed("traverse", traverseJson)));
  }
  const us = (perSecond: number[]) => perSecond.map((r) => 1e6 / r);
  /** Time of b ÷ time of a, round by round, from their rates. */
  const ratio = (a: number[], b: number[]) => a.map((x, i) => x / b[i]!);
  const network = rates(() => checkContinuity(networkNodes));
  const networkCommand = rates(() => mustSucceed("network", networkJson));
  const refusal = rates(() => runCalcCommand("traverse", hugeJson));
  const figures = [
    figure("engine", "100-point traverse, bare loop (velocities and their mean)", "µs", us(bare)),
    figure("engine", "100-point traverse, engine alone (reduceTraverse)", "reductions/s", engine, { atLeast: 100_000 }),
    figure("engine", "engine alone ÷ bare loop", "×", ratio(bare, engine), { atMost: 2 }),
    figure("engine", "100-point traverse through the calc command", "reductions/s", command),
    figure("engine", "calc command ÷ bare loop", "×", ratio(bare, command), { atMost: 5 }),
    figure("engine", "layouts (5 × 5 log-Tchebycheff, a new duct each)", "layouts/s", rates(oneLayout)),
    figure("engine", "continuity of a 2,000-section network, engine alone", "ms", network.map((r) => 1000 / r), { atMost: 2 }),
    figure("engine", "continuity of a 2,000-section network through the calc command", "ms", networkCommand.map((r) => 1000 / r)),
    figure("engine", "refusing a 10,000 × 10,000 reading grid", "ms", refusal.map((r) => 1000 / r)),
  ];
  if (sink === 42) console.log("");
  return figures;
}
