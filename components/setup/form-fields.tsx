"use client";

import type { ReactNode } from "react";

/**
 * Form controls of the set-up screens. Each shows its error beside it, tied to the control with
 * aria-describedby and announced politely; every control is at least 44 px tall.
 */
interface Common {
  id: string;
  label: string;
  error?: string;
  hint?: ReactNode;
  className?: string;
}

function Message({ id, error, hint }: { id: string; error?: string; hint?: ReactNode }) {
  return (
    <>
      {hint && (
        <p id={`${id}-hint`} className="mt-1 text-sm text-ink-muted">
          {hint}
        </p>
      )}
      <p id={`${id}-error`} aria-live="polite" className="mt-1 text-sm font-semibold text-fault empty:hidden">
        {error ? (
          <span className="inline-flex items-start gap-1">
            <svg viewBox="0 0 16 16" width="14" height="14" aria-hidden="true" className="mt-1 shrink-0">
              <path d="M4 4l8 8M12 4l-8 8" fill="none" stroke="currentColor" strokeWidth="2.2" strokeLinecap="round" />
            </svg>
            {error}
          </span>
        ) : null}
      </p>
    </>
  );
}

function describedBy(id: string, error?: string, hint?: ReactNode): string | undefined {
  return [hint ? `${id}-hint` : "", error ? `${id}-error` : ""].filter(Boolean).join(" ") || undefined;
}

const inputClasses = "min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 text-base aria-[invalid=true]:border-fault";

export function TextInput({ id, label, error, hint, className = "", value, onChange, required, maxLength, autoFocus }: Common & { value: string; onChange: (v: string) => void; required?: boolean; maxLength?: number; autoFocus?: boolean }) {
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block font-semibold">
        {label}
        {!required && <span className="font-normal text-ink-muted"> (optional)</span>}
      </label>
      <input
        id={id}
        name={id}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, error, hint)}
        aria-required={required || undefined}
        maxLength={maxLength}
        autoFocus={autoFocus}
        className={inputClasses}
      />
      <Message id={id} error={error} hint={hint} />
    </div>
  );
}

/** A number typed in the user's unit; the unit is part of the label and printed beside the box. */
export function NumberInput({ id, label, unit, error, hint, className = "", value, onChange, required }: Common & { unit?: string; value: string; onChange: (v: string) => void; required?: boolean }) {
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block font-semibold">
        {label}
        {unit && <span className="sr-only"> in {unit}</span>}
        {!required && <span className="font-normal text-ink-muted"> (optional)</span>}
      </label>
      <div className="flex items-center gap-2">
        <input
          id={id}
          name={id}
          inputMode="decimal"
          autoComplete="off"
          value={value}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, error, hint)}
          aria-required={required || undefined}
          className={`${inputClasses} text-right`}
        />
        {unit && (
          <span aria-hidden="true" className="min-w-[3.5rem] text-sm font-semibold text-ink-soft">
            {unit}
          </span>
        )}
      </div>
      <Message id={id} error={error} hint={hint} />
    </div>
  );
}

export function SelectInput({
  id,
  label,
  error,
  hint,
  className = "",
  value,
  onChange,
  options,
  required,
}: Common & { value: string; onChange: (v: string) => void; options: { value: string; label: string; group?: string }[]; required?: boolean }) {
  const groups = [...new Set(options.map((o) => o.group ?? ""))];
  const render = (list: typeof options) =>
    list.map((o) => (
      <option key={o.value} value={o.value}>
        {o.label}
      </option>
    ));
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block font-semibold">
        {label}
        {!required && <span className="font-normal text-ink-muted"> (optional)</span>}
      </label>
      <select
        id={id}
        name={id}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, error, hint)}
        className={inputClasses}
      >
        {groups.length > 1 || groups[0] !== ""
          ? groups.map((g) =>
              g === "" ? (
                render(options.filter((o) => !o.group))
              ) : (
                <optgroup key={g} label={g}>
                  {render(options.filter((o) => o.group === g))}
                </optgroup>
              ),
            )
          : render(options)}
      </select>
      <Message id={id} error={error} hint={hint} />
    </div>
  );
}

export function CheckboxInput({ id, label, error, hint, className = "", checked, onChange }: Common & { checked: boolean; onChange: (v: boolean) => void }) {
  return (
    <div className={className}>
      <label htmlFor={id} className="flex min-h-touch cursor-pointer items-center gap-3 font-semibold">
        <input
          id={id}
          name={id}
          type="checkbox"
          checked={checked}
          onChange={(e) => onChange(e.target.checked)}
          aria-describedby={describedBy(id, error, hint)}
          className="h-6 w-6 accent-accent"
        />
        {label}
      </label>
      <Message id={id} error={error} hint={hint} />
    </div>
  );
}

/** The form's own message (what failed, or what was saved), announced when it changes. */
export function FormMessage({ message, tone }: { message: string | null; tone: "fault" | "ok" }) {
  return (
    <div aria-live="polite">
      {message && (
        <p role={tone === "fault" ? "alert" : "status"} className={`rounded-card border-2 px-3 py-2 font-semibold ${tone === "fault" ? "border-fault bg-fault-soft text-fault" : "border-ok bg-ok-soft text-ok"}`}>
          {message}
        </p>
      )}
    </div>
  );
}
