/**
 * The site-safety reminders shown wherever readings are taken and in every report. They defer to the
 * site's rules, local codes and licensed practice; Airtally does not replace a site induction.
 */

import { HAZARDS, SAFETY_CAUTIONS, SAFETY_FOOTNOTE, type HazardId } from "@/lib/safety/cautions";

export { HAZARDS, SAFETY_CAUTIONS, SAFETY_FOOTNOTE, type Hazard, type HazardId } from "@/lib/safety/cautions";

/** A shape per hazard, so the tiles are told apart without colour: a drill bit, a ladder, a fan, a flame with a bolt. */
function HazardIcon({ id }: { id: HazardId }) {
  const s = { fill: "none", stroke: "currentColor", strokeWidth: 1.7, strokeLinecap: "round" as const, strokeLinejoin: "round" as const };
  return (
    <svg viewBox="0 0 24 24" width="28" height="28" aria-hidden="true" className="shrink-0">
      {id === "ports" && (
        <>
          <rect x="2.5" y="8" width="9" height="7" rx="1" {...s} />
          <path d="M11.5 11.5h4l5 0M15.5 10l1.5 1.5-1.5 1.5M5 15v4h4" {...s} />
        </>
      )}
      {id === "height" && <path d="M7 3v18M17 3v18M7 7h10M7 11.5h10M7 16h10" {...s} />}
      {id === "rotating" && (
        <>
          <circle cx="12" cy="12" r="2" {...s} />
          <path d="M12 10c0-4 1-6 4-6 1 2 0 5-4 6zM13.7 13c3.5 2 4.7 4 3.2 6.6-2.2-.2-3.8-2.8-3.2-6.6zM10.3 13c-3.5 2-5.8 2-7.2-.6 1.3-1.8 4.3-1.8 7.2.6z" {...s} />
        </>
      )}
      {id === "hot" && (
        <>
          <path d="M9 21c-3 0-5-2.2-5-5 0-3.5 3-5 3-9 2.5 1.5 4 4 4 6.5" {...s} />
          <path d="M16 3l-3.5 7h4L13 21l7-11h-4l2-7z" {...s} />
        </>
      )}
    </svg>
  );
}

/**
 * The reminders as a panel. `layout="tiles"` shows one tile per hazard with its shape (field screens,
 * where a glance must do); `layout="list"` is the compact list used in reports.
 */
export function Cautions({ title = "Work safely", layout = "list" }: { title?: string; layout?: "list" | "tiles" }) {
  return (
    <aside aria-labelledby="cautions-title" className="rounded-card border-2 border-caution bg-caution-soft p-4 text-ink">
      <h2 id="cautions-title" className="mb-2 flex items-center gap-2 text-lg text-caution">
        <svg viewBox="0 0 16 16" width="20" height="20" aria-hidden="true">
          <path d="M8 1.5L15 14H1L8 1.5z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
          <path d="M8 6v4M8 11.8v.4" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        </svg>
        {title}
      </h2>
      {layout === "tiles" ? (
        <ul className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
          {HAZARDS.map((h) => (
            <li key={h.id} className="flex gap-3 rounded-card border border-caution/40 bg-paper-raised p-3">
              <span className="text-caution">
                <HazardIcon id={h.id} />
              </span>
              <span>
                <strong className="block">{h.title}</strong>
                <span className="text-sm">{h.text}</span>
              </span>
            </li>
          ))}
        </ul>
      ) : (
        <ul className="list-disc space-y-1 pl-5 text-sm">
          {SAFETY_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      )}
      <p className="mt-2 text-sm font-semibold">{SAFETY_FOOTNOTE}</p>
    </aside>
  );
}
