/**
 * Readings from a meter's file: a CSV exported by a manometer or anemometer, read into a traverse's
 * grid. Two layouts are understood: one value per row in traverse order (line by line, point by point,
 * with or without a header), or columns naming the line, the point and the value (numbered from 1, as
 * a meter counts). Units: Pa or in. w.c. for velocity pressures, m/s or fpm for velocities, taken from
 * the header when it names one, else as chosen. Nothing here changes a traverse: the screen shows the
 * placed grid and what did not fit, and the technician accepts or discards it whole.
 */
import Papa from "papaparse";
import { convert, type UnitId } from "@/lib/units";
import type { Grid } from "./engine-input";

export type MeterUnit = "Pa" | "inH2O" | "m/s" | "fpm";
export const PRESSURE_UNITS: readonly MeterUnit[] = ["Pa", "inH2O"];
export const VELOCITY_UNITS: readonly MeterUnit[] = ["m/s", "fpm"];
export const METER_UNIT_LABELS: Record<MeterUnit, string> = { Pa: "Pa", inH2O: "in. w.c.", "m/s": "m/s", fpm: "fpm" };

/** Files larger than this are not a traverse's readings (our bound: 100 × 100 points with long rows fit easily). */
export const MAX_METER_FILE_BYTES = 512 * 1024;

export interface MeterImport {
  layout: "sequence" | "line-point";
  unit: MeterUnit;
  /** Where the unit came from: the file's header, or the choice on screen. */
  unitFrom: "header" | "chosen";
  /** The grid as it would be saved (SI: Pa or m/s), null where the file gave nothing. */
  grid: Grid;
  /** How many values landed on the grid. */
  placed: number;
  /** Values in the file. */
  valuesInFile: number;
  /** Points of the traverse. */
  points: number;
  /** Count mismatches and rows that could not be used, in words; empty when the file fits exactly. */
  problems: string[];
}

export type MeterImportResult = { ok: true; value: MeterImport } | { ok: false; message: string };

const HEADER_UNITS: [RegExp, MeterUnit][] = [
  [/in\.?\s*(w\.?\s*c\.?|wc|h2o|water)|inh2o|"\s*wc/i, "inH2O"],
  [/\bfpm\b|ft\/min|feet per minute/i, "fpm"],
  [/m\/s|\bmps\b|metres? per second|meters? per second/i, "m/s"],
  [/\bpa\b|pascal/i, "Pa"],
];

function unitInHeader(cells: readonly string[]): MeterUnit | null {
  const text = cells.join(" ");
  for (const [re, unit] of HEADER_UNITS) if (re.test(text)) return unit;
  return null;
}

/** "1,5" as 1.5, thousands never (meters do not write them); null when the text is not a number. */
function number(text: string | undefined): number | null {
  if (text === undefined) return null;
  const t = text.trim().replace(/^"|"$/g, "");
  if (t === "") return null;
  const normal = /^-?\d+,\d+$/.test(t) ? t.replace(",", ".") : t;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(normal)) return null;
  const n = Number(normal);
  return Number.isFinite(n) ? n : null;
}

const UNIT_ID: Record<MeterUnit, UnitId> = { Pa: "Pa", inH2O: "inH2O", "m/s": "m/s", fpm: "fpm" };

function toSi(value: number, unit: MeterUnit): number {
  return unit === "Pa" || unit === "m/s" ? value : convert(value, UNIT_ID[unit], unit === "inH2O" ? "Pa" : "m/s");
}

const findColumn = (header: readonly string[], names: RegExp) => header.findIndex((h) => names.test(h.trim()));

/**
 * Reads a meter's CSV for a traverse of `lines` × `pointsPerLine`. `kind` says whether the traverse
 * takes pressures or velocities; `chosenUnit` applies when the header names none.
 */
