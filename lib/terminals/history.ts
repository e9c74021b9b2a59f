/**
 * A terminal's history of readings: the latest initial (as found) and final (as left) reading at each
 * setpoint, and the reading that stands now. Re-readings after adjustment are all kept; these only
 * pick from them. Framework-free.
 */
import type { TerminalSetpoint } from "@/db/schema";
import type { ReadingPhase } from "./setpoints";

export interface HistoryItem {
  setpoint: TerminalSetpoint;
  phase: ReadingPhase;
  /** ISO string or Date. */
  takenAt: string | Date;
}

export interface LatestPair<R> {
  initial: R | null;
  final: R | null;
}

const time = (r: HistoryItem) => (typeof r.takenAt === "string" ? Date.parse(r.takenAt) : r.takenAt.getTime());

/** Newest first; ties keep their order. */
export function newestFirst<R extends HistoryItem>(readings: readonly R[]): R[] {
  return readings
    .map((r, i) => ({ r, i }))
    .sort((a, b) => time(b.r) - time(a.r) || a.i - b.i)
    .map((x) => x.r);
}

/** The latest initial and final reading at each setpoint read. */
export function latestByPhase<R extends HistoryItem>(readings: readonly R[]): Partial<Record<TerminalSetpoint, LatestPair<R>>> {
  const out: Partial<Record<TerminalSetpoint, LatestPair<R>>> = {};
  for (const r of newestFirst(readings)) {
    const pair = (out[r.setpoint] ??= { initial: null, final: null });
    if (pair[r.phase] === null) pair[r.phase] = r;
  }
  return out;
}

/** The reading that describes the terminal now at a setpoint: the newest of either phase. */
export function currentReading<R extends HistoryItem>(readings: readonly R[], setpoint: TerminalSetpoint): R | null {
  return newestFirst(readings).find((r) => r.setpoint === setpoint) ?? null;
}
