import "server-only";
import type { ConditionsRow } from "@/db/queries/conditions";
import type { InstrumentUsage } from "@/db/queries/instruments";
import type { Instrument } from "@/db/schema";
import { instrumentName } from "@/lib/instruments/kinds";
import { instrumentUsability } from "@/lib/instruments/usability";

/**
 * An instrument as the API returns it: the stored fields (camelCase, SI for its kind), its display
 * name, and its calibration status as of today (the server's date), in words and as a status.
 */
export function instrumentJson(row: Instrument, usage?: InstrumentUsage, today: Date = new Date()) {
  return {
    ...row,
    name: instrumentName(row),
    calibrationStatus: instrumentUsability(row, today),
    ...(usage ? { usage } : {}),
  };
}
export type InstrumentJson = ReturnType<typeof instrumentJson>;

/** Operating conditions as the API returns them (SI: Pa), with who recorded them. */
export function conditionsJson(row: ConditionsRow) {
  return { ...row };
}
export type ConditionsJson = ReturnType<typeof conditionsJson>;
