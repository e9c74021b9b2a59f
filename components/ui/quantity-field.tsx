import type { InputHTMLAttributes } from "react";

type Props = Omit<InputHTMLAttributes<HTMLInputElement>, "id" | "value" | "onChange"> & {
  id: string;
  label: string;
  /** The unit the number is typed in, shown after the label: "°C", "Pa", "rpm" (none for a ratio). */
  unit: string | null;
  value: string;
  onValue: (text: string) => void;
  hint?: string;
  error?: string;
};

/**
 * A labelled number typed as text (so a half-typed "-0." survives), with its unit, a hint and its
 * error, both announced to screen readers; 44 px tall with large digits for gloved hands.
 */
export function QuantityField({ id, label, unit, value, onValue, hint, error, ...input }: Props) {
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <div>
      <label htmlFor={id} className="mb-1 block font-semibold">
        {label} {unit && <span className="font-normal text-ink-soft">({unit})</span>}
      </label>
      <input
        id={id}
        type="text"
        inputMode="decimal"
        autoComplete="off"
        value={value}
        onChange={(e) => onValue(e.target.value)}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hint ? hintId : "", error ? errorId : ""].filter(Boolean).join(" ") || undefined}
        className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 text-xl"
        {...input}
      />
      {hint && (
        <p id={hintId} className="mt-1 text-sm text-ink-soft">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="mt-1 text-sm font-semibold text-fault">
          {error}
        </p>
      )}
    </div>
  );
}
