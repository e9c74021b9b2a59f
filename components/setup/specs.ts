import type { AirSystem, DuctSection, Project } from "@/db/schema";
import type { TerminalResource } from "@/lib/design/resources";
import { inputValue, type DesignUnits } from "@/lib/design/quantities";
import { AIR_SERVICES, DUCT_SHAPES, isTerminalUnit, OUTLET_KINDS, SERVICE_LABELS, SHAPE_LABELS, SYSTEM_KINDS, TERMINAL_KIND_LABELS, TERMINAL_KINDS, TERMINAL_UNIT_KINDS, type TerminalKind } from "@/lib/validation/design";
import type { FieldSpec, FormValues } from "./use-design-form";

/** The field lists of the set-up forms and their starting values (SI → the user's units). */

const SYSTEM_KIND_LABELS = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" } as const;
const round = (v: FormValues) => v.shape === "round";
const rect = (v: FormValues) => v.shape === "rectangular";
const TOLERANCES = [
  ["fan", "Fans"],
  ["section", "Duct sections"],
  ["outlet", "Outlets and inlets"],
  ["terminalUnit", "Terminal units"],
  ["outsideAir", "Outside air"],
] as const;

export function projectFields(): FieldSpec[] {
  const site = "Site";
  const air = "Units and standard air";
  const tol = "Acceptance bands, % of design (contract documents govern)";
  const sample = "Verification sample (commissioning agent)";
  return [
    { name: "name", label: "Project name", type: "text", required: true, group: site, maxLength: 160 },
    { name: "siteName", label: "Site", type: "text", required: true, group: site, maxLength: 160 },
    { name: "address", label: "Address", type: "text", group: site, maxLength: 300 },
    {
      name: "unitSystem",
      label: "Unit system of the project",
      type: "select",
      required: true,
      group: air,
      options: [
        { value: "IP", label: "Inch-pound (cfm, in., in. w.c., °F)" },
        { value: "SI", label: "SI (L/s, mm, Pa, °C)" },
      ],
    },
    { name: "altitudeM", label: "Altitude above sea level", type: "number", quantity: "altitude", group: air, hint: "Sets the default barometric pressure for readings." },
    {
      name: "standardDensityKgM3",
      label: "Standard air density",
      type: "number",
      quantity: "density",
      group: air,
      hint: "Design airflows are scheduled at this density: 0.075 lb/ft³ in US practice, 1.204 kg/m³ in SI.",
    },
    ...TOLERANCES.flatMap(([key, label]): FieldSpec[] => [
      { name: `${key}ToleranceMinusPct`, label: `${label}: below design (−%)`, type: "number", group: tol },
      { name: `${key}TolerancePlusPct`, label: `${label}: above design (+%)`, type: "number", group: tol },
    ]),
    { name: "continuityTolerancePct", label: "Continuity at junctions (±% by mass)", type: "number", group: tol },
    { name: "samplePct", label: "Share of each kind re-read (%)", type: "number", group: sample, hint: "Outlets, terminal units and sections of a submitted system; 10 % is common practice." },
    { name: "sampleMinCount", label: "Fewest items in a sample", type: "number", group: sample },
    { name: "sampleTolerancePct", label: "Agreement with the technician's reading (±%)", type: "number", group: sample, hint: "±10 % is common practice." },
    { name: "sampleAllowedFailures", label: "Disagreements allowed before the system is returned", type: "number", group: sample },
  ];
}

export function projectInitial(project: Project | null, units: DesignUnits, unitSystem: "IP" | "SI"): FormValues {
  const v: FormValues = {
    name: project?.name ?? "",
    siteName: project?.siteName ?? "",
    address: project?.address ?? "",
    unitSystem: project?.unitSystem ?? unitSystem,
    altitudeM: inputValue(units.altitude, project?.altitudeM ?? 0),
    standardDensityKgM3: project ? inputValue(units.density, project.standardDensityKgM3) : unitSystem === "IP" ? inputValue(units.density, units.density.toSi(0.075)) : inputValue(units.density, 1.204),
    continuityTolerancePct: String(project?.continuityTolerancePct ?? 10),
    samplePct: String(project?.samplePct ?? 10),
    sampleMinCount: String(project?.sampleMinCount ?? 3),
    sampleTolerancePct: String(project?.sampleTolerancePct ?? 10),
    sampleAllowedFailures: String(project?.sampleAllowedFailures ?? 0),
  };
  // Defaults are common practice: ±5 % fans, ±10 % sections, outlets and terminal units, −0/+10 % outside air.
  const defaults = { fan: [5, 5], section: [10, 10], outlet: [10, 10], terminalUnit: [10, 10], outsideAir: [0, 10] } as const;
  for (const [key] of TOLERANCES) {
    const minus = project ? (project as unknown as Record<string, number>)[`${key}ToleranceMinusPct`]! : defaults[key][0];
    const plus = project ? (project as unknown as Record<string, number>)[`${key}TolerancePlusPct`]! : defaults[key][1];
    v[`${key}ToleranceMinusPct`] = String(minus);
    v[`${key}TolerancePlusPct`] = String(plus);
  }
  return v;
}

