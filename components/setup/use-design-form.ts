"use client";

import { useState, type FormEvent } from "react";
import type { ZodType } from "zod";
import { ApiError } from "@/lib/api-client";
import { parseDecimal, type DesignQuantity, type DesignUnits } from "@/lib/design/quantities";
import { zodFieldErrors } from "@/lib/validation/result";

export type FormValues = Record<string, string | boolean>;

export interface FieldSpec {
  /** The API field the value goes to. */
  name: string;
  label: string;
  type: "text" | "number" | "select" | "checkbox";
  /** Numbers typed in the user's unit for this quantity, converted to SI before validation. */
  quantity?: DesignQuantity;
  required?: boolean;
  /** Selects: an empty choice is sent as null (clears the value) rather than left out. */
  nullable?: boolean;
  /** Selects whose values are numbers (motor phases). */
  numeric?: boolean;
  options?: { value: string; label: string; group?: string }[];
  hint?: string;
  maxLength?: number;
  /** The fieldset the field sits in. */
  group?: string;
  /** Whether the field applies to what has been chosen so far (e.g. diameter only for round ducts). */
  shown?: (values: FormValues) => boolean;
}

interface Options {
  idPrefix: string;
  fields: FieldSpec[];
  initial: FormValues;
  units: DesignUnits;
  /** Values the form does not show but the schema needs (the system of a new section…). */
  fixed?: Record<string, unknown>;
  /** The shared zod schema, built with the user's units so its messages speak them. */
  schema: ZodType;
  /** "create" sends every value; "edit" sends only what the person changed. */
  mode: "create" | "edit";
  save: (payload: Record<string, unknown>) => Promise<unknown>;
  onSaved?: (result: unknown) => void;
  /** Told of every change, for a parent that must keep the values across a remount. */
  onValuesChange?: (values: FormValues) => void;
}

/**
 * A set-up form: values are kept as typed (and kept on error), converted from the user's units to SI,
 * checked with the same schema the server uses, and sent; errors from either side land beside their fields.
 */
export function useDesignForm({ idPrefix, fields, initial, units, fixed = {}, schema, mode, save, onSaved, onValuesChange }: Options) {
  const [values, setValues] = useState<FormValues>(initial);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const isShown = (f: FieldSpec) => (f.shown ? f.shown(values) : true);
  const id = (name: string) => `${idPrefix}-${name}`;

  function set(name: string, value: string | boolean) {
    setValues((v) => {
      const next = { ...v, [name]: value };
      onValuesChange?.(next);
      return next;
    });
  }

  /** What was typed, in SI, with a message for anything that is not a number. */
  function convert(): { data: Record<string, unknown>; bad: Record<string, string> } {
    const data: Record<string, unknown> = { ...fixed };
    const bad: Record<string, string> = {};
    for (const f of fields) {
      const raw = values[f.name];
      if (f.type === "checkbox") {
        data[f.name] = Boolean(raw);
        continue;
      }
      const text = typeof raw === "string" ? raw.trim() : "";
      if (!isShown(f)) {
        data[f.name] = f.type === "text" ? "" : f.type === "select" && !f.nullable ? undefined : null;
        continue;
      }
      if (f.type === "text") data[f.name] = text;
      else if (f.type === "select") data[f.name] = text === "" ? (f.nullable ? null : undefined) : f.numeric ? Number(text) : text;
      else if (text === "") data[f.name] = f.required ? undefined : null;
      else {
        const n = parseDecimal(text);
        if (!n.ok) bad[f.name] = `${f.label}: ${n.message}`;
        else data[f.name] = f.quantity ? units[f.quantity].toSi(n.value) : n.value;
      }
    }
    for (const key of Object.keys(data)) if (data[key] === undefined) delete data[key];
    return { data, bad };
  }

  function focusFirst(fieldErrors: Record<string, string>) {
    const first = fields.find((f) => fieldErrors[f.name] && isShown(f));
    if (first) document.getElementById(id(first.name))?.focus();
  }

  function show(fieldErrors: Record<string, string>, summary: string) {
    const known = new Set(fields.filter(isShown).map((f) => f.name));
    const stray = Object.entries(fieldErrors).filter(([k]) => !known.has(k));
    setErrors(fieldErrors);
    setMessage(stray.length > 0 ? `${summary} ${stray.map(([, m]) => m).join(" ")}` : summary);
    focusFirst(fieldErrors);
  }

  async function submit(event?: FormEvent) {
    event?.preventDefault();
    setMessage(null);
    const { data, bad } = convert();
    if (Object.keys(bad).length > 0) return show(bad, "Some values are not numbers; nothing was saved.");
    const checked = schema.safeParse(data);
    if (!checked.success) {
      const fieldErrors = zodFieldErrors(checked.error);
      return show(fieldErrors, `Check ${Object.keys(fieldErrors).length === 1 ? "the field marked" : `the ${Object.keys(fieldErrors).length} fields marked`} below; nothing was saved.`);
    }
    let payload = data;
    if (mode === "edit") {
      payload = {};
      for (const f of fields) {
        const before = initial[f.name];
        const now = isShown(f) ? values[f.name] : f.type === "checkbox" ? values[f.name] : "";
        const changed = typeof before === "string" && typeof now === "string" ? before.trim() !== now.trim() : before !== now;
        if (changed && f.name in data) payload[f.name] = data[f.name];
      }
      if (Object.keys(payload).length === 0) {
        setErrors({});
        setMessage("Nothing was changed.");
        return;
      }
    }
    setBusy(true);
    try {
      const result = await save(payload);
      setErrors({});
      onSaved?.(result);
    } catch (err) {
      if (err instanceof ApiError) show(err.fields, err.message);
      else setMessage("Saving failed; your values are still here. Try again.");
    } finally {
      setBusy(false);
    }
  }

  return { values, set, errors, message, busy, submit, id, isShown };
}
