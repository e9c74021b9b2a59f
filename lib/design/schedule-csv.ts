/**
 * The design schedule file: one CSV of duct sections and terminals, units named in the headers
 * (`design_airflow_cfm`, `width_in`, `straight_upstream_ft`, or their SI twins), so a schedule in
 * cfm and inches imports as it is. Parsing and checking are pure: they take the project's current
 * design and answer, row by row, what would be added or changed and what is wrong.
 */
import Papa from "papaparse";
import { findUnit, FORM_UNITS, parseDecimal, tidyNumber, UNIT_CHOICES, type DesignQuantity, type DesignUnit, type DesignUnits } from "./quantities";
import { AIR_SERVICES, designSchemas, type TerminalKind } from "@/lib/validation/design";
import { zodFieldErrors } from "@/lib/validation/result";
import type { UnitSystem } from "@/lib/units";

/** Upload bounds: a large building's schedule is a few thousand rows. */
export const SCHEDULE_LIMITS = { maxBytes: 1_048_576, maxRows: 5000, maxCellChars: 300 } as const;

type Applies = "both" | "section" | "terminal";
interface PlainColumn {
  name: string;
  applies: Applies;
  description: string;
}
interface QuantityColumn extends PlainColumn {
  quantity: DesignQuantity;
}

/** Columns without a unit. */
export const PLAIN_COLUMNS: readonly PlainColumn[] = [
  { name: "record", applies: "both", description: "`section` or `terminal`." },
  { name: "system", applies: "both", description: "Tag of an air system already in the project (add systems on the Set-up screen first)." },
  { name: "tag", applies: "both", description: "Tag of the section or terminal, unique within its system. A tag already in the system updates that item; a new tag adds one." },
  { name: "parent", applies: "both", description: "Sections: tag of the section upstream, empty for a trunk leaving the fan. Terminals: tag of the section that feeds it." },
  { name: "terminal_type", applies: "terminal", description: "`diffuser`, `grille`, `register` (outlets and inlets), `vav_box` or `constant_volume_box` (terminal units)." },
  { name: "service", applies: "terminal", description: "`supply`, `return`, `exhaust` or `outside_air`; empty takes the system's kind." },
  { name: "shape", applies: "both", description: "`round` or `rectangular`. Sections: required. Terminals: shape of the neck or inlet, empty when its size is not known." },
  { name: "flow_factor", applies: "terminal", description: "Terminal units: the controller's flow factor as configured." },
  { name: "location", applies: "section", description: "Where the section is, for the technician (text)." },
  { name: "room", applies: "terminal", description: "Room served (text)." },
  { name: "device", applies: "terminal", description: "Make, model or description of the device (text)." },
];

/** Columns that carry a unit suffix; each may appear once, in any one of its units. */
export const QUANTITY_COLUMNS: readonly QuantityColumn[] = [
  { name: "diameter", quantity: "dimension", applies: "both", description: "Round duct, neck or inlet: inside diameter." },
  { name: "width", quantity: "dimension", applies: "both", description: "Rectangular: inside width." },
  { name: "height", quantity: "dimension", applies: "both", description: "Rectangular: inside height." },
  { name: "design_airflow", quantity: "flow", applies: "both", description: "Design airflow at standard air; a terminal unit's design maximum. Required." },
  { name: "min_airflow", quantity: "flow", applies: "terminal", description: "Terminal units: design minimum airflow (required for VAV boxes; 0 if the box closes)." },
  { name: "heating_airflow", quantity: "flow", applies: "terminal", description: "VAV boxes: heating airflow, when scheduled." },
  { name: "effective_area", quantity: "area", applies: "terminal", description: "Outlets and inlets: the maker's effective-area factor (Ak), when known." },
  { name: "straight_upstream", quantity: "run", applies: "section", description: "Straight duct before the traverse plane." },
  { name: "straight_downstream", quantity: "run", applies: "section", description: "Straight duct after the traverse plane." },
];

const REQUIRED = ["record", "system", "tag", "parent", "design_airflow"] as const;

