import type { TraverseStatus } from "@/db/schema";

/** Status is always a word and a shape, never colour alone. */
const STATUS: Record<TraverseStatus, { label: string; tone: string; icon: React.ReactNode }> = {
  draft: {
    label: "In progress",
    tone: "border-line-strong bg-paper-sunk text-ink-soft",
    icon: <path d="M3 13l7-7 3 3-7 7H3v-3z" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinejoin="round" />,
  },
  submitted: {
    label: "Awaiting review",
    tone: "border-caution bg-caution-soft text-caution",
    icon: (
      <>
        <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" strokeWidth="1.8" />
        <path d="M8 4.5V8l2.5 1.5" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
      </>
    ),
  },
  approved: {
    label: "Approved",
    tone: "border-ok bg-ok-soft text-ok",
    icon: <path d="M3 8.5l3 3 7-7" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />,
  },
  returned: {
    label: "Returned",
    tone: "border-fault bg-fault-soft text-fault",
    icon: <path d="M6 3L2.5 6.5 6 10M3 6.5h6.5a4 4 0 010 8H7" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" strokeLinejoin="round" />,
  },
};

export function StatusBadge({ status }: { status: TraverseStatus }) {
  const s = STATUS[status];
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-sm font-semibold ${s.tone}`}>
      <svg viewBox="0 0 16 16" width="16" height="16" aria-hidden="true">
        {s.icon}
      </svg>
      {s.label}
    </span>
  );
}

/** A pass/fail verdict as a word with a shape: a tick or a cross. */
export function Verdict({ pass, passLabel = "Within tolerance", failLabel = "Outside tolerance" }: { pass: boolean; passLabel?: string; failLabel?: string }) {
  return (
    <span className={`inline-flex items-center gap-1.5 font-semibold ${pass ? "text-ok" : "text-fault"}`}>
      <svg viewBox="0 0 16 16" width="16" height="16" aria-hidden="true">
        {pass ? (
          <path d="M3 8.5l3 3 7-7" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />
        ) : (
          <path d="M4 4l8 8M12 4l-8 8" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
        )}
      </svg>
      {pass ? passLabel : failLabel}
    </span>
  );
}