export function systemFields(): FieldSpec[] {
  const design = "Design";
  const motor = "Fan motor nameplate";
  return [
    { name: "tag", label: "Tag", type: "text", required: true, group: design, maxLength: 40, hint: "As on the drawings, e.g. AHU-1, RTU-2, EF-3." },
    { name: "name", label: "Name", type: "text", required: true, group: design, maxLength: 120 },
    { name: "kind", label: "Kind", type: "select", required: true, group: design, options: SYSTEM_KINDS.map((k) => ({ value: k, label: SYSTEM_KIND_LABELS[k] })) },
    { name: "location", label: "Location", type: "text", group: design, maxLength: 200 },
    { name: "designFlowM3S", label: "Design airflow", type: "number", quantity: "flow", required: true, group: design },
    { name: "designStaticPa", label: "Design static pressure", type: "number", quantity: "pressure", group: design },
    { name: "fanSpeedRpm", label: "Design fan speed (rpm)", type: "number", group: design },
    { name: "designOutsideAirM3S", label: "Minimum outside air", type: "number", quantity: "flow", group: design },
    { name: "motorPowerKw", label: "Power", type: "number", quantity: "power", group: motor },
    { name: "motorSpeedRpm", label: "Speed (rpm)", type: "number", group: motor },
    { name: "motorFullLoadAmps", label: "Full-load current (A)", type: "number", group: motor },
    { name: "motorVolts", label: "Voltage (V)", type: "number", group: motor },
    {
      name: "motorPhases",
      label: "Phases",
      type: "select",
      nullable: true,
      numeric: true,
      group: motor,
      options: [
        { value: "", label: "Not given" },
        { value: "1", label: "1" },
        { value: "3", label: "3" },
      ],
    },
    { name: "motorServiceFactor", label: "Service factor", type: "number", group: motor },
    { name: "hasVfd", label: "Variable-frequency drive", type: "checkbox", group: motor },
  ];
}

export function systemInitial(s: AirSystem | null, units: DesignUnits): FormValues {
  return {
    tag: s?.tag ?? "",
    name: s?.name ?? "",
    kind: s?.kind ?? "supply",
    location: s?.location ?? "",
    designFlowM3S: inputValue(units.flow, s?.designFlowM3S),
    designStaticPa: inputValue(units.pressure, s?.designStaticPa),
    fanSpeedRpm: inputValue(undefined, s?.fanSpeedRpm),
    designOutsideAirM3S: inputValue(units.flow, s?.designOutsideAirM3S),
    motorPowerKw: inputValue(units.power, s?.motorPowerKw),
    motorSpeedRpm: inputValue(undefined, s?.motorSpeedRpm),
    motorFullLoadAmps: inputValue(undefined, s?.motorFullLoadAmps),
    motorVolts: inputValue(undefined, s?.motorVolts),
    motorPhases: s?.motorPhases ? String(s.motorPhases) : "",
    motorServiceFactor: inputValue(undefined, s?.motorServiceFactor),
    hasVfd: s?.hasVfd ?? false,
  };
}

export function sectionFields(parents: { value: string; label: string }[]): FieldSpec[] {
  return [
    { name: "tag", label: "Tag", type: "text", required: true, maxLength: 40 },
    { name: "parentId", label: "Upstream section", type: "select", nullable: true, options: [{ value: "", label: "None: a trunk leaving the fan" }, ...parents] },
    { name: "shape", label: "Shape", type: "select", required: true, options: DUCT_SHAPES.map((s) => ({ value: s, label: SHAPE_LABELS[s] })) },
    { name: "diameterMm", label: "Inside diameter", type: "number", quantity: "dimension", required: true, shown: round },
    { name: "widthMm", label: "Inside width", type: "number", quantity: "dimension", required: true, shown: rect },
    { name: "heightMm", label: "Inside height", type: "number", quantity: "dimension", required: true, shown: rect },
    { name: "designFlowM3S", label: "Design airflow", type: "number", quantity: "flow", required: true },
    { name: "straightUpstreamMm", label: "Straight duct upstream", type: "number", quantity: "run", hint: "Before the traverse plane; sets the suggested point count." },
    { name: "straightDownstreamMm", label: "Straight duct downstream", type: "number", quantity: "run" },
    { name: "location", label: "Location", type: "text", maxLength: 200, hint: "Where the technician finds it, e.g. corridor ceiling, level 1." },
  ];
}