/** Which API field each column fills, for mapping validation messages back to columns. */
const FIELD_OF: Record<string, string> = {
  tag: "tag",
  terminal_type: "kind",
  service: "service",
  flow_factor: "controllerFlowFactor",
  location: "location",
  room: "room",
  device: "device",
  diameter: "diameterMm",
  width: "widthMm",
  height: "heightMm",
  design_airflow: "designFlowM3S",
  min_airflow: "designMinFlowM3S",
  heating_airflow: "designHeatingFlowM3S",
  effective_area: "effectiveAreaM2",
  straight_upstream: "straightUpstreamMm",
  straight_downstream: "straightDownstreamMm",
};
const COLUMN_OF_FIELD: Record<string, string> = { ...Object.fromEntries(Object.entries(FIELD_OF).map(([c, f]) => [f, c])), shape: "shape", sizeShape: "shape", parentId: "parent", sectionId: "parent", systemId: "system" };

/** The unit suffixes each quantity column accepts, for messages and the README. */
export function unitSuffixes(quantity: DesignQuantity): string[] {
  return UNIT_CHOICES[quantity].map((u) => u.id);
}

export interface CellError {
  /** The column as written in the file's header (or the column's name when the file lacks it). */
  column: string;
  message: string;
}

export type RowAction = "add" | "update" | "unchanged";

export interface PreviewRow {
  /** Line of the file, the header being line 1. */
  line: number;
  record: "section" | "terminal" | null;
  system: string;
  tag: string;
  parent: string;
  /** Size and design airflow as the file gives them, for the preview table. */
  size: string;
  airflow: string;
  action: RowAction | null;
  errors: CellError[];
}

export interface SchedulePreview {
  ok: boolean;
  /** Problems with the file as a whole (size, header, unreadable CSV). */
  fileErrors: string[];
  rows: PreviewRow[];
  counts: { rows: number; add: number; update: number; unchanged: number; withErrors: number };
  /** The unit of each quantity column present, e.g. {flow: "cfm", dimension: "in"}. */
  units: Partial<Record<DesignQuantity, string>>;
}

/** What the project holds now, as the check needs it. */
export interface ExistingDesign {
  systems: { id: string; tag: string; kind: "supply" | "return" | "exhaust" | "outside_air" }[];
  sections: { id: string; systemId: string; parentId: string | null; tag: string; shape: "round" | "rectangular"; diameterMm: number | null; widthMm: number | null; heightMm: number | null; designFlowM3S: number; straightUpstreamMm: number | null; straightDownstreamMm: number | null; location: string }[];
  terminals: {
    id: string;
    sectionId: string;
    tag: string;
    kind: TerminalKind;
    service: (typeof AIR_SERVICES)[number];
    room: string;
    device: string;
    sizeShape: "round" | "rectangular" | null;
    diameterMm: number | null;
    widthMm: number | null;
    heightMm: number | null;
    designFlowM3S: number;
    designMinFlowM3S: number | null;
    designHeatingFlowM3S: number | null;
    effectiveAreaM2: number | null;
    controllerFlowFactor: number | null;
  }[];
}

/** One checked row, ready to apply: API-shaped SI values and the tags it hangs from. */
export interface PlannedSection {
  line: number;
  systemId: string;
  tag: string;
  parentTag: string | null;
  existingId: string | null;
  action: RowAction;
  values: { shape: "round" | "rectangular"; diameterMm: number | null; widthMm: number | null; heightMm: number | null; designFlowM3S: number; straightUpstreamMm: number | null; straightDownstreamMm: number | null; location: string };
}
export interface PlannedTerminal {
  line: number;
  systemId: string;
  tag: string;
  parentTag: string;
  existingId: string | null;
  action: RowAction;
  values: Omit<ExistingDesign["terminals"][number], "id" | "sectionId">;
}
export interface SchedulePlan {
  preview: SchedulePreview;
  /** Sections in an order where every parent comes before its branches. */
  sections: PlannedSection[];
  terminals: PlannedTerminal[];
}

const PLACEHOLDER_ID = "00000000-0000-4000-8000-000000000000";
const FORMULA_START = /^[=+\-@\t\r]/;

