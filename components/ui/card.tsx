import { useId } from "react";

/** A titled panel; the title names the region for assistive technology. */
export function Card({ title, children, actions, className = "" }: { title?: React.ReactNode; children: React.ReactNode; actions?: React.ReactNode; className?: string }) {
  const titleId = useId();
  return (
    <section aria-labelledby={title ? titleId : undefined} className={`rounded-card border border-line bg-paper-raised p-gutter shadow-sm ${className}`}>
      {(title || actions) && (
        <header className="mb-3 flex flex-wrap items-center justify-between gap-3">
          {title && <h2 id={titleId}>{title}</h2>}
          {actions}
        </header>
      )}
      {children}
    </section>
  );
}

export function EmptyState({ children }: { children: React.ReactNode }) {
  return <p className="rounded-card border border-dashed border-line-strong bg-paper p-4 text-ink-soft">{children}</p>;
}
