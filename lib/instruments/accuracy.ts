/**
 * From the register to the engine: the maker's stated accuracies of the instruments a traverse was
 * read with, as the engine's uncertainty inputs (lib/airflow/uncertainty.ts). Accuracies not stated
 * in the register are left out, so the engine uses its typical values for them.
 */
import type { InstrumentKind } from "@/db/schema";
import type { InstrumentAccuracy } from "@/lib/airflow/uncertainty";

export interface AccuracySource {
  kind: InstrumentKind;
  accuracyPct: number | null;
  accuracyFloor: number | null;
  humidityAccuracyPct: number | null;
}

function set<K extends keyof InstrumentAccuracy>(out: Partial<InstrumentAccuracy>, key: K, value: number | null): void {
  if (value !== null && Number.isFinite(value)) out[key] = value;
}

/**
 * The accuracies that the given instruments state, keyed as the engine's InstrumentAccuracy. Pass the
 * reading instrument (manometer or anemometer) and the air instruments; pitot tubes, hoods and others
 * carry no accuracy the traverse reduction uses, and are ignored.
 */
export function engineAccuracy(instruments: readonly (AccuracySource | null | undefined)[]): Partial<InstrumentAccuracy> {
  const out: Partial<InstrumentAccuracy> = {};
  for (const i of instruments) {
    if (!i) continue;
    switch (i.kind) {
      case "manometer":
        set(out, "pressureAccuracyPct", i.accuracyPct);
        set(out, "pressureFloorPa", i.accuracyFloor);
        break;
      case "thermal_anemometer":
      case "vane_anemometer":
        set(out, "velocityAccuracyPct", i.accuracyPct);
        set(out, "velocityFloorMS", i.accuracyFloor);
        break;
      case "thermo_hygrometer":
        set(out, "temperatureAccuracyC", i.accuracyFloor);
        set(out, "humidityAccuracyPct", i.humidityAccuracyPct);
        break;
      case "barometer":
        set(out, "barometricAccuracyPa", i.accuracyFloor);
        break;
      default:
        break;
    }
  }
  return out;
}