function normalizeHeader(h: string): string {
  return h
    .replace(/^\uFEFF/, "")
    .trim()
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "_")
    .replace(/^_+|_+$/g, "");
}

/** Undoes the quote that export puts before text a spreadsheet would take for a formula. */
function cellText(raw: string | undefined): string {
  const t = (raw ?? "").trim();
  return t.startsWith("'") && FORMULA_START.test(t.slice(1)) ? t.slice(1) : t;
}

interface HeaderMap {
  /** Column base name → index in the row and the header as written. */
  index: Map<string, { at: number; header: string }>;
  units: Partial<Record<DesignQuantity, DesignUnit>>;
  unitOf: Map<string, DesignUnit>;
  errors: string[];
}

function readHeader(header: string[]): HeaderMap {
  const index = new Map<string, { at: number; header: string }>();
  const unitOf = new Map<string, DesignUnit>();
  const units: Partial<Record<DesignQuantity, DesignUnit>> = {};
  const errors: string[] = [];
  header.forEach((raw, at) => {
    const name = normalizeHeader(raw);
    if (name === "") {
      if (raw.trim() !== "") errors.push(`Column ${at + 1} ("${raw.slice(0, 40)}") has no usable name.`);
      return;
    }
    let base = PLAIN_COLUMNS.find((c) => c.name === name)?.name;
    let unit: DesignUnit | undefined;
    if (!base) {
      for (const q of QUANTITY_COLUMNS) {
        if (!name.startsWith(`${q.name}_`)) continue;
        const suffix = name.slice(q.name.length + 1);
        unit = findUnit(q.quantity, suffix);
        if (!unit) {
          errors.push(`Column "${raw.trim()}": ${q.name} needs a unit we know: ${unitSuffixes(q.quantity).map((s) => `${q.name}_${s}`).join(", ")}.`);
          base = "";
        } else base = q.name;
        break;
      }
      if (base === undefined) {
        const bare = QUANTITY_COLUMNS.find((q) => q.name === name);
        errors.push(
          bare
            ? `Column "${raw.trim()}" needs its unit in the name, e.g. ${unitSuffixes(bare.quantity).map((s) => `${bare.name}_${s}`).join(" or ")}.`
            : `Column "${raw.trim().slice(0, 60)}" is not one we know. The columns are listed in the README under "Design schedule CSV".`,
        );
        return;
      }
      if (base === "") return;
    }
    const already = index.get(base);
    if (already) {
      errors.push(`${base} is given twice ("${already.header}" and "${raw.trim()}"); keep one column.`);
      return;
    }
    index.set(base, { at, header: raw.trim() });
    if (unit) {
      unitOf.set(base, unit);
      const q = QUANTITY_COLUMNS.find((c) => c.name === base)!.quantity;
      // Messages state limits in the file's unit; the first column of a quantity sets it.
      units[q] ??= unit;
    }
  });
  for (const r of REQUIRED)
    if (!index.has(r)) errors.push(r === "design_airflow" ? "The file needs a design airflow column, e.g. design_airflow_cfm or design_airflow_l_s." : `The file needs a "${r}" column.`);
  return { index, units, unitOf, errors };
}

/** The file's own units for messages, falling back to SI for quantities it does not use. */
function messageUnits(h: HeaderMap): DesignUnits {
  return { ...FORM_UNITS.SI, ...h.units } as DesignUnits;
}

function near(a: number | null | undefined, b: number | null | undefined): boolean {
  if (a === null || a === undefined || b === null || b === undefined) return (a ?? null) === (b ?? null);
  // The export writes six significant figures: values that round-trip through a file are the same.
  return Math.abs(a - b) <= 1e-5 * Math.max(Math.abs(a), Math.abs(b));
}
function sameValues(a: Record<string, unknown>, b: Record<string, unknown>): boolean {
  return Object.keys(a).every((k) => (typeof a[k] === "number" || typeof b[k] === "number" ? near(a[k] as number | null, b[k] as number | null) : (a[k] ?? null) === (b[k] ?? null)));
}

