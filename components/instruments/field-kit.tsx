"use client";

/**
 * Today's kit: the instruments the technician carries on this project, picked once and kept on this
 * device, so each traverse and terminal reading starts with them already chosen.
 */
import { useId } from "react";
import { useFieldKit, type FieldKit as Kit } from "@/lib/api-client/field";
import { AIR_KINDS, TRAVERSE_READING_KINDS } from "@/lib/instruments/kinds";
import { InstrumentPicker } from "./instrument-picker";

const SLOTS: { key: keyof Omit<Kit, "overdueReason">; label: string; kinds: Parameters<typeof InstrumentPicker>[0]["kinds"] }[] = [
  { key: "readingInstrumentId", label: "Manometer or anemometer", kinds: TRAVERSE_READING_KINDS },
  { key: "probeInstrumentId", label: "Pitot tube", kinds: ["pitot_tube"] },
  { key: "airInstrumentId", label: "Thermo-hygrometer", kinds: AIR_KINDS.filter((k) => k === "thermo_hygrometer") },
  { key: "barometerInstrumentId", label: "Barometer", kinds: ["barometer"] },
  { key: "hoodInstrumentId", label: "Capture hood", kinds: ["capture_hood"] },
];

export function FieldKit({ projectId }: { projectId: string }) {
  const headingId = useId();
  const kit = useFieldKit(projectId);
  return (
    <section aria-labelledby={headingId} className="grid gap-4">
      <div>
        <h3 id={headingId} className="text-lg font-semibold">
          Today&apos;s kit on this tablet
        </h3>
        <p className="text-sm text-ink-soft">Pick what you carry; new traverses and terminal readings start with these. Kept on this device only.</p>
      </div>
      <div className="grid gap-gutter lg:grid-cols-2">
        {SLOTS.map((slot) => (
          <InstrumentPicker
            key={slot.key}
            kinds={slot.kinds}
            label={slot.label}
            value={kit.value[slot.key]}
            onChange={(i) => kit.setValue((k) => ({ ...k, [slot.key]: i?.id ?? null }))}
            overdueReason={kit.value.overdueReason}
            onOverdueReasonChange={(reason) => kit.setValue((k) => ({ ...k, overdueReason: reason }))}
            allowNone
            disabled={!kit.ready}
          />
        ))}
      </div>
    </section>
  );
}
