/**
 * What the engine bench runs, in a module of its own so that it can be measured twice without the two
 * runs sharing code: bundled together with lib/airflow (as the production build ships the engine), and
 * through tsx from the sources. Each copy has its own functions, so neither run's type feedback slows the
 * other's. Every call takes the next of the reading sets it is given.
 */
import { runCalcCommand } from "@/lib/airflow/commands";
import { reduceTraverse, type TraverseInput } from "@/lib/airflow/traverse";
import { velocityFromPressureMS } from "@/lib/airflow/velocity";

export { buildLayout } from "@/lib/airflow/layout";
export { checkContinuity } from "@/lib/airflow/network";
export { runCalcCommand };

export interface TraverseWorkloads {
  /** The floor: the 100 compressible velocities at the air's density and pressure, and their mean. */
  bareLoop: () => void;
  /** reduceTraverse alone. */
  engine: () => void;
  /** runCalcCommand("traverse", …): validation, reduction and JSON out. */
  command: () => void;
  /** A value depending on every result, so that no work can be skipped. */
  sink: () => number;
}

/** The three traverse workloads over the same rotating reading sets (as calc JSON and as engine input). */
export function traverseWorkloads(readingSets: readonly number[][][], engineInputs: readonly TraverseInput[], traverseJsons: readonly unknown[]): TraverseWorkloads {
  const sets = readingSets.length;
  let call = 0;
  let sink = 0;
  return {
    bareLoop() {
      let sum = 0;
      for (const row of readingSets[call++ % sets]!) for (const pv of row) sum += velocityFromPressureMS(pv, 1.1904, 100_120);
      sink += sum / 100;
    },
    engine() {
      sink += reduceTraverse(engineInputs[call++ % sets]!).flowM3S;
    },
    command() {
      const r = runCalcCommand("traverse", traverseJsons[call++ % sets]);
      if (!r.ok) throw new Error(`traverse bench input is invalid: ${JSON.stringify(r.error)}`);
      sink += (r.value as { flow_m3_s: number }).flow_m3_s;
    },
    sink: () => sink,
  };
}