/** Parses and checks a schedule against the project's design; nothing is written. */
export function planSchedule(text: string, existing: ExistingDesign): SchedulePlan {
  const empty = (fileErrors: string[]): SchedulePlan => ({
    preview: { ok: false, fileErrors, rows: [], counts: { rows: 0, add: 0, update: 0, unchanged: 0, withErrors: 0 }, units: {} },
    sections: [],
    terminals: [],
  });
  if (new TextEncoder().encode(text).length > SCHEDULE_LIMITS.maxBytes) return empty([`The file is larger than ${SCHEDULE_LIMITS.maxBytes / 1_048_576} MiB; split it by system.`]);
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { header: false, skipEmptyLines: false, delimitersToGuess: [",", ";", "\t"] });
  const records = parsed.data;
  while (records.length > 0 && records[records.length - 1]!.every((c) => c.trim() === "")) records.pop();
  const headerAt = records.findIndex((r) => !(r.length === 1 && r[0]!.trim() === "") && !r[0]!.trim().startsWith("#"));
  if (headerAt < 0) return empty(["The file is empty: it needs a header line and one line per section or terminal."]);
  const dataCount = records.length - headerAt - 1;
  if (dataCount > SCHEDULE_LIMITS.maxRows) return empty([`The file has ${dataCount} lines; at most ${SCHEDULE_LIMITS.maxRows} are taken at once. Split it by system.`]);
  const fileErrors = parsed.errors
    .filter((e) => e.type === "Quotes")
    .slice(0, 5)
    .map((e) => `Line ${(e.row ?? 0) + 1}: ${e.message}.`);
  const h = readHeader(records[headerAt]!);
  fileErrors.push(...h.errors);
  if (fileErrors.length > 0) return empty(fileErrors);

  const units = messageUnits(h);
  const schemas = designSchemas(units);
  const headerOf = (base: string) => h.index.get(base)?.header ?? base;
  const systemsByTag = new Map(existing.systems.map((s) => [s.tag.toLowerCase(), s]));
  const sectionSystem = new Map(existing.sections.map((s) => [s.id, s.systemId]));
  const oldSection = (systemId: string | undefined, tag: string) =>
    systemId ? existing.sections.find((s) => s.systemId === systemId && s.tag.toLowerCase() === tag.toLowerCase()) : undefined;
  const oldTerminal = (systemId: string | undefined, tag: string) => {
    const found = systemId ? existing.terminals.filter((t) => sectionSystem.get(t.sectionId) === systemId && t.tag.toLowerCase() === tag.toLowerCase()) : [];
    return found.length === 1 ? found[0] : undefined;
  };
  /** A column the file does not have leaves an existing item's value as it is; an empty cell clears it. */
  const given = (base: string) => h.index.has(base);

  interface Work {
    row: PreviewRow;
    systemId: string | null;
    section?: PlannedSection["values"];
    terminal?: PlannedTerminal["values"];
  }
  const work: Work[] = [];

  for (let i = headerAt + 1; i < records.length; i++) {
    const cells = records[i]!;
    if (cells.every((c) => c.trim() === "") || cells[0]!.trim().startsWith("#")) continue;
    const errors: CellError[] = [];
    const cell = (base: string) => {
      const at = h.index.get(base)?.at;
      const value = at === undefined ? "" : cellText(cells[at]);
      return value;
    };
    for (const c of cells)
      if (c.length > SCHEDULE_LIMITS.maxCellChars) {
        errors.push({ column: "(line)", message: `A cell is longer than ${SCHEDULE_LIMITS.maxCellChars} characters.` });
        break;
      }
    const recordText = cell("record").toLowerCase();
    const record = recordText === "section" || recordText === "terminal" ? recordText : null;
    if (!record) errors.push({ column: headerOf("record"), message: recordText ? `"${recordText.slice(0, 30)}" is not a record kind; write section or terminal.` : "Write section or terminal." });
    const systemTag = cell("system");
    const tagText = cell("tag");
    const parentText = cell("parent");
    const system = systemTag ? systemsByTag.get(systemTag.toLowerCase()) : undefined;
    if (!systemTag) errors.push({ column: headerOf("system"), message: "Give the tag of the air system." });
    else if (!system) errors.push({ column: headerOf("system"), message: `No air system ${systemTag} in this project (it has ${existing.systems.map((s) => s.tag).join(", ") || "none yet"}). Add the system on the Set-up screen first.` });

    const number = (base: string): number | null | undefined => {
      const raw = cell(base);
      if (raw === "") return null;
      const n = parseDecimal(raw);
      if (!n.ok) {
        errors.push({ column: headerOf(base), message: n.message });
        return undefined;
      }
      const unit = h.unitOf.get(base);
      return unit ? unit.toSi(n.value) : n.value;
    };
    const notFor = (bases: string[], what: string) => {
      for (const b of bases) if (cell(b) !== "") errors.push({ column: headerOf(b), message: `Only ${what} rows take ${b}; leave it empty here.` });
    };

    const dims = { diameterMm: number("diameter"), widthMm: number("width"), heightMm: number("height") };
    const flow = number("design_airflow");
    const shapeText = cell("shape").toLowerCase();
    const unitText = (base: string) => {
      const raw = cell(base);
      const unit = h.unitOf.get(base);
      return raw === "" ? "" : `${raw} ${unit?.symbol ?? ""}`.trim();
    };
    const size =
      shapeText === "round" ? (cell("diameter") ? `Ø ${unitText("diameter")}` : "") : shapeText === "rectangular" ? `${cell("width") || "?"} × ${unitText("height") || "?"}` : "";
    const row: PreviewRow = { line: i + 1, record, system: systemTag, tag: tagText, parent: parentText, size, airflow: unitText("design_airflow"), action: null, errors };
    const w: Work = { row, systemId: system?.id ?? null };

    const apply = (result: { success: true; data: unknown } | { success: false; error: Parameters<typeof zodFieldErrors>[0] }) => {
      if (result.success) return;
      for (const [field, message] of Object.entries(zodFieldErrors(result.error))) {
        const base = COLUMN_OF_FIELD[field];
        // A number the row could not read is already reported; do not add "enter the value" for it.
        if (base && errors.some((e) => e.column === headerOf(base))) continue;
        errors.push({ column: base ? headerOf(base) : field, message });
      }
    };

    if (record === "section") {
      notFor(["terminal_type", "service", "min_airflow", "heating_airflow", "effective_area", "flow_factor", "room", "device"], "terminal");
      const old = oldSection(system?.id, tagText);
      const keep = <T,>(base: string, value: T, previous: T | undefined): T => (!given(base) && old ? (previous as T) : value);
      const shape = keep("shape", shapeText, old?.shape) as "round" | "rectangular";
      const values = {
        shape,
        diameterMm: keep("diameter", dims.diameterMm ?? null, old?.diameterMm),
        widthMm: keep("width", dims.widthMm ?? null, old?.widthMm),
        heightMm: keep("height", dims.heightMm ?? null, old?.heightMm),
        designFlowM3S: flow as number,
        straightUpstreamMm: keep("straight_upstream", number("straight_upstream") ?? null, old?.straightUpstreamMm),
        straightDownstreamMm: keep("straight_downstream", number("straight_downstream") ?? null, old?.straightDownstreamMm),
        location: keep("location", cell("location"), old?.location),
      };
      apply(schemas.section.safeParse({ ...values, systemId: PLACEHOLDER_ID, parentId: parentText ? PLACEHOLDER_ID : null, tag: tagText, shape: shape || undefined, designFlowM3S: flow ?? undefined }));
      w.section = values;
    } else if (record === "terminal") {
      notFor(["straight_upstream", "straight_downstream", "location"], "section");
      if (!parentText) errors.push({ column: headerOf("parent"), message: "Give the tag of the section that feeds this terminal." });
      const old = oldTerminal(system?.id, tagText);
      const keep = <T,>(base: string, value: T, previous: T | undefined): T => (!given(base) && old ? (previous as T) : value);
      const kindText = keep("terminal_type", cell("terminal_type").toLowerCase(), old?.kind);
      const serviceText = keep("service", cell("service").toLowerCase(), old?.service);
      const shape = keep("shape", shapeText || null, old?.sizeShape) as "round" | "rectangular" | null;
      const values = {
        tag: tagText,
        kind: kindText as TerminalKind,
        service: (serviceText || system?.kind || "supply") as (typeof AIR_SERVICES)[number],
        room: keep("room", cell("room"), old?.room),
        device: keep("device", cell("device"), old?.device),
        sizeShape: shape,
        diameterMm: keep("diameter", dims.diameterMm ?? null, old?.diameterMm),
        widthMm: keep("width", dims.widthMm ?? null, old?.widthMm),
        heightMm: keep("height", dims.heightMm ?? null, old?.heightMm),
        designFlowM3S: flow as number,
        designMinFlowM3S: keep("min_airflow", number("min_airflow") ?? null, old?.designMinFlowM3S),
        designHeatingFlowM3S: keep("heating_airflow", number("heating_airflow") ?? null, old?.designHeatingFlowM3S),
        effectiveAreaM2: keep("effective_area", number("effective_area") ?? null, old?.effectiveAreaM2),
        controllerFlowFactor: keep("flow_factor", number("flow_factor") ?? null, old?.controllerFlowFactor),
      };
      apply(
        schemas.terminal.safeParse({
          ...values,
          sectionId: PLACEHOLDER_ID,
          kind: kindText || undefined,
          service: serviceText || undefined,
          designFlowM3S: flow ?? undefined,
        }),
      );
      w.terminal = values;
    }
    work.push(w);
  }

  // Duplicate tags within the file, per system: sections and terminals have their own tags.
  const seen = new Map<string, number>();
  for (const w of work) {
    if (!w.row.record || !w.row.tag || !w.systemId) continue;
    const key = `${w.row.record}:${w.systemId}:${w.row.tag.toLowerCase()}`;
    const first = seen.get(key);
    if (first !== undefined) w.row.errors.push({ column: headerOf("tag"), message: `${w.row.tag} is already on line ${first} for ${w.row.system}; each ${w.row.record} tag appears once per system.` });
    else seen.set(key, w.row.line);
  }

  // The duct tree after the file: existing sections, with the file's sections added or moved.
  const sectionKey = (systemId: string, tag: string) => `${systemId}:${tag.toLowerCase()}`;
  const existingSections = new Map(existing.sections.map((s) => [sectionKey(s.systemId, s.tag), s]));
  const existingById = new Map(existing.sections.map((s) => [s.id, s]));
  const finalParent = new Map<string, string | null>();
  const finalTag = new Map<string, string>();
  for (const s of existing.sections) {
    finalParent.set(sectionKey(s.systemId, s.tag), s.parentId ? sectionKey(s.systemId, existingById.get(s.parentId)?.tag ?? "") : null);
    finalTag.set(sectionKey(s.systemId, s.tag), s.tag);
  }
  const fileSections = work.filter((w) => w.row.record === "section" && w.systemId && w.row.tag);
  for (const w of fileSections) {
    const key = sectionKey(w.systemId!, w.row.tag);
    finalParent.set(key, w.row.parent ? sectionKey(w.systemId!, w.row.parent) : null);
    finalTag.set(key, w.row.tag);
  }

  for (const w of work) {
    if (!w.systemId || !w.row.parent) continue;
    const parentKey = sectionKey(w.systemId, w.row.parent);
    if (!finalParent.has(parentKey))
      w.row.errors.push({ column: headerOf("parent"), message: `No section ${w.row.parent} in ${w.row.system}, in the file or the project.` });
    else if (w.row.record === "section" && parentKey === sectionKey(w.systemId, w.row.tag))
      w.row.errors.push({ column: headerOf("parent"), message: `${w.row.tag} cannot be its own parent.` });
  }
  // Loops: follow each file section's parents up; coming back to it means a loop.
  for (const w of fileSections) {
    const start = sectionKey(w.systemId!, w.row.tag);
    const path = [start];
    let at = finalParent.get(start) ?? null;
    while (at && path.length <= finalParent.size + 1) {
      path.push(at);
      if (at === start) break;
      at = finalParent.get(at) ?? null;
    }
    if (at === start && path.length > 2)
      w.row.errors.push({ column: headerOf("parent"), message: `The parents make a loop: ${path.map((k) => finalTag.get(k) ?? k).join(" → ")}. A section cannot sit below its own branches.` });
  }

  // Existing items these rows update, and whether anything changes.
  const existingTerminals = new Map<string, ExistingDesign["terminals"][number][]>();
  for (const t of existing.terminals) {
    const section = existingById.get(t.sectionId);
    if (!section) continue;
    const key = `${section.systemId}:${t.tag.toLowerCase()}`;
    existingTerminals.set(key, [...(existingTerminals.get(key) ?? []), t]);
  }
  const plannedSections: PlannedSection[] = [];
  const plannedTerminals: PlannedTerminal[] = [];
  for (const w of work) {
    if (!w.systemId || !w.row.record) continue;
    if (w.row.record === "section" && w.section) {
      const old = existingSections.get(sectionKey(w.systemId, w.row.tag));
      const parentTag = w.row.parent || null;
      const oldParentTag = old?.parentId ? existingById.get(old.parentId)?.tag ?? null : null;
      const action: RowAction = !old
        ? "add"
        : sameValues(w.section, old) && (parentTag ?? "").toLowerCase() === (oldParentTag ?? "").toLowerCase() && old.tag === w.row.tag
          ? "unchanged"
          : "update";
      w.row.action = action;
      plannedSections.push({ line: w.row.line, systemId: w.systemId, tag: w.row.tag, parentTag, existingId: old?.id ?? null, action, values: w.section });
    } else if (w.row.record === "terminal" && w.terminal) {
      const matches = existingTerminals.get(`${w.systemId}:${w.row.tag.toLowerCase()}`) ?? [];
      if (matches.length > 1) {
        w.row.errors.push({ column: headerOf("tag"), message: `${w.row.system} already has ${matches.length} terminals tagged ${w.row.tag}; rename them on the Set-up screen so each tag is once per system.` });
        continue;
      }
      const old = matches[0];
      const oldParentTag = old ? existingById.get(old.sectionId)?.tag ?? "" : "";
      const { id: _id, sectionId: _section, ...oldValues } = old ?? ({} as ExistingDesign["terminals"][number]);
      void _id;
      void _section;
      const action: RowAction = !old ? "add" : sameValues(w.terminal, oldValues) && oldParentTag.toLowerCase() === w.row.parent.toLowerCase() ? "unchanged" : "update";
      w.row.action = action;
      plannedTerminals.push({ line: w.row.line, systemId: w.systemId, tag: w.row.tag, parentTag: w.row.parent, existingId: old?.id ?? null, action, values: w.terminal });
    }
  }

  const rows = work.map((w) => w.row);
  const withErrors = rows.filter((r) => r.errors.length > 0).length;
  if (rows.length === 0) fileErrors.push("The file has a header but no sections or terminals.");
  const preview: SchedulePreview = {
    ok: withErrors === 0 && fileErrors.length === 0,
    fileErrors,
    rows,
    counts: {
      rows: rows.length,
      add: rows.filter((r) => r.action === "add").length,
      update: rows.filter((r) => r.action === "update").length,
      unchanged: rows.filter((r) => r.action === "unchanged").length,
      withErrors,
    },
    units: Object.fromEntries(Object.entries(h.units).map(([q, u]) => [q, u.symbol])),
  };
  return { preview, sections: orderParentsFirst(plannedSections, existing), terminals: plannedTerminals };
}

