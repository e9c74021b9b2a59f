"use client";

import { useId } from "react";

export interface Choice<V extends string> {
  value: V;
  label: string;
}

/**
 * A set of large radio buttons for a gloved thumb: each choice a 44 px+ box with a visible radio dot,
 * so the chosen one shows by shape and weight, not colour alone. Arrow keys move between choices.
 */
export function ChoiceGroup<V extends string>({
  legend,
  name,
  choices,
  value,
  onChange,
  error,
  columns = 2,
}: {
  legend: string;
  name: string;
  choices: readonly Choice<V>[];
  value: V;
  onChange: (value: V) => void;
  error?: string;
  columns?: 2 | 4;
}) {
  const id = useId();
  return (
    <fieldset aria-describedby={error ? `${id}-error` : undefined}>
      <legend className="mb-1 font-semibold">{legend}</legend>
      <div className={`grid gap-2 ${columns === 4 ? "grid-cols-2 lg:grid-cols-4" : "grid-cols-2"}`}>
        {choices.map((c) => {
          const checked = c.value === value;
          return (
            <label
              key={c.value}
              className={`flex min-h-touch cursor-pointer items-center gap-3 rounded-card border-2 px-3 py-2 has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-accent ${
                checked ? "border-accent bg-accent-soft font-semibold" : "border-line-strong bg-paper-raised"
              }`}
            >
              <input type="radio" name={`${name}-${id}`} value={c.value} checked={checked} onChange={() => onChange(c.value)} className="h-5 w-5 shrink-0 accent-accent" />
              {c.label}
            </label>
          );
        })}
      </div>
      {error && (
        <p id={`${id}-error`} className="mt-1 text-sm font-semibold text-fault">
          {error}
        </p>
      )}
    </fieldset>
  );
}
