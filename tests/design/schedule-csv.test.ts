import { describe, expect, it } from "vitest";
import { exportColumns, exportSchedule, planSchedule, SCHEDULE_LIMITS, type ExistingDesign, type PreviewRow } from "@/lib/design/schedule-csv";
import { parseDecimal } from "@/lib/design/quantities";

const AHU = "00000000-0000-4000-8000-0000000000a1";
const EF = "00000000-0000-4000-8000-0000000000e1";
const EMPTY: ExistingDesign = {
  systems: [
    { id: AHU, tag: "AHU-1", kind: "supply" },
    { id: EF, tag: "EF-1", kind: "exhaust" },
  ],
  sections: [],
  terminals: [],
};

const IP_HEADER = "record,system,tag,parent,terminal_type,service,shape,diameter_in,width_in,height_in,design_airflow_cfm,min_airflow_cfm,heating_airflow_cfm,effective_area_ft2,flow_factor,straight_upstream_ft,straight_downstream_ft,location,room,device";
const IP_FILE = [
  IP_HEADER,
  "section,AHU-1,S1,,,,rectangular,,24,16,2400,,,,,10,3,Corridor ceiling,,",
  "section,AHU-1,S1.1,S1,,,round,12,,,700,,,,,8,2,,,",
  "terminal,AHU-1,VAV-1,S1.1,vav_box,,round,10,,,700,210,350,,0.87,,,,Consulting rooms,Single-duct VAV",
  "section,AHU-1,S1.1.1,S1.1,,,rectangular,,16,10,700,,,,,,,,,",
  "terminal,AHU-1,SD-101,S1.1.1,diffuser,,round,8,,,175,,,0.31,,,,,Consulting room 1,Square-cone diffuser",
  'terminal,AHU-1,SD-102,S1.1.1,diffuser,,round,8,,,"1,000",,,,,,,,Consulting room 2,',
].join("\n");

function errorsOf(rows: PreviewRow[], tag: string): string[] {
  return rows.find((r) => r.tag === tag)!.errors.map((e) => `${e.column}: ${e.message}`);
}

