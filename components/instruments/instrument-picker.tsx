"use client";

/**
 * Choose an instrument from the register for a set of readings: large choices a gloved thumb can hit,
 * each with its serial and calibration status in words and a shape, judged on the reading date. An
 * instrument past its due date (or with no due date) may be chosen, but asks for the reason that
 * submission will require (`calibrationProblems` in lib/instruments/usability.ts enforces it).
 * The register is kept on the device, so the picker works without network once it has been seen.
 */
import Link from "next/link";
import { useId, useState } from "react";
import type { InstrumentKind } from "@/db/schema";
import { useInstruments, type Instrument } from "@/lib/api-client/field";
import { instrumentUsability, MIN_REASON_LENGTH } from "@/lib/instruments/usability";
import { KIND_INFO } from "@/lib/instruments/kinds";
import { CalibrationStatus } from "./calibration-status";

export interface InstrumentPickerProps {
  /** The kinds that may be chosen, e.g. TRAVERSE_READING_KINDS or ["pitot_tube"]. */
  kinds: readonly InstrumentKind[];
  /** The question, e.g. "Manometer or anemometer". */
  label: string;
  /** The chosen instrument's id, or null. */
  value: string | null;
  onChange: (instrument: Instrument | null) => void;
  /** The day the readings are (or were) taken: calibration is judged on it. Default: today. */
  onDate?: Date | string;
  /** The stated reason for using an instrument past its due date (controlled; sent with the readings). */
  overdueReason?: string;
  onOverdueReasonChange?: (reason: string) => void;
  /** The server's error for this field, shown beside it. */
  error?: string;
  /** Offer "None" (e.g. no separate air instrument). Default false. */
  allowNone?: boolean;
  disabled?: boolean;
}

/** Above this many choices a filter box appears. */
const FILTER_FROM = 7;

export function InstrumentPicker({ kinds, label, value, onChange, onDate, overdueReason, onOverdueReasonChange, error, allowNone = false, disabled = false }: InstrumentPickerProps) {
  const id = useId();
  // One query for the whole register, shared by every picker on the page; each shows its kinds.
  const query = useInstruments();
  const [filter, setFilter] = useState("");
  const day = onDate ?? new Date();
  const instruments = (query.data?.data ?? []).filter((i) => kinds.includes(i.kind));
  const q = filter.trim().toLowerCase();
  const shown = instruments.filter((i) => q === "" || [i.serial, i.make, i.model].some((s) => s.toLowerCase().includes(q)));
  const chosen = instruments.find((i) => i.id === value) ?? null;
  const chosenUsability = chosen ? instrumentUsability(chosen, day) : null;

  return (
    <fieldset disabled={disabled} aria-describedby={error ? `${id}-error` : undefined} className="grid gap-2">
      <legend className="mb-1 font-semibold">{label}</legend>
      {query.data?.fromDevice && <p className="text-sm text-ink-soft">The register as kept on this device (no network).</p>}
      {query.isPending && <p className="text-ink-soft">Loading the instrument register…</p>}
      {query.isError && !query.data && <p className="font-semibold text-fault">The register could not be loaded: {query.error.message}</p>}
      {query.isSuccess && instruments.length === 0 && (
        <p className="rounded-card border border-dashed border-line-strong p-3 text-ink-soft">
          No {kinds.map((k) => KIND_INFO[k].label.toLowerCase()).join(" or ")} in the register.{" "}
          <Link href="/instruments/new" className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
            Add one to the register
          </Link>
        </p>
      )}
      {instruments.length >= FILTER_FROM && (
        <div>
          <label htmlFor={`${id}-filter`} className="sr-only">
            Find {label.toLowerCase()} by serial, make or model
          </label>
          <input
            id={`${id}-filter`}
            type="search"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
            placeholder="Serial, make or model"
            className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3"
          />
        </div>
      )}
      <div className="grid items-start gap-2 sm:grid-cols-2">
        {allowNone && (
          <Choice name={id} checked={value === null} onSelect={() => onChange(null)}>
            <span className="font-semibold">None</span>
          </Choice>
        )}
        {shown.map((i) => {
          const u = instrumentUsability(i, day);
          return (
            <Choice key={i.id} name={id} checked={i.id === value} onSelect={() => onChange(i)} disabled={!u.usable}>
              <span className="block font-semibold">
                {KIND_INFO[i.kind].label} <span className="num whitespace-nowrap">SN {i.serial}</span>
              </span>
              <span className="block text-sm text-ink-soft">{[i.make, i.model].filter(Boolean).join(" ") || "Make and model not recorded"}</span>
              <CalibrationStatus usability={u} compact />
            </Choice>
          );
        })}
      </div>
      {chosenUsability?.reasonRequired && onOverdueReasonChange && (
        <div className="rounded-card border-2 border-caution bg-caution-soft p-3">
          <label htmlFor={`${id}-reason`} className="mb-1 block font-semibold">
            Why is {chosen!.serial} used? <span className="font-normal">({chosenUsability.message.charAt(0).toLowerCase() + chosenUsability.message.slice(1)})</span>
          </label>
          <textarea
            id={`${id}-reason`}
            value={overdueReason ?? ""}
            onChange={(e) => onOverdueReasonChange(e.target.value)}
            rows={2}
            maxLength={500}
            aria-describedby={`${id}-reason-hint`}
            className="w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 py-2"
          />
          <p id={`${id}-reason-hint`} className="text-sm">
            Submitted readings need a reason of at least {MIN_REASON_LENGTH} characters, e.g. the only one on site and how it was checked.
          </p>
        </div>
      )}
      {error && (
        <p id={`${id}-error`} className="text-sm font-semibold text-fault">
          {error}
        </p>
      )}
    </fieldset>
  );
}

function Choice({ name, checked, onSelect, disabled = false, children }: { name: string; checked: boolean; onSelect: () => void; disabled?: boolean; children: React.ReactNode }) {
  return (
    <label
      className={`flex min-h-touch cursor-pointer items-start gap-3 rounded-card border-2 px-3 py-2 has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-accent ${
        checked ? "border-accent bg-accent-soft" : "border-line-strong bg-paper-raised"
      } ${disabled ? "cursor-not-allowed opacity-70" : ""}`}
    >
      <input type="radio" name={name} checked={checked} onChange={onSelect} disabled={disabled} className="mt-1 h-5 w-5 shrink-0 accent-accent" />
      <span className="min-w-0">{children}</span>
    </label>
  );
}
