/**
 * What must hold before a traverse is submitted, as field → reason, from the traverse as the API
 * returns it: the server refuses a submission with these (400) and the traverse screen lists them
 * beside a disabled Submit button, so both say the same.
 */
import type { Grid } from "@/lib/traverse/engine-input";

export interface SubmittableTraverse {
  readings: Grid;
  unreadable: readonly (readonly number[])[];
  result: { counts?: { points: number; notRead: number } } | null;
  resultError: { message: string } | null;
  air: { dryBulbC: number | null; relativeHumidityPct: number | null; wetBulbC: number | null };
  conditionsId: string | null;
  readingsKind?: string;
  instrument: { readingInstrumentId?: string | null; calibrationProblems: Record<string, string> | null };
}

export function traverseSubmissionProblemsOf(t: SubmittableTraverse): Record<string, string> {
  const fields: Record<string, string> = {};
  if (t.resultError) fields.readings = `cannot be reduced: ${t.resultError.message}`;
  else if (t.result?.counts && t.result.counts.notRead > 0) {
    const missing: string[] = [];
    t.readings.forEach((row, k) => row.forEach((v, i) => v === null && !t.unreadable.some(([a, b]) => a === k && b === i) && missing.push(`line ${k + 1} point ${i + 1}`)));
    fields.readings = `${t.result.counts.notRead} of ${t.result.counts.points} points are neither read nor marked unreadable (${missing.slice(0, 6).join(", ")}${missing.length > 6 ? ", …" : ""}): read them, or mark an obstructed point unreadable`;
  }
  if (t.air.dryBulbC === null) fields["air.dryBulbC"] = "is not recorded: give the dry-bulb temperature at the plane";
  if (t.air.relativeHumidityPct === null && t.air.wetBulbC === null) fields["air.relativeHumidityPct"] = "is not recorded: give the relative humidity or the wet-bulb temperature at the plane";
  if (!t.conditionsId) fields.conditionsId = "is not recorded: name the operating conditions the readings were taken under (Field work → operating conditions)";
  if (t.instrument.readingInstrumentId === null)
    fields["instrument.readingInstrumentId"] = `is not recorded: name the ${t.readingsKind && t.readingsKind !== "velocity_pressure" ? "anemometer" : "manometer"} the points were read with, from the instrument register`;
  Object.assign(fields, t.instrument.calibrationProblems ?? {});
  return fields;
}

/** Field paths in words, for the list beside the Submit button. */
export function problemLabel(field: string): string {
  if (field === "readings") return "Readings";
  if (field === "terminals") return "Terminals";
  if (field.startsWith("air.")) return "Air at the plane";
  if (field === "conditionsId") return "Operating conditions";
  if (field.startsWith("instrument")) return "Instruments";
  if (field.startsWith("readings.")) return `Reading of ${field.split(".")[1]}`;
  return field;
}
