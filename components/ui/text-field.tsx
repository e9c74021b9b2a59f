import type { InputHTMLAttributes } from "react";

type Props = InputHTMLAttributes<HTMLInputElement> & { id: string; label: string; error?: string };

/** A labelled input with its error beside it, announced to screen readers; 44 px tall for gloved hands. */
export function TextField({ id, label, error, className = "", ...input }: Props) {
  const errorId = `${id}-error`;
  return (
    <div>
      <label htmlFor={id} className="mb-1 block font-semibold">
        {label}
      </label>
      <input
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? errorId : undefined}
        className={`min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 text-base ${className}`}
        {...input}
      />
      {error && (
        <p id={errorId} className="mt-1 text-sm font-semibold text-fault">
          {error}
        </p>
      )}
    </div>
  );
}
