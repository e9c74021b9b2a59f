/**
 * Report figures: the time and size of a closeout report of 50 traverses and 500 terminals (10 systems
 * of 50), rendered from a synthetic model by the same renderer the app issues reports with.
 */
import { performance } from "node:perf_hooks";
import { renderReport } from "@/lib/report/render";
import { longModel } from "../support/report-model";
import { figure, type Figure } from "./figures";

const RUNS = 5;

export async function reportFigures(): Promise<Figure[]> {
  const model = longModel({ systems: 10, terminalsPerSystem: 50, traverses: 50 });
  const seconds: number[] = [];
  const megabytes: number[] = [];
  await renderReport(model); // warm-up: fonts read and parsed once per process
  for (let i = 0; i < RUNS; i++) {
    const start = performance.now();
    const pdf = await renderReport(model);
    seconds.push((performance.now() - start) / 1000);
    megabytes.push(pdf.byteLength / 1e6);
  }
  return [
    figure("report", "closeout report of 50 traverses and 500 terminals, time to build", "s", seconds, { atMost: 3 }),
    figure("report", "closeout report of 50 traverses and 500 terminals, size", "MB", megabytes, { atMost: 5 }),
  ];
}