export function sectionInitial(s: DuctSection | null, units: DesignUnits, parentId: string | null): FormValues {
  return {
    tag: s?.tag ?? "",
    parentId: s ? s.parentId ?? "" : parentId ?? "",
    shape: s?.shape ?? "round",
    diameterMm: inputValue(units.dimension, s?.diameterMm),
    widthMm: inputValue(units.dimension, s?.widthMm),
    heightMm: inputValue(units.dimension, s?.heightMm),
    designFlowM3S: inputValue(units.flow, s?.designFlowM3S),
    straightUpstreamMm: inputValue(units.run, s?.straightUpstreamMm),
    straightDownstreamMm: inputValue(units.run, s?.straightDownstreamMm),
    location: s?.location ?? "",
  };
}

const unit = (v: FormValues) => isTerminalUnit(v.kind as TerminalKind);
const outlet = (v: FormValues) => !unit(v);

export function terminalFields(sections: { value: string; label: string }[]): FieldSpec[] {
  const sized = (v: FormValues) => v.sizeShape !== "";
  return [
    { name: "tag", label: "Tag", type: "text", required: true, maxLength: 40 },
    {
      name: "kind",
      label: "Kind",
      type: "select",
      required: true,
      options: TERMINAL_KINDS.map((k) => ({ value: k, label: TERMINAL_KIND_LABELS[k], group: (OUTLET_KINDS as readonly string[]).includes(k) ? "Outlets and inlets" : "Terminal units" })),
    },
    { name: "sectionId", label: "Fed by section", type: "select", required: true, options: sections },
    { name: "service", label: "Service", type: "select", required: true, options: AIR_SERVICES.map((s) => ({ value: s, label: SERVICE_LABELS[s] })) },
    { name: "room", label: "Room", type: "text", maxLength: 120 },
    { name: "device", label: "Device", type: "text", maxLength: 200, hint: "Make, model or description, e.g. 24×24 square-cone diffuser." },
    {
      name: "sizeShape",
      label: "Neck or inlet shape",
      type: "select",
      nullable: true,
      options: [{ value: "", label: "Size not known" }, ...DUCT_SHAPES.map((s) => ({ value: s, label: SHAPE_LABELS[s] }))],
    },
    { name: "diameterMm", label: "Neck or inlet diameter", type: "number", quantity: "dimension", required: true, shown: (v) => sized(v) && v.sizeShape === "round" },
    { name: "widthMm", label: "Neck or inlet width", type: "number", quantity: "dimension", required: true, shown: (v) => v.sizeShape === "rectangular" },
    { name: "heightMm", label: "Neck or inlet height", type: "number", quantity: "dimension", required: true, shown: (v) => v.sizeShape === "rectangular" },
    { name: "designFlowM3S", label: "Design airflow (maximum for terminal units)", type: "number", quantity: "flow", required: true },
    { name: "designMinFlowM3S", label: "Design minimum airflow", type: "number", quantity: "flow", required: true, shown: (v) => v.kind === "vav_box", hint: "0 if the box closes fully." },
    { name: "designHeatingFlowM3S", label: "Heating airflow", type: "number", quantity: "flow", shown: (v) => v.kind === "vav_box" },
    { name: "controllerFlowFactor", label: "Controller flow factor", type: "number", shown: unit, hint: "As configured in the box controller." },
    { name: "effectiveAreaM2", label: "Effective area (Ak)", type: "number", quantity: "area", shown: outlet, hint: "From the maker's data, when known." },
  ];
}

export function terminalInitial(t: TerminalResource | null, units: DesignUnits, sectionId: string, service: string, kind: TerminalKind = "diffuser"): FormValues {
  return {
    tag: t?.tag ?? "",
    kind: t?.kind ?? kind,
    sectionId: t?.sectionId ?? sectionId,
    service: t?.service ?? service,
    room: t?.room ?? "",
    device: t?.device ?? "",
    sizeShape: t ? t.sizeShape ?? "" : "round",
    diameterMm: inputValue(units.dimension, t?.diameterMm),
    widthMm: inputValue(units.dimension, t?.widthMm),
    heightMm: inputValue(units.dimension, t?.heightMm),
    designFlowM3S: inputValue(units.flow, t?.designFlowM3S),
    designMinFlowM3S: inputValue(units.flow, t?.designMinFlowM3S),
    designHeatingFlowM3S: inputValue(units.flow, t?.designHeatingFlowM3S),
    controllerFlowFactor: inputValue(undefined, t?.controllerFlowFactor),
    effectiveAreaM2: inputValue(units.area, t?.effectiveAreaM2),
  };
}

export { TERMINAL_UNIT_KINDS };
