/** A judged result in a word and a shape, never colour alone: within (tick), outside (cross), accepted deviation (tick in a square), not measured (dashed circle). */
export type BadgeStatus = "within" | "outside" | "accepted" | "not_measured";

const BADGES: Record<BadgeStatus, { label: string; tone: string; icon: React.ReactNode }> = {
  within: {
    label: "Within band",
    tone: "text-ok",
    icon: <path d="M3 8.5l3 3 7-7" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />,
  },
  outside: {
    label: "Outside band",
    tone: "text-fault",
    icon: <path d="M4 4l8 8M12 4l-8 8" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />,
  },
  accepted: {
    label: "Accepted deviation",
    tone: "text-caution",
    icon: (
      <>
        <rect x="1.5" y="1.5" width="13" height="13" rx="1.5" fill="none" stroke="currentColor" strokeWidth="1.6" />
        <path d="M4.5 8.5l2.2 2.2 4.8-5" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" strokeLinejoin="round" />
      </>
    ),
  },
  not_measured: {
    label: "Not measured",
    tone: "text-ink-soft",
    icon: <circle cx="8" cy="8" r="5.5" fill="none" stroke="currentColor" strokeWidth="1.6" strokeDasharray="2.5 2" />,
  },
};

export function badgeStatusOf(status: "within" | "outside" | "not_measured", accepted: boolean): BadgeStatus {
  return status === "outside" && accepted ? "accepted" : status;
}

export function ResultBadge({ status, label }: { status: BadgeStatus; label?: string }) {
  const b = BADGES[status];
  return (
    <span className={`inline-flex items-center gap-1.5 font-semibold whitespace-nowrap ${b.tone}`}>
      <svg viewBox="0 0 16 16" width="16" height="16" aria-hidden="true" className="shrink-0">
        {b.icon}
      </svg>
      {label ?? b.label}
    </span>
  );
}