/** Sections ordered so that a parent added by the file comes before its branches. */
function orderParentsFirst(sections: PlannedSection[], existing: ExistingDesign): PlannedSection[] {
  const key = (s: { systemId: string; tag: string }) => `${s.systemId}:${s.tag.toLowerCase()}`;
  const byKey = new Map(sections.map((s) => [key(s), s]));
  const done = new Set<string>();
  const out: PlannedSection[] = [];
  const visit = (s: PlannedSection, depth: number) => {
    const k = key(s);
    if (done.has(k) || depth > sections.length + existing.sections.length) return;
    if (s.parentTag) {
      const parent = byKey.get(`${s.systemId}:${s.parentTag.toLowerCase()}`);
      if (parent && parent !== s) visit(parent, depth + 1);
    }
    if (!done.has(k)) {
      done.add(k);
      out.push(s);
    }
  };
  for (const s of sections) visit(s, 0);
  return out;
}

// ---------------------------------------------------------------- export

/** The columns written for each unit system: IP in cfm, inches, feet and ft²; SI in L/s, mm, m and m². */
export function exportColumns(units: UnitSystem): string[] {
  const u = FORM_UNITS[units];
  const q = (name: string, quantity: DesignQuantity) => `${name}_${(quantity === "run" ? u.run : u[quantity]).id}`;
  return [
    "record",
    "system",
    "tag",
    "parent",
    "terminal_type",
    "service",
    "shape",
    q("diameter", "dimension"),
    q("width", "dimension"),
    q("height", "dimension"),
    q("design_airflow", "flow"),
    q("min_airflow", "flow"),
    q("heating_airflow", "flow"),
    q("effective_area", "area"),
    "flow_factor",
    q("straight_upstream", "run"),
    q("straight_downstream", "run"),
    "location",
    "room",
    "device",
  ];
}

