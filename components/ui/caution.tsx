/** The site-safety reminder shown wherever readings are taken and in every report. */
export const SAFETY_CAUTIONS = [
  "Before drilling test ports, check for services, wiring and hazardous material behind the duct wall; plug every port afterwards.",
  "Work at height from a secured ladder or platform, following the site's access rules.",
  "Fans and belts: lock out and tag out before opening an access door near rotating equipment.",
  "Hot ducts, steam coils and energised panels: keep clear, or work with the people licensed for them.",
] as const;

export const SAFETY_FOOTNOTE =
  "Results are for the engineer of record's review. Site rules, local codes and licensed practice govern.";

export function Cautions({ title = "Work safely" }: { title?: string }) {
  return (
    <aside aria-labelledby="cautions-title" className="rounded-card border-2 border-caution bg-caution-soft p-4 text-ink">
      <h2 id="cautions-title" className="mb-2 flex items-center gap-2 text-lg text-caution">
        <svg viewBox="0 0 16 16" width="20" height="20" aria-hidden="true">
          <path d="M8 1.5L15 14H1L8 1.5z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
          <path d="M8 6v4M8 11.8v.4" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        </svg>
        {title}
      </h2>
      <ul className="list-disc space-y-1 pl-5 text-sm">
        {SAFETY_CAUTIONS.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
      <p className="mt-2 text-sm font-semibold">{SAFETY_FOOTNOTE}</p>
    </aside>
  );
}
