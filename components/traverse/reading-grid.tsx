"use client";

/**
 * The readings grid for a gloved thumb: one large cell per point, lines as rows, `inputmode="decimal"`.
 * Enter (or the keyboard's Next) moves along the line, then to the next line. Each cell shows the
 * point's velocity as soon as the value lands, any flag in words and a shape, and a button to mark the
 * point unreadable (an obstruction) or to read it again. Values are typed in the user's units; the
 * grid holds SI (Pa or m/s).
 */
import { useId, useRef, useState } from "react";
import type { CellFlag } from "@/lib/traverse/plausibility";
import type { Grid, PointRef } from "@/lib/traverse/engine-input";
import type { TraversePointJson } from "@/lib/traverse/result-types";
import { displayUnit, formatQuantity, fromDisplay, toDisplay, type Quantity, type UnitSystem } from "@/lib/units";
import { parseDecimal } from "@/lib/validation/decimal";

export interface ReadingGridProps {
  readings: Grid;
  unreadable: readonly PointRef[];
  /** "pressure" (velocity pressures) or "velocity" (anemometer readings): the unit cells are typed in. */
  quantity: Extract<Quantity, "pressure" | "velocity">;
  units: UnitSystem;
  /** Insertion depth of each point, mm, [line][point]. */
  depthsMm: number[][];
  /** The engine's points (velocity, filled gaps), keyed "line:point". */
  points: ReadonlyMap<string, TraversePointJson>;
  flags: ReadonlyMap<string, CellFlag[]>;
  round: boolean;
  /** Null: read-only (roles that do not record, or a locked traverse). */
  onChange: ((next: { readings: Grid; unreadable: PointRef[] }) => void) | null;
  /** Where Enter goes after the last point. */
  onFinished?: () => void;
  onFocusPoint?: (key: string | null) => void;
}

/** The text a stored SI value shows as: the unit's decimals plus one, trailing zeros dropped. */
export function readingText(si: number | null, quantity: "pressure" | "velocity", units: UnitSystem): string {
  if (si === null) return "";
  const d = displayUnit(units, quantity).decimals + 1;
  const shown = toDisplay(units, quantity, si);
  return String(Number(shown.toFixed(d)));
}