export function readMeterCsv(text: string, options: { lines: number; pointsPerLine: number; kind: "pressure" | "velocity"; chosenUnit: MeterUnit }): MeterImportResult {
  if (text.length > MAX_METER_FILE_BYTES) return { ok: false, message: `The file is ${Math.round(text.length / 1024)} KiB; a traverse's readings fit in far less (at most ${MAX_METER_FILE_BYTES / 1024} KiB). Check that it is the right file.` };
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { skipEmptyLines: "greedy", delimiter: "", delimitersToGuess: [",", ";", "\t"] });
  const rows = parsed.data.filter((r) => r.some((c) => c.trim() !== ""));
  if (rows.length === 0) return { ok: false, message: "The file holds no rows." };
  const { lines, pointsPerLine } = options;
  const allowed = options.kind === "pressure" ? PRESSURE_UNITS : VELOCITY_UNITS;
  const first = rows[0]!;
  const hasHeader = first.some((c) => c.trim() !== "" && number(c) === null);
  const header = hasHeader ? first : [];
  const body = hasHeader ? rows.slice(1) : rows;
  const headerUnit = unitInHeader(header);
  if (headerUnit && !allowed.includes(headerUnit))
    return { ok: false, message: `The file's header gives ${METER_UNIT_LABELS[headerUnit]}, but this traverse takes ${options.kind === "pressure" ? "velocity pressures (Pa or in. w.c.)" : "velocities (m/s or fpm)"}.` };
  const unit = headerUnit ?? options.chosenUnit;
  const grid: Grid = Array.from({ length: lines }, () => Array<number | null>(pointsPerLine).fill(null));
  const problems: string[] = [];
  const points = lines * pointsPerLine;
  let placed = 0;
  let valuesInFile = 0;

  const lineCol = findColumn(header, /^(line|traverse line|diameter|row)\b/i);
  const pointCol = findColumn(header, /^(point|pt|position)\b/i);
  if (hasHeader && lineCol >= 0 && pointCol >= 0) {
    const valueCol = header.findIndex((h, i) => i !== lineCol && i !== pointCol && /value|reading|pv|pressure|velocity|vp|\bpa\b|fpm|m\/s|w\.?c/i.test(h));
    const col = valueCol >= 0 ? valueCol : header.findIndex((_, i) => i !== lineCol && i !== pointCol);
    if (col < 0) return { ok: false, message: "The file has line and point columns but no value column." };
    const seen = new Set<string>();
    body.forEach((row, n) => {
      const at = `row ${n + (hasHeader ? 2 : 1)}`;
      const line = number(row[lineCol]);
      const point = number(row[pointCol]);
      const value = number(row[col]);
      if (row[col]?.trim() === "" || row[col] === undefined) return;
      valuesInFile++;
      if (line === null || point === null || !Number.isInteger(line) || !Number.isInteger(point)) return void problems.push(`${at}: line and point must be whole numbers counted from 1; got "${row[lineCol] ?? ""}" and "${row[pointCol] ?? ""}".`);
      if (value === null) return void problems.push(`${at}: "${row[col]}" is not a number.`);
      if (line < 1 || line > lines || point < 1 || point > pointsPerLine) return void problems.push(`${at}: line ${line} point ${point} is not on this ${lines} × ${pointsPerLine} traverse.`);
      const key = `${line}:${point}`;
      if (seen.has(key)) problems.push(`${at}: line ${line} point ${point} appears again; the later value is used.`);
      else placed++;
      seen.add(key);
      grid[line - 1]![point - 1] = toSi(value, unit);
    });
    if (placed < points) problems.unshift(`The file gives ${placed} of the ${points} points; the others stay empty.`);
    return { ok: true, value: { layout: "line-point", unit, unitFrom: headerUnit ? "header" : "chosen", grid, placed, valuesInFile, points, problems } };
  }

  // One value per row in traverse order: the first numeric cell of each row (meters often add a time or index column first).
  const valueCol = hasHeader ? findColumn(header, /value|reading|pv|pressure|velocity|vp|\bpa\b|fpm|m\/s|w\.?c/i) : -1;
  const values: number[] = [];
  body.forEach((row, n) => {
    const cell = valueCol >= 0 ? row[valueCol] : row.length === 1 ? row[0] : row.find((c) => number(c) !== null);
    const value = number(cell);
    if (value === null) {
      problems.push(`row ${n + (hasHeader ? 2 : 1)}: "${(cell ?? row.join(",")).slice(0, 40)}" is not a number; skipped.`);
      return;
    }
    values.push(value);
  });
  valuesInFile = values.length;
  values.slice(0, points).forEach((v, n) => {
    grid[Math.floor(n / pointsPerLine)]![n % pointsPerLine] = toSi(v, unit);
    placed++;
  });
  if (values.length < points) problems.unshift(`The file has ${values.length} values; this traverse has ${points} points (${lines} × ${pointsPerLine}). The last ${points - values.length} stay empty.`);
  else if (values.length > points) problems.unshift(`The file has ${values.length} values; this traverse has ${points} points (${lines} × ${pointsPerLine}). The last ${values.length - points} are left out.`);
  return { ok: true, value: { layout: "sequence", unit, unitFrom: headerUnit ? "header" : "chosen", grid, placed, valuesInFile, points, problems } };
}
