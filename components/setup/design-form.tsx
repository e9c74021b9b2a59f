"use client";

import { Button } from "@/components/ui/button";
import type { DesignUnits } from "@/lib/design/quantities";
import { CheckboxInput, FormMessage, NumberInput, SelectInput, TextInput } from "./form-fields";
import { useDesignForm, type FieldSpec } from "./use-design-form";

type Props = Parameters<typeof useDesignForm>[0] & {
  submitLabel: string;
  onCancel?: () => void;
  /** Grid columns of each fieldset at desk widths. */
  columns?: 2 | 3 | 4;
  title?: string;
};

/** Renders field specs as a form: fieldsets by group, errors beside fields, values kept on error. */
export function DesignForm({ submitLabel, onCancel, columns = 3, title, ...options }: Props) {
  const form = useDesignForm(options);
  const groups = [...new Set(options.fields.map((f) => f.group ?? ""))];
  const grid = { 2: "sm:grid-cols-2", 3: "sm:grid-cols-2 lg:grid-cols-3", 4: "sm:grid-cols-2 lg:grid-cols-4" }[columns];
  const render = (f: FieldSpec) => {
    if (!form.isShown(f)) return null;
    const common = { id: form.id(f.name), label: f.label, error: form.errors[f.name], hint: f.hint };
    const value = form.values[f.name];
    if (f.type === "checkbox") return <CheckboxInput key={f.name} {...common} checked={Boolean(value)} onChange={(v) => form.set(f.name, v)} />;
    if (f.type === "select")
      return <SelectInput key={f.name} {...common} required={f.required} value={String(value ?? "")} onChange={(v) => form.set(f.name, v)} options={f.options ?? []} />;
    if (f.type === "number")
      return (
        <NumberInput key={f.name} {...common} required={f.required} unit={f.quantity ? options.units[f.quantity].symbol : undefined} value={String(value ?? "")} onChange={(v) => form.set(f.name, v)} />
      );
    return <TextInput key={f.name} {...common} required={f.required} maxLength={f.maxLength} value={String(value ?? "")} onChange={(v) => form.set(f.name, v)} />;
  };
  return (
    <form onSubmit={form.submit} noValidate aria-label={title} className="space-y-4">
      {groups.map((g) => {
        const fields = options.fields.filter((f) => (f.group ?? "") === g);
        const body = <div className={`grid gap-x-4 gap-y-3 ${grid}`}>{fields.map(render)}</div>;
        return g ? (
          <fieldset key={g} className="rounded-card border border-line p-3">
            <legend className="px-1 font-semibold text-ink-soft">{g}</legend>
            {body}
          </fieldset>
        ) : (
          <div key="(none)">{body}</div>
        );
      })}
      <FormMessage message={form.message} tone="fault" />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" disabled={form.busy}>
          {form.busy ? "Saving…" : submitLabel}
        </Button>
        {onCancel && (
          <Button type="button" variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}

export type { DesignUnits };