export function ReadingGrid({ readings, unreadable, quantity, units, depthsMm, points, flags, round, onChange, onFinished, onFocusPoint }: ReadingGridProps) {
  const gridId = useId();
  const unit = displayUnit(units, quantity);
  const [texts, setTexts] = useState<Record<string, string>>({});
  const [invalid, setInvalid] = useState<Record<string, boolean>>({});
  const inputs = useRef(new Map<string, HTMLInputElement>());
  const blocked = new Set(unreadable.map(([k, i]) => `${k}:${i}`));
  const lines = readings.length;
  const perLine = readings[0]?.length ?? 0;

  const textFor = (k: number, i: number) => {
    const key = `${k}:${i}`;
    const si = readings[k]?.[i] ?? null;
    const typed = texts[key];
    if (typed !== undefined) {
      const n = parseDecimal(typed);
      // What was typed stays as typed while it still means the stored value (or is being corrected).
      if (n === "invalid" || (n === null && si === null) || (n !== null && si !== null && Math.abs(fromDisplay(units, quantity, n) - si) <= 1e-9 * Math.max(1, Math.abs(si)))) return typed;
    }
    return readingText(si, quantity, units);
  };

  const change = (k: number, i: number, text: string) => {
    if (!onChange) return;
    const key = `${k}:${i}`;
    setTexts((t) => ({ ...t, [key]: text }));
    const n = parseDecimal(text);
    setInvalid((x) => ({ ...x, [key]: n === "invalid" }));
    if (n === "invalid") return;
    const next = readings.map((row) => [...row]);
    next[k]![i] = n === null ? null : fromDisplay(units, quantity, n);
    onChange({ readings: next, unreadable: [...unreadable] });
  };

  const toggleBlocked = (k: number, i: number) => {
    if (!onChange) return;
    const key = `${k}:${i}`;
    if (blocked.has(key)) {
      onChange({ readings, unreadable: unreadable.filter(([a, b]) => a !== k || b !== i) });
      requestAnimationFrame(() => inputs.current.get(key)?.focus());
    } else {
      const next = readings.map((row) => [...row]);
      next[k]![i] = null;
      setTexts((t) => ({ ...t, [key]: "" }));
      onChange({ readings: next, unreadable: [...unreadable, [k, i] as PointRef].sort((a, b) => a[0] - b[0] || a[1] - b[1]) });
    }
  };

  const focusAfter = (k: number, i: number) => {
    for (let n = k * perLine + i + 1; n < lines * perLine; n++) {
      const el = inputs.current.get(`${Math.floor(n / perLine)}:${n % perLine}`);
      if (el) {
        el.focus();
        el.select();
        return;
      }
    }
    onFinished?.();
  };

  const lineName = round ? "Diameter" : "Line";
  return (
    <div className="grid gap-4">
      {readings.map((row, k) => (
        <fieldset key={k} className="min-w-0 rounded-card border border-line bg-paper p-2">
          <legend className="px-1 font-semibold">
            {lineName} {k + 1} · from port P{k + 1} <span className="font-normal text-ink-soft">({unit.symbol})</span>
          </legend>
          <div className="grid gap-2" style={{ gridTemplateColumns: `repeat(auto-fill, minmax(6.75rem, 1fr))` }}>
            {row.map((_, i) => {
              const key = `${k}:${i}`;
              const id = `${gridId}-${k}-${i}`;
              const p = points.get(key);
              const cellFlags = flags.get(key) ?? [];
              const isBlocked = blocked.has(key);
              const bad = invalid[key];
              const velocity = p?.velocityMS ?? null;
              const filled = p?.filledVelocityMS;
              const describe = `${id}-v`;
              return (
                <div
                  key={key}
                  data-cell={key}
                  className={`grid gap-1 rounded-card border-2 p-1.5 ${isBlocked ? "border-dashed border-ink-muted bg-paper-sunk" : cellFlags.length > 0 || bad ? "border-caution bg-caution-soft" : "border-line-strong bg-paper-raised"}`}
                >
                  <label htmlFor={id} className="flex items-baseline justify-between gap-1 text-sm">
                    <span className="font-semibold">
                      <span className="sr-only">
                        {lineName} {k + 1},{" "}
                      </span>
                      Point {i + 1}
                    </span>
                    <span className="num text-ink-soft">
                      <span className="sr-only">at </span>
                      {formatQuantity(units, "dimension", depthsMm[k]?.[i] ?? 0)}
                    </span>
                  </label>
                  {isBlocked ? (
                    <p id={id} className="flex min-h-touch items-center justify-center rounded-card text-center font-semibold text-ink-soft" aria-describedby={describe}>
                      Unreadable
                    </p>
                  ) : onChange ? (
                    <input
                      id={id}
                      ref={(el) => {
                        if (el) inputs.current.set(key, el);
                        else inputs.current.delete(key);
                      }}
                      type="text"
                      inputMode="decimal"
                      enterKeyHint="next"
                      autoComplete="off"
                      spellCheck={false}
                      value={textFor(k, i)}
                      onChange={(e) => change(k, i, e.target.value)}
                      onFocus={() => onFocusPoint?.(key)}
                      onBlur={() => onFocusPoint?.(null)}
                      onKeyDown={(e) => {
                        if (e.key === "Enter") {
                          e.preventDefault();
                          focusAfter(k, i);
                        }
                      }}
                      aria-invalid={bad || cellFlags.length > 0 ? true : undefined}
                      aria-describedby={describe}
                      className="num min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-2 text-center text-2xl"
                    />
                  ) : (
                    <p id={id} className="num flex min-h-touch items-center justify-center text-2xl" aria-describedby={describe}>
                      {textFor(k, i) || "—"}
                    </p>
                  )}
                  <p id={describe} className="min-h-5 text-center text-sm">
                    {bad ? (
                      <span className="font-semibold text-fault">▲ Not a number</span>
                    ) : isBlocked ? (
                      filled !== undefined ? <span className="italic text-ink-soft">filled {formatQuantity(units, "velocity", filled)}</span> : <span className="text-ink-soft">obstruction</span>
                    ) : velocity !== null ? (
                      <span className="num">{formatQuantity(units, "velocity", velocity)}</span>
                    ) : filled !== undefined ? (
                      <span className="italic text-ink-soft">not read · filled {formatQuantity(units, "velocity", filled)}</span>
                    ) : (
                      <span className="text-ink-soft">not read</span>
                    )}
                    {cellFlags.map((f) => (
                      <span key={f.kind} className="block font-semibold text-caution" title={f.message}>
                        ▲ {f.short}
                        <span className="sr-only">: {f.message}</span>
                      </span>
                    ))}
                  </p>
                  {onChange && (
                    <button
                      type="button"
                      onClick={() => toggleBlocked(k, i)}
                      className="min-h-touch rounded-card border border-line-strong bg-paper-raised px-1 text-sm font-semibold text-ink-soft"
                    >
                      {isBlocked ? "Read it" : "Can't read"}
                      <span className="sr-only">
                        {" "}
                        {lineName.toLowerCase()} {k + 1} point {i + 1}
                      </span>
                    </button>
                  )}
                </div>
              );
            })}
          </div>
        </fieldset>
      ))}
    </div>
  );
}