describe("design schedule CSV: reading", () => {
  it("reads an inch-pound schedule and converts every value to SI", () => {
    const plan = planSchedule(IP_FILE, EMPTY);
    expect(plan.preview.fileErrors).toEqual([]);
    expect(plan.preview.rows.flatMap((r) => r.errors)).toEqual([]);
    expect(plan.preview.ok).toBe(true);
    expect(plan.preview.counts).toEqual({ rows: 6, add: 6, update: 0, unchanged: 0, withErrors: 0 });
    expect(plan.preview.units).toMatchObject({ flow: "cfm", dimension: "in.", run: "ft", area: "ft²" });
    const trunk = plan.sections.find((s) => s.tag === "S1")!;
    // 1 in. = 25.4 mm and 1 ft = 0.3048 m exactly; 1 ft³/min = 4.719 474 E-04 m³/s (NIST SP 811 B.8).
    expect(trunk.values.widthMm).toBeCloseTo(609.6, 9);
    expect(trunk.values.heightMm).toBeCloseTo(406.4, 9);
    expect(trunk.values.straightUpstreamMm).toBeCloseTo(3048, 9);
    expect(trunk.values.designFlowM3S).toBeCloseTo(2400 * 4.719474432e-4, 12);
    const vav = plan.terminals.find((t) => t.tag === "VAV-1")!;
    expect(vav.values).toMatchObject({ kind: "vav_box", service: "supply", sizeShape: "round", controllerFlowFactor: 0.87 });
    expect(vav.values.designMinFlowM3S).toBeCloseTo(210 * 4.719474432e-4, 12);
    // 1 ft² = 0.092 903 04 m² (NIST SP 811 B.8).
    expect(plan.terminals.find((t) => t.tag === "SD-101")!.values.effectiveAreaM2).toBeCloseTo(0.31 * 0.09290304, 12);
    expect(plan.terminals.find((t) => t.tag === "SD-102")!.values.designFlowM3S).toBeCloseTo(1000 * 4.719474432e-4, 12);
    // Parents come before their branches whatever the file's order.
    expect(plan.sections.map((s) => s.tag)).toEqual(["S1", "S1.1", "S1.1.1"]);
  });

  it("reads an SI schedule with semicolons, a byte-order mark, comments and headers in any case", () => {
    const file = "\uFEFF# exported from our drawings\nRecord;System;Tag;Parent;Shape;Diameter_mm;Width_mm;Height_mm;Design Airflow L/s;Straight_Upstream_m\nsection;EF-1;X1;;round;450;;;900;4\n\nsection;ef-1;X1.1;X1;round;315;;;500;\n";
    const plan = planSchedule(file, EMPTY);
    expect(plan.preview.fileErrors).toEqual([]);
    expect(plan.preview.ok).toBe(true);
    expect(plan.sections[0]!.values).toMatchObject({ shape: "round", diameterMm: 450, straightUpstreamMm: 4000 });
    // 1 L/s = 0.001 m³/s.
    expect(plan.sections[0]!.values.designFlowM3S).toBeCloseTo(0.9, 12);
    expect(plan.preview.rows.map((r) => r.line)).toEqual([3, 5]);
  });

  it("names every problem row by row: unknown system and parent, bad size, missing airflow, duplicate tag, bad numbers", () => {
    const file = [
      IP_HEADER,
      "section,AHU-1,S1,,,,rectangular,,24,,2400,,,,,,,,,", // height missing
      "section,AHU-9,S2,,,,round,12,,,500,,,,,,,,,", // unknown system
      "section,AHU-1,S1.1,S9,,,round,12,,,700,,,,,,,,,", // unknown parent
      "section,AHU-1,S1.2,S1,,,round,12,,,,,,,,,,,,", // missing airflow
      "section,AHU-1,S1.2,S1,,,round,12,,,300,,,,,,,,,", // duplicate tag
      "section,AHU-1,S1.3,S1,,,round,1/2,,,300,,,,,,,,,", // not a number
      "section,AHU-1,S1.4,S1,,,round,400,,,300,,,,,,,,,", // too large
      "section,AHU-1,S1.5,S1,,,oval,12,,,300,,,,,,,,,", // unknown shape
      "section,AHU-1,S1.6,S1,,,round,12,,,\"1,5\",,,,,,,,,", // decimal comma
      "terminal,AHU-1,SD-1,S1,diffuser,,round,8,,,175,60,,,,,,,,", // minimum on an outlet
      "terminal,AHU-1,VAV-1,S1,vav_box,,round,10,,,700,800,,,,,,,,", // minimum above maximum
      "terminal,AHU-1,VAV-2,S1,vav_box,,round,10,,,700,,,,,,,,,", // VAV without minimum
      "terminal,AHU-1,T-1,,slot,,,,,,100,,,,,,,,,", // no parent, unknown type
      "section,AHU-1,S1.7,S1,,,round,12,,,300,,,,,,,,Room 4,", // a terminal column on a section
      "box,AHU-1,Z,,,,,,,,100,,,,,,,,,",
    ].join("\n");
    const { preview } = planSchedule(file, EMPTY);
    expect(preview.ok).toBe(false);
    expect(errorsOf(preview.rows, "S1")).toEqual(["height_in: Enter the height of the rectangular duct."]);
    expect(errorsOf(preview.rows, "S2")).toEqual(["system: No air system AHU-9 in this project (it has AHU-1, EF-1). Add the system on the Set-up screen first."]);
    expect(errorsOf(preview.rows, "S1.1")).toEqual(["parent: No section S9 in AHU-1, in the file or the project."]);
    const s12 = preview.rows.filter((r) => r.tag === "S1.2");
    expect(s12[0]!.errors.map((e) => e.message)).toEqual(["Enter the design airflow."]);
    expect(s12[1]!.errors.map((e) => e.message)).toEqual(["S1.2 is already on line 5 for AHU-1; each section tag appears once per system."]);
    expect(errorsOf(preview.rows, "S1.3")).toEqual(['diameter_in: "1/2" is not a number.']);
    // Limits are stated in the file's own units: 6096 mm = 240 in., 25.4 mm = 1 in.
    expect(errorsOf(preview.rows, "S1.4")).toEqual(["diameter_in: Diameter must be at least 1 in. and at most 240 in.; 400 in. was entered."]);
    expect(errorsOf(preview.rows, "S1.5")[0]).toBe('shape: Duct shape must be one of round, rectangular; "oval" is not.');
    expect(errorsOf(preview.rows, "S1.6")).toEqual(['design_airflow_cfm: "1,5" is not a number: write decimals with a point (12.5) and thousands as 1000 or 1,000.']);
    expect(errorsOf(preview.rows, "SD-1")).toEqual([
      "min_airflow_cfm: Minimum, heating airflow and flow factor belong to terminal units (VAV or constant-volume boxes), not outlets.",
    ]);
    expect(errorsOf(preview.rows, "VAV-1")).toEqual(["min_airflow_cfm: The minimum (800 cfm) cannot exceed the design maximum (700 cfm)."]);
    expect(errorsOf(preview.rows, "VAV-2")).toEqual(["min_airflow_cfm: Enter the VAV box's design minimum airflow (0 if it closes fully)."]);
    expect(errorsOf(preview.rows, "T-1")).toEqual([
      "parent: Give the tag of the section that feeds this terminal.",
      'terminal_type: Terminal kind must be one of diffuser, grille, register, vav_box, constant_volume_box; "slot" is not.',
    ]);
    expect(errorsOf(preview.rows, "S1.7")).toEqual(["room: Only terminal rows take room; leave it empty here."]);
    expect(errorsOf(preview.rows, "Z")).toEqual(['record: "box" is not a record kind; write section or terminal.']);
    expect(preview.counts.withErrors).toBe(15);
  });

  it("finds loops, in the file and through sections already in the project", () => {
    const inFile = [IP_HEADER, "section,AHU-1,A,B,,,round,12,,,100,,,,,,,,,", "section,AHU-1,B,A,,,round,12,,,100,,,,,,,,,"].join("\n");
    const { preview } = planSchedule(inFile, EMPTY);
    expect(errorsOf(preview.rows, "A")).toEqual(["parent: The parents make a loop: A → B → A. A section cannot sit below its own branches."]);
    expect(errorsOf(preview.rows, "B")).toEqual(["parent: The parents make a loop: B → A → B. A section cannot sit below its own branches."]);

    // S1 exists with S1.1 below it; the file puts S1 under S1.1.
    const existing: ExistingDesign = {
      ...EMPTY,
      sections: [
        { id: "00000000-0000-4000-8000-000000000001", systemId: AHU, parentId: null, tag: "S1", shape: "round", diameterMm: 600, widthMm: null, heightMm: null, designFlowM3S: 1, straightUpstreamMm: null, straightDownstreamMm: null, location: "" },
        { id: "00000000-0000-4000-8000-000000000002", systemId: AHU, parentId: "00000000-0000-4000-8000-000000000001", tag: "S1.1", shape: "round", diameterMm: 400, widthMm: null, heightMm: null, designFlowM3S: 0.5, straightUpstreamMm: null, straightDownstreamMm: null, location: "" },
      ],
    };
    const move = [IP_HEADER, "section,AHU-1,S1,S1.1,,,round,24,,,2000,,,,,,,,,"].join("\n");
    expect(errorsOf(planSchedule(move, existing).preview.rows, "S1")).toEqual(["parent: The parents make a loop: S1 → S1.1 → S1. A section cannot sit below its own branches."]);
    const self = [IP_HEADER, "section,AHU-1,S1,S1,,,round,24,,,2000,,,,,,,,,"].join("\n");
    expect(errorsOf(planSchedule(self, existing).preview.rows, "S1")).toContain("parent: S1 cannot be its own parent.");
  });

  it("refuses unknown columns, missing units, a unit given twice and missing required columns", () => {
    expect(planSchedule("record,system,tag,parent,design_airflow,colour\n", EMPTY).preview.fileErrors).toEqual([
      "Column \"design_airflow\" needs its unit in the name, e.g. design_airflow_m3_s or design_airflow_l_s or design_airflow_m3_h or design_airflow_cfm.",
      'Column "colour" is not one we know. The columns are listed in the README under "Design schedule CSV".',
      "The file needs a design airflow column, e.g. design_airflow_cfm or design_airflow_l_s.",
    ]);
    expect(planSchedule("record,system,tag,parent,design_airflow_cfm,design_airflow_l_s,width_furlong\n", EMPTY).preview.fileErrors).toEqual([
      'design_airflow is given twice ("design_airflow_cfm" and "design_airflow_l_s"); keep one column.',
      'Column "width_furlong": width needs a unit we know: width_mm, width_in.',
    ]);
    expect(planSchedule("", EMPTY).preview.fileErrors[0]).toContain("The file is empty");
    expect(planSchedule(`${IP_HEADER}\n`, EMPTY).preview.fileErrors).toEqual(["The file has a header but no sections or terminals."]);
  });

  it("bounds the file: size, rows and cell length", () => {
    const big = IP_HEADER + "\n" + "x".repeat(SCHEDULE_LIMITS.maxBytes);
    expect(planSchedule(big, EMPTY).preview.fileErrors[0]).toContain("larger than 1 MiB");
    const many = [IP_HEADER, ...Array.from({ length: SCHEDULE_LIMITS.maxRows + 1 }, (_, i) => `section,AHU-1,S${i},,,,round,12,,,100,,,,,,,,,`)].join("\n");
    expect(planSchedule(many, EMPTY).preview.fileErrors[0]).toBe(`The file has ${SCHEDULE_LIMITS.maxRows + 1} lines; at most ${SCHEDULE_LIMITS.maxRows} are taken at once. Split it by system.`);
    const long = [IP_HEADER, `section,AHU-1,S1,,,,round,12,,,100,,,,,,,${"L".repeat(400)},,`].join("\n");
    expect(errorsOf(planSchedule(long, EMPTY).preview.rows, "S1")[0]).toBe("(line): A cell is longer than 300 characters.");
  });
});

