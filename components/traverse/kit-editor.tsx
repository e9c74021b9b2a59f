"use client";

/**
 * Changing a draft traverse's instruments or operating conditions on the traverse screen: the same
 * register pickers (with calibration status and the reason an overdue instrument needs) and the same
 * conditions picker as when it was started. Choices go into the traverse's offline draft and reach the
 * server with the next readings save; the register's accuracies follow from the server.
 */
import { ConditionsPicker } from "@/components/conditions/conditions-picker";
import { InstrumentPicker } from "@/components/instruments/instrument-picker";
import type { DraftInstrument, Traverse, TraverseDraft } from "@/lib/api-client/traverses";
import type { UnitSystem } from "@/lib/units";

export function KitEditor({
  projectId,
  traverse,
  value,
  units,
  onChange,
}: {
  projectId: string;
  traverse: Traverse;
  value: TraverseDraft;
  units: UnitSystem;
  onChange: (patch: { instrument?: Partial<DraftInstrument>; conditionsId?: string | null }) => void;
}) {
  const i = value.instrument;
  const pitot = traverse.readingsKind === "velocity_pressure";
  const reason = { overdueReason: i.overdueReason, onOverdueReasonChange: (r: string) => onChange({ instrument: { overdueReason: r } }) };
  return (
    <div className="grid gap-4">
      <div className="grid gap-4 xl:grid-cols-2">
        <InstrumentPicker kinds={pitot ? ["manometer"] : ["thermal_anemometer", "vane_anemometer"]} label={pitot ? "Manometer" : "Anemometer"} value={i.readingInstrumentId} onChange={(x) => onChange({ instrument: { readingInstrumentId: x?.id ?? null } })} allowNone {...reason} />
        {pitot && <InstrumentPicker kinds={["pitot_tube"]} label="Pitot tube" value={i.probeInstrumentId} onChange={(x) => onChange({ instrument: { probeInstrumentId: x?.id ?? null } })} allowNone {...reason} />}
        <InstrumentPicker kinds={["thermo_hygrometer"]} label="Thermo-hygrometer" value={i.airInstrumentId} onChange={(x) => onChange({ instrument: { airInstrumentId: x?.id ?? null } })} allowNone {...reason} />
        <InstrumentPicker kinds={["barometer"]} label="Barometer" value={i.barometerInstrumentId} onChange={(x) => onChange({ instrument: { barometerInstrumentId: x?.id ?? null } })} allowNone {...reason} />
      </div>
      <ConditionsPicker
        projectId={projectId}
        system={traverse.system}
        units={units}
        canRecord
        value={value.conditionsId}
        onChange={(c) => onChange({ conditionsId: c?.id ?? null })}
      />
    </div>
  );
}
