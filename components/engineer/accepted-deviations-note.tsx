import type { AcceptedDeviation } from "@/db/schema";
import { LocalTime } from "@/components/ui/local-time";
import { ResultBadge } from "./result-badge";

/**
 * The standing deviations the engineer of record accepted among the items a screen shows: on field
 * and review screens, so whoever reads an item there knows its result was accepted as it is, and why.
 */
export function AcceptedDeviationsNote({ deviations, title = "Accepted by the engineer of record" }: { deviations: readonly AcceptedDeviation[]; title?: string }) {
  if (deviations.length === 0) return null;
  return (
    <section aria-label={title} className="rounded-card border-2 border-caution bg-paper-raised p-3">
      <h2 className="mb-1 flex items-center gap-2 text-base font-semibold">
        <ResultBadge status="accepted" label={title} />
      </h2>
      <ul className="space-y-1 text-sm">
        {deviations.map((d) => (
          <li key={d.id}>
            <strong>{d.label}</strong> at <span className="num">{d.acceptedValue.toFixed(1)}</span> {d.valueUnit} (band {d.tolerance}), by {d.acceptedByName},{" "}
            <LocalTime iso={d.acceptedAt.toISOString()} />: “{d.reason}”
          </li>
        ))}
      </ul>
    </section>
  );
}
