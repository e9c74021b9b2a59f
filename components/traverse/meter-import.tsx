"use client";

/**
 * Readings from a meter's file: choose the CSV, see the values placed on the grid with any count
 * mismatch called out, then accept (the whole grid replaces the one on screen and is saved in one
 * request) or discard. Nothing is saved before "Use these readings".
 */
import { useId, useState } from "react";
import { buttonClasses } from "@/components/ui/button";
import { MAX_METER_FILE_BYTES, METER_UNIT_LABELS, PRESSURE_UNITS, readMeterCsv, VELOCITY_UNITS, type MeterImport as Imported, type MeterUnit } from "@/lib/traverse/meter-csv";
import type { Grid } from "@/lib/traverse/engine-input";
import { formatQuantity, type UnitSystem } from "@/lib/units";

export function MeterImport({
  lines,
  pointsPerLine,
  kind,
  units,
  round,
  hasReadings,
  onAccept,
}: {
  lines: number;
  pointsPerLine: number;
  kind: "pressure" | "velocity";
  units: UnitSystem;
  round: boolean;
  hasReadings: boolean;
  onAccept: (grid: Grid) => void;
}) {
  const id = useId();
  const choices = kind === "pressure" ? PRESSURE_UNITS : VELOCITY_UNITS;
  const [unit, setUnit] = useState<MeterUnit>(kind === "pressure" ? (units === "IP" ? "inH2O" : "Pa") : units === "IP" ? "fpm" : "m/s");
  const [text, setText] = useState<string | null>(null);
  const [fileName, setFileName] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const result = text === null ? null : readMeterCsv(text, { lines, pointsPerLine, kind, chosenUnit: unit });
  const preview: Imported | null = result?.ok ? result.value : null;
  const shown = (si: number) => formatQuantity(units, kind, si);

  async function choose(file: File | undefined) {
    setDone(null);
    setError(null);
    if (!file) return;
    if (file.size > MAX_METER_FILE_BYTES) {
      setError(`${file.name} is ${Math.round(file.size / 1024)} KiB; a traverse's readings fit in far less. Check that it is the right file.`);
      return;
    }
    setFileName(file.name);
    setText(await file.text());
  }

  const discard = () => {
    setText(null);
    setFileName("");
  };

  return (
    <div className="grid gap-3">
      <p className="text-sm text-ink-soft">
        A CSV from the meter: one value per row in traverse order ({round ? "diameter" : "line"} 1 point 1, point 2, … then the next), or columns line, point and value counted from 1. Units from the header when it names them, else:
      </p>
      <div className="flex flex-wrap items-end gap-3">
        <fieldset>
          <legend className="mb-1 font-semibold">Unit in the file</legend>
          <div className="flex gap-2">
            {choices.map((u) => (
              <label key={u} className={`flex min-h-touch cursor-pointer items-center gap-2 rounded-card border-2 px-3 ${unit === u ? "border-accent bg-accent-soft font-semibold" : "border-line-strong bg-paper-raised"}`}>
                <input type="radio" name={`${id}-unit`} checked={unit === u} onChange={() => setUnit(u)} className="h-5 w-5 accent-accent" />
                {METER_UNIT_LABELS[u]}
              </label>
            ))}
          </div>
        </fieldset>
        <div>
          <label htmlFor={`${id}-file`} className="mb-1 block font-semibold">
            Meter file (CSV)
          </label>
          <input
            id={`${id}-file`}
            type="file"
            accept=".csv,.txt,text/csv,text/plain"
            onChange={(e) => void choose(e.target.files?.[0])}
            className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-2 py-2 file:mr-3 file:min-h-9 file:rounded-card file:border-0 file:bg-accent-soft file:px-3 file:font-semibold"
          />
        </div>
      </div>
      {error && <p className="font-semibold text-fault">{error}</p>}
      {result && !result.ok && (
        <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft p-3 font-semibold">
          {fileName}: {result.message}
        </p>
      )}
      {done && (
        <p role="status" className="font-semibold text-ok">
          {done}
        </p>
      )}
      {preview && (
        <section aria-label={`Readings from ${fileName}`} className="grid gap-2 rounded-card border-2 border-accent bg-paper-raised p-3">
          <p className="font-semibold">
            {fileName}: {preview.placed} of {preview.points} points placed ({preview.layout === "sequence" ? "one value per row, in traverse order" : "line, point and value columns"}; {METER_UNIT_LABELS[preview.unit]}
            {preview.unitFrom === "header" ? ", from the file's header" : ", as chosen"}).
          </p>
          {preview.problems.length > 0 && (
            <ul className="list-disc rounded-card border-2 border-caution bg-caution-soft py-2 pr-2 pl-6 text-sm">
              {preview.problems.slice(0, 12).map((p) => (
                <li key={p}>{p}</li>
              ))}
              {preview.problems.length > 12 && <li>… and {preview.problems.length - 12} more.</li>}
            </ul>
          )}
          <div className="overflow-x-auto">
            <table className="border-collapse text-right">
              <caption className="sr-only">The file&apos;s values on the grid</caption>
              <thead>
                <tr>
                  <th scope="col" className="px-2 text-left text-sm">
                    {round ? "Diameter" : "Line"}
                  </th>
                  {Array.from({ length: pointsPerLine }, (_, i) => (
                    <th key={i} scope="col" className="px-2 text-sm">
                      {i + 1}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {preview.grid.map((row, k) => (
                  <tr key={k} className="border-t border-line">
                    <th scope="row" className="px-2 text-left">
                      {k + 1}
                    </th>
                    {row.map((v, i) => (
                      <td key={i} className="num px-2 py-1">
                        {v === null ? <span className="text-ink-soft">empty</span> : shown(v).replace(/ .*$/, "")}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="flex flex-wrap gap-3">
            <button
              type="button"
              className={buttonClasses("primary")}
              onClick={() => {
                onAccept(preview.grid);
                setDone(`Placed ${preview.placed} readings from ${fileName} on the grid; they are saved as one change.`);
                discard();
              }}
            >
              Use these readings
            </button>
            <button type="button" className={buttonClasses("secondary")} onClick={discard}>
              Discard
            </button>
            {hasReadings && <p className="self-center text-sm text-ink-soft">Using them replaces every reading on the grid.</p>}
          </div>
        </section>
      )}
    </div>
  );
}