describe("design schedule CSV: export and round trip", () => {
  function imported(text: string, base: ExistingDesign): ExistingDesign {
    // Builds the design the plan describes, as the database apply would, with made-up ids.
    const plan = planSchedule(text, base);
    expect(plan.preview.rows.flatMap((r) => r.errors)).toEqual([]);
    const sections: ExistingDesign["sections"] = [];
    const id = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, "0")}`;
    for (const s of plan.sections) {
      const parent = s.parentTag ? sections.find((x) => x.systemId === s.systemId && x.tag === s.parentTag)! : null;
      sections.push({ id: id(sections.length + 1), systemId: s.systemId, parentId: parent?.id ?? null, tag: s.tag, ...s.values });
    }
    const terminals = plan.terminals.map((t, i) => ({ id: id(1000 + i), sectionId: sections.find((x) => x.systemId === t.systemId && x.tag === t.parentTag)!.id, ...t.values }));
    return { systems: base.systems, sections, terminals };
  }

  it("exports in the import's columns, and an exported file re-imports with nothing to change, in IP and in SI", () => {
    const design = imported(IP_FILE, EMPTY);
    for (const units of ["IP", "SI"] as const) {
      const csv = exportSchedule(design, units);
      expect(csv.split("\r\n")[0]).toBe(exportColumns(units).join(","));
      const again = planSchedule(csv, design);
      expect(again.preview.ok, units).toBe(true);
      expect(again.preview.counts, units).toEqual({ rows: 6, add: 0, update: 0, unchanged: 6, withErrors: 0 });
      // And into an empty project the same file builds the same design.
      const rebuilt = imported(csv, EMPTY);
      for (const s of design.sections) {
        const r = rebuilt.sections.find((x) => x.tag === s.tag)!;
        // Six significant figures in the file: within 5 parts in a million of what was stored.
        expect(Math.abs(r.designFlowM3S / s.designFlowM3S - 1)).toBeLessThan(5e-6);
        expect(Math.abs((r.widthMm ?? 1) / (s.widthMm ?? 1) - 1)).toBeLessThan(5e-6);
      }
      expect(rebuilt.terminals.map((t) => t.tag).sort()).toEqual(design.terminals.map((t) => t.tag).sort());
    }
    const ip = exportSchedule(design, "IP");
    // Round inch-pound values come back as they were written.
    expect(ip).toContain("section,AHU-1,S1,,,,rectangular,,24,16,2400,,,,,10,3,Corridor ceiling,,");
    expect(ip).toContain("terminal,AHU-1,VAV-1,S1.1,vav_box,supply,round,10,,,700,210,350,,0.87,,,,Consulting rooms,Single-duct VAV");
  });

  it("marks a changed value as an update and keeps text that looks like a formula as text", () => {
    const design = imported(IP_FILE, EMPTY);
    design.terminals[1]!.room = "=HYPERLINK(1)";
    const csv = exportSchedule(design, "IP");
    expect(csv).toContain("'=HYPERLINK(1)");
    const back = planSchedule(csv, design);
    expect(back.preview.counts.unchanged).toBe(6);
    const edited = csv.replace("S1.1,,,,round,12,,,700", "S1.1,,,,round,14,,,700").replace("section,AHU-1,S1.1,S1,,,round,12,,,700", "section,AHU-1,S1.1,S1,,,round,14,,,700");
    const plan = planSchedule(edited, design);
    expect(plan.preview.rows.find((r) => r.tag === "S1.1")!.action).toBe("update");
    expect(plan.preview.counts).toMatchObject({ update: 1, unchanged: 5 });
  });
});

describe("design schedule CSV: columns left out", () => {
  it("keeps what an existing item has for a column the file leaves out, and clears it for an empty cell", () => {
    const design = planSchedule(IP_FILE, EMPTY);
    const base: ExistingDesign = {
      systems: EMPTY.systems,
      sections: design.sections.map((s, i) => ({ id: `00000000-0000-4000-8000-00000000000${i}`, systemId: s.systemId, parentId: null, tag: s.tag, ...s.values })),
      terminals: [],
    };
    base.sections[1]!.parentId = base.sections[0]!.id;
    base.sections[2]!.parentId = base.sections[1]!.id;
    const t = design.terminals.find((x) => x.tag === "SD-101")!;
    base.terminals.push({ id: "00000000-0000-4000-8000-000000000099", sectionId: base.sections[2]!.id, ...t.values });
    // Only airflows: sizes, rooms, devices and effective areas stay as they are.
    const narrow = ["record,system,tag,parent,design_airflow_cfm", "section,AHU-1,S1.1.1,S1.1,700", "terminal,AHU-1,SD-101,S1.1.1,175"].join("\n");
    expect(planSchedule(narrow, base).preview.counts).toMatchObject({ unchanged: 2, update: 0, withErrors: 0 });
    const cleared = ["record,system,tag,parent,design_airflow_cfm,room", "terminal,AHU-1,SD-101,S1.1.1,175,"].join("\n");
    const plan = planSchedule(cleared, base);
    expect(plan.preview.rows[0]!.action).toBe("update");
    expect(plan.terminals[0]!.values).toMatchObject({ room: "", device: "Square-cone diffuser", kind: "diffuser", sizeShape: "round" });
    // A new item still needs what the file leaves out.
    const fresh = ["record,system,tag,parent,design_airflow_cfm", "section,AHU-1,S2,,500"].join("\n");
    expect(errorsOf(planSchedule(fresh, base).preview.rows, "S2")).toEqual(["shape: Duct shape must be one of round, rectangular."]);
  });
});

describe("parseDecimal", () => {
  it("takes points for decimals and commas only as thousands", () => {
    expect(parseDecimal("1,000")).toEqual({ ok: true, value: 1000 });
    expect(parseDecimal("12,345.5")).toEqual({ ok: true, value: 12345.5 });
    expect(parseDecimal(" .5 ")).toEqual({ ok: true, value: 0.5 });
    expect(parseDecimal("1e3")).toEqual({ ok: true, value: 1000 });
    expect(parseDecimal("1,5").ok).toBe(false);
    expect(parseDecimal("12 in").ok).toBe(false);
    expect(parseDecimal("Infinity").ok).toBe(false);
  });
});