function safeText(value: string): string {
  // A spreadsheet would run a cell that starts like a formula; a leading quote keeps it text (and import removes it).
  return FORMULA_START.test(value) ? `'${value}` : value;
}

/**
 * The project's design as a schedule file in one unit system. Per system, each section is followed by
 * its terminals and then its branches, so the file reads down the duct tree and re-imports as it is.
 */
export function exportSchedule(design: ExistingDesign, units: UnitSystem): string {
  const u = FORM_UNITS[units];
  const n = (unit: DesignUnit, v: number | null) => (v === null ? "" : tidyNumber(unit.fromSi(v), 6, false));
  const rows: string[][] = [];
  const sectionsById = new Map(design.sections.map((s) => [s.id, s]));
  const byTag = (a: { tag: string }, b: { tag: string }) => a.tag.localeCompare(b.tag, "en", { numeric: true });
  for (const system of [...design.systems].sort(byTag)) {
    const sections = design.sections.filter((s) => s.systemId === system.id);
    const children = (parentId: string | null) => sections.filter((s) => s.parentId === parentId).sort(byTag);
    const visit = (s: ExistingDesign["sections"][number]) => {
      rows.push([
        "section",
        safeText(system.tag),
        safeText(s.tag),
        safeText(s.parentId ? sectionsById.get(s.parentId)?.tag ?? "" : ""),
        "",
        "",
        s.shape,
        n(u.dimension, s.diameterMm),
        n(u.dimension, s.widthMm),
        n(u.dimension, s.heightMm),
        n(u.flow, s.designFlowM3S),
        "",
        "",
        "",
        "",
        n(u.run, s.straightUpstreamMm),
        n(u.run, s.straightDownstreamMm),
        safeText(s.location),
        "",
        "",
      ]);
      for (const t of design.terminals.filter((t) => t.sectionId === s.id).sort(byTag))
        rows.push([
          "terminal",
          safeText(system.tag),
          safeText(t.tag),
          safeText(s.tag),
          t.kind,
          t.service,
          t.sizeShape ?? "",
          n(u.dimension, t.diameterMm),
          n(u.dimension, t.widthMm),
          n(u.dimension, t.heightMm),
          n(u.flow, t.designFlowM3S),
          n(u.flow, t.designMinFlowM3S),
          n(u.flow, t.designHeatingFlowM3S),
          n(u.area, t.effectiveAreaM2),
          t.controllerFlowFactor === null ? "" : tidyNumber(t.controllerFlowFactor, 6, false),
          "",
          "",
          "",
          safeText(t.room),
          safeText(t.device),
        ]);
      for (const c of children(s.id)) visit(c);
    };
    for (const root of children(null)) visit(root);
  }
  return Papa.unparse({ fields: exportColumns(units), data: rows }, { newline: "\r\n" }) + "\r\n";
}

