/** Airtally's mark: three rising flow bars inside a duct outline. */
export function Wordmark({ size = "md" }: { size?: "md" | "lg" }) {
  const px = size === "lg" ? 40 : 28;
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight ${size === "lg" ? "text-3xl" : "text-xl"}`}>
      <svg viewBox="0 0 32 32" width={px} height={px} aria-hidden="true">
        <rect x="2" y="5" width="28" height="22" rx="3" fill="none" stroke="currentColor" strokeWidth="2.5" />
        <rect x="8" y="16" width="4" height="7" fill="#0d5c8c" />
        <rect x="14" y="12" width="4" height="11" fill="#0d5c8c" />
        <rect x="20" y="9" width="4" height="14" fill="#0d5c8c" />
      </svg>
      Airtally
    </span>
  );
}
