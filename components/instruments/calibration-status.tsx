import type { InstrumentUsability, UsabilityStatus } from "@/lib/instruments/usability";

/** Calibration as a sentence and a shape, never colour alone: tick, clock, stop sign, question mark, bar. */
const LOOK: Record<UsabilityStatus, { tone: string; icon: React.ReactNode }> = {
  ok: {
    tone: "text-ok",
    icon: (
      <>
        <circle cx="8" cy="8" r="6.3" fill="none" stroke="currentColor" strokeWidth="1.6" />
        <path d="M5 8.3l2 2 4-4.3" fill="none" stroke="currentColor" strokeWidth="1.9" strokeLinecap="round" strokeLinejoin="round" />
      </>
    ),
  },
  "due-soon": {
    tone: "text-caution",
    icon: (
      <>
        <circle cx="8" cy="8" r="6.3" fill="none" stroke="currentColor" strokeWidth="1.6" />
        <path d="M8 4.5V8l2.4 1.6" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
      </>
    ),
  },
  overdue: {
    tone: "text-fault",
    icon: (
      <>
        <path d="M5.3 1.5h5.4l3.8 3.8v5.4l-3.8 3.8H5.3l-3.8-3.8V5.3z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
        <path d="M8 4.6v4.2M8 11.2v.3" stroke="currentColor" strokeWidth="1.9" strokeLinecap="round" />
      </>
    ),
  },
  "no-due-date": {
    tone: "text-caution",
    icon: (
      <>
        <circle cx="8" cy="8" r="6.3" fill="none" stroke="currentColor" strokeWidth="1.6" />
        <path d="M6.2 6.3a1.9 1.9 0 113 1.5c-.8.5-1.2.9-1.2 1.7M8 11.4v.2" fill="none" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" />
      </>
    ),
  },
  retired: {
    tone: "text-ink-muted",
    icon: (
      <>
        <rect x="2" y="2" width="12" height="12" rx="1.5" fill="none" stroke="currentColor" strokeWidth="1.6" />
        <path d="M5 8h6" stroke="currentColor" strokeWidth="1.9" strokeLinecap="round" />
      </>
    ),
  },
};

export function CalibrationStatus({ usability, compact = false }: { usability: InstrumentUsability; compact?: boolean }) {
  const look = LOOK[usability.status];
  return (
    <span className={`inline-flex items-start gap-1.5 font-semibold ${look.tone} ${compact ? "text-sm" : ""}`}>
      <svg viewBox="0 0 16 16" width="18" height="18" aria-hidden="true" className="mt-0.5 shrink-0">
        {look.icon}
      </svg>
      <span>
        {usability.message}
        {usability.reasonRequired && !compact && <span className="block text-sm font-normal text-ink-soft">Submitted readings with it need a stated reason.</span>}
      </span>
    </span>
  );
}
