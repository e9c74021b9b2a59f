/**
 * The design side of a project: projects, air systems, duct sections and terminals. One set of zod
 * schemas serves the API (SI JSON) and the set-up forms, which convert what was typed to SI first and
 * build the schemas with their own units so every limit is stated in the units the person typed in.
 */
import "./zod-browser";
import { z } from "zod";
import { API_UNITS, formatIn, tidyNumber, type DesignQuantity, type DesignUnits } from "@/lib/design/quantities";

export const SYSTEM_KINDS = ["supply", "return", "exhaust", "outside_air"] as const;
export const AIR_SERVICES = ["supply", "return", "exhaust", "outside_air"] as const;
export const DUCT_SHAPES = ["round", "rectangular"] as const;
/** Air outlets and inlets, then terminal units. */
export const OUTLET_KINDS = ["diffuser", "grille", "register"] as const;
export const TERMINAL_UNIT_KINDS = ["vav_box", "constant_volume_box"] as const;
export const TERMINAL_KINDS = [...OUTLET_KINDS, ...TERMINAL_UNIT_KINDS] as const;
export type TerminalKind = (typeof TERMINAL_KINDS)[number];

export const TERMINAL_KIND_LABELS: Record<TerminalKind, string> = {
  diffuser: "Diffuser",
  grille: "Grille",
  register: "Register",
  vav_box: "VAV box",
  constant_volume_box: "Constant-volume box",
};
export const SERVICE_LABELS: Record<(typeof AIR_SERVICES)[number], string> = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" };
export const SHAPE_LABELS: Record<(typeof DUCT_SHAPES)[number], string> = { round: "Round", rectangular: "Rectangular" };

export function isTerminalUnit(kind: TerminalKind): boolean {
  return (TERMINAL_UNIT_KINDS as readonly string[]).includes(kind);
}

/** SI limits of what the API accepts. Dimensions run from 1 in. to 20 ft so that both unit systems read round. */
export const LIMITS = {
  dimensionMm: { min: 25.4, max: 6096 },
  runMm: { max: 300_000 },
  systemFlowM3S: { max: 200 },
  sectionFlowM3S: { max: 200 },
  terminalFlowM3S: { max: 50 },
  staticPa: { max: 10_000 },
  densityKgM3: { min: 1.0, max: 1.4 },
  altitudeM: { min: -500, max: 5000 },
  effectiveAreaM2: { max: 10 },
} as const;

const LOOSE_UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const id = (what: string) => z.string({ error: `Choose the ${what}.` }).regex(LOOSE_UUID, `That is not the id of a ${what} in this project.`);

function text(label: string, max: number, required: boolean) {
  const base = z.string({ error: `${label} must be text.` }).trim();
  return required
    ? base.min(1, `Enter the ${label.toLowerCase()}.`).max(max, `${label} is at most ${max} characters.`)
    : base.max(max, `${label} is at most ${max} characters.`);
}

const tag = (label: string) =>
  z
    .string({ error: `Enter the ${label}.` })
    .trim()
    .min(1, `Enter the ${label}.`)
    .max(40, `A ${label} is at most 40 characters.`)
    .regex(/^[\p{L}\p{N}][\p{L}\p{N} ._/#()+-]*$/u, `A ${label} starts with a letter or digit and uses letters, digits, spaces and . _ / # ( ) + - only.`);

function enumOf<T extends readonly [string, ...string[]]>(values: T, label: string) {
  return z.enum(values, { error: (iss) => `${label} must be one of ${values.join(", ")}${iss.input === undefined ? "" : `; "${String(iss.input).slice(0, 40)}" is not`}.` });
}

/**
 * A measured quantity with its limits, messages in the caller's units:
 * "Design airflow must be more than 0 cfm and at most 105,944 cfm; -5 cfm was entered."
 */
function measure(units: DesignUnits, quantity: DesignQuantity | null, label: string, lower: { value: number; inclusive: boolean }, upper: number) {
  const show = (si: number) => (quantity ? formatIn(units[quantity], si, 4) : tidyNumber(si, 4));
  const range = `${lower.inclusive ? "at least" : "more than"} ${show(lower.value)} and at most ${show(upper)}`;
  const message = (iss: { input?: unknown }) =>
    `${label} must be ${range}; ${typeof iss.input === "number" ? (quantity ? formatIn(units[quantity], iss.input, 6) : tidyNumber(iss.input, 6)) : "that"} was entered.`;
  const base = z.number({ error: (iss) => (iss.input === undefined ? `Enter the ${label.toLowerCase()}.` : `${label} must be a number.`) });
  return (lower.inclusive ? base.gte(lower.value, { error: message }) : base.gt(lower.value, { error: message })).lte(upper, { error: message });
}

const positive = (units: DesignUnits, q: DesignQuantity | null, label: string, max: number) => measure(units, q, label, { value: 0, inclusive: false }, max);
const nonNegative = (units: DesignUnits, q: DesignQuantity | null, label: string, max: number) => measure(units, q, label, { value: 0, inclusive: true }, max);
const dimension = (units: DesignUnits, label: string) =>
  measure(units, "dimension", label, { value: LIMITS.dimensionMm.min, inclusive: true }, LIMITS.dimensionMm.max).nullable().optional();
const pct = (label: string) =>
  z
    .number({ error: `${label} must be a number of per cent.` })
    .gte(0, { error: (iss) => `${label} must be 0 to 100 %; ${String(iss.input)} % was entered.` })
    .lte(100, { error: (iss) => `${label} must be 0 to 100 %; ${String(iss.input)} % was entered.` });

const bounded = (label: string, min: number, max: number, opts: { integer?: boolean; above?: boolean } = {}) => {
  const what = `${label} must be ${opts.integer ? "a whole number" : "a number"} ${opts.above ? `above ${min}` : `from ${min}`} to ${max}`;
  let base = z.number({ error: `${what}.` });
  base = opts.above ? base.gt(min, { error: (iss) => `${what}; ${String(iss.input)} was entered.` }) : base.gte(min, { error: (iss) => `${what}; ${String(iss.input)} was entered.` });
  base = base.lte(max, { error: (iss) => `${what}; ${String(iss.input)} was entered.` });
  return opts.integer ? base.int({ error: (iss) => `${what}; ${String(iss.input)} was entered.` }) : base;
};

type Size = { shape?: "round" | "rectangular" | null; diameterMm?: number | null; widthMm?: number | null; heightMm?: number | null };

/** Round ducts have a diameter, rectangular ones a width and a height; nothing else. */
function checkSize(value: Size, ctx: z.RefinementCtx, shapeKey: string, noun: string, optional: boolean) {
  const has = (v: number | null | undefined) => v !== null && v !== undefined;
  if (!value.shape) {
    if (!optional) ctx.addIssue({ code: "custom", path: [shapeKey], message: `Choose round or rectangular for the ${noun}.` });
    else
      for (const key of ["diameterMm", "widthMm", "heightMm"] as const)
        if (has(value[key])) ctx.addIssue({ code: "custom", path: [shapeKey], message: `Say whether the ${noun} is round or rectangular, or leave its size empty.` });
    return;
  }
  if (value.shape === "round") {
    if (!has(value.diameterMm)) ctx.addIssue({ code: "custom", path: ["diameterMm"], message: `Enter the diameter of the round ${noun}.` });
    for (const key of ["widthMm", "heightMm"] as const)
      if (has(value[key])) ctx.addIssue({ code: "custom", path: [key], message: `A round ${noun} has a diameter only; leave ${key === "widthMm" ? "width" : "height"} empty.` });
  } else {
    if (!has(value.widthMm)) ctx.addIssue({ code: "custom", path: ["widthMm"], message: `Enter the width of the rectangular ${noun}.` });
    if (!has(value.heightMm)) ctx.addIssue({ code: "custom", path: ["heightMm"], message: `Enter the height of the rectangular ${noun}.` });
    if (has(value.diameterMm)) ctx.addIssue({ code: "custom", path: ["diameterMm"], message: `A rectangular ${noun} has a width and a height; leave the diameter empty.` });
  }
}

/** Builds every design schema with messages in `units` (the API's SI by default). */
export function designSchemas(units: DesignUnits = API_UNITS) {
  const tolerances = {
    fanToleranceMinusPct: pct("Fan tolerance below design"),
    fanTolerancePlusPct: pct("Fan tolerance above design"),
    sectionToleranceMinusPct: pct("Duct section tolerance below design"),
    sectionTolerancePlusPct: pct("Duct section tolerance above design"),
    outletToleranceMinusPct: pct("Outlet tolerance below design"),
    outletTolerancePlusPct: pct("Outlet tolerance above design"),
    terminalUnitToleranceMinusPct: pct("Terminal unit tolerance below design"),
    terminalUnitTolerancePlusPct: pct("Terminal unit tolerance above design"),
    outsideAirToleranceMinusPct: pct("Outside air tolerance below design"),
    outsideAirTolerancePlusPct: pct("Outside air tolerance above design"),
    continuityTolerancePct: pct("Continuity tolerance"),
    // The commissioning agent's verification sample (defaults 10 %, at least 3, ±10 %, none allowed to disagree: common practice).
    samplePct: bounded("Verification sample share (%)", 0, 100, { above: true }),
    sampleMinCount: bounded("Verification sample minimum", 1, 500, { integer: true }),
    sampleTolerancePct: bounded("Verification agreement tolerance (±%)", 0, 50, { above: true }),
    sampleAllowedFailures: bounded("Disagreements allowed in a sample", 0, 500, { integer: true }),
  };
  const projectFields = {
    name: text("Project name", 160, true),
    siteName: text("Site", 160, true),
    address: text("Address", 300, false),
    altitudeM: measure(units, "altitude", "Altitude", { value: LIMITS.altitudeM.min, inclusive: true }, LIMITS.altitudeM.max),
    unitSystem: enumOf(["IP", "SI"] as const, "Unit system"),
    standardDensityKgM3: measure(units, "density", "Standard air density", { value: LIMITS.densityKgM3.min, inclusive: true }, LIMITS.densityKgM3.max),
    ...tolerances,
  };
  const projectBase = z.object(projectFields).strict();
  const project = projectBase.partial().required({ name: true, siteName: true, unitSystem: true });
  const projectPatch = projectBase.partial().refine((v) => Object.keys(v).length > 0, "Send at least one field to change.");

  const systemFields = {
    tag: tag("system tag"),
    name: text("System name", 120, true),
    kind: enumOf(SYSTEM_KINDS, "System kind"),
    location: text("Location", 200, false).optional(),
    designFlowM3S: positive(units, "flow", "Design airflow", LIMITS.systemFlowM3S.max),
    designStaticPa: nonNegative(units, "pressure", "Design static pressure", LIMITS.staticPa.max).nullable().optional(),
    fanSpeedRpm: positive(units, null, "Design fan speed (rpm)", 20_000).nullable().optional(),
    designOutsideAirM3S: nonNegative(units, "flow", "Minimum outside air", LIMITS.systemFlowM3S.max).nullable().optional(),
    motorPowerKw: positive(units, "power", "Motor power", 5000).nullable().optional(),
    motorSpeedRpm: positive(units, null, "Motor speed (rpm)", 20_000).nullable().optional(),
    motorFullLoadAmps: positive(units, null, "Motor full-load current (A)", 10_000).nullable().optional(),
    motorVolts: positive(units, null, "Motor voltage (V)", 50_000).nullable().optional(),
    motorPhases: z
      .union([z.literal(1), z.literal(3)], { error: (iss) => `Motor phases must be 1 or 3${iss.input === undefined ? "" : `; ${String(iss.input)} was entered`}.` })
      .nullable()
      .optional(),
    motorServiceFactor: measure(units, null, "Motor service factor", { value: 1, inclusive: true }, 2).nullable().optional(),
    hasVfd: z.boolean({ error: "Say whether the fan has a variable-frequency drive (true or false)." }).optional(),
  };
  const systemBase = z.object(systemFields).strict();
  const systemRules = (v: { designFlowM3S?: number; designOutsideAirM3S?: number | null }, ctx: z.RefinementCtx) => {
    if (v.designFlowM3S !== undefined && typeof v.designOutsideAirM3S === "number" && v.designOutsideAirM3S > v.designFlowM3S)
      ctx.addIssue({
        code: "custom",
        path: ["designOutsideAirM3S"],
        message: `Minimum outside air (${formatIn(units.flow, v.designOutsideAirM3S)}) cannot exceed the design airflow (${formatIn(units.flow, v.designFlowM3S)}).`,
      });
  };
  const system = systemBase.superRefine(systemRules);
  const systemPatch = systemBase.partial().refine((v) => Object.keys(v).length > 0, "Send at least one field to change.");

  const sectionFields = {
    systemId: id("air system"),
    parentId: id("upstream section").nullable().optional(),
    tag: tag("section tag"),
    shape: enumOf(DUCT_SHAPES, "Duct shape"),
    diameterMm: dimension(units, "Diameter"),
    widthMm: dimension(units, "Width"),
    heightMm: dimension(units, "Height"),
    designFlowM3S: positive(units, "flow", "Design airflow", LIMITS.sectionFlowM3S.max),
    straightUpstreamMm: nonNegative(units, "run", "Straight duct upstream", LIMITS.runMm.max).nullable().optional(),
    straightDownstreamMm: nonNegative(units, "run", "Straight duct downstream", LIMITS.runMm.max).nullable().optional(),
    location: text("Location", 200, false).optional(),
  };
  const sectionBase = z.object(sectionFields).strict();
  const section = sectionBase.superRefine((v, ctx) => checkSize(v, ctx, "shape", "duct", false));
  const sectionPatch = sectionBase
    .omit({ systemId: true })
    .partial()
    .refine((v) => Object.keys(v).length > 0, "Send at least one field to change.");

  const terminalFields = {
    sectionId: id("duct section"),
    tag: tag("terminal tag"),
    kind: enumOf(TERMINAL_KINDS, "Terminal kind"),
    service: enumOf(AIR_SERVICES, "Service").optional(),
    room: text("Room", 120, false).optional(),
    device: text("Device", 200, false).optional(),
    sizeShape: enumOf(DUCT_SHAPES, "Neck or inlet shape").nullable().optional(),
    diameterMm: dimension(units, "Diameter"),
    widthMm: dimension(units, "Width"),
    heightMm: dimension(units, "Height"),
    designFlowM3S: positive(units, "flow", "Design airflow", LIMITS.terminalFlowM3S.max),
    designMinFlowM3S: nonNegative(units, "flow", "Design minimum airflow", LIMITS.terminalFlowM3S.max).nullable().optional(),
    designHeatingFlowM3S: nonNegative(units, "flow", "Heating airflow", LIMITS.terminalFlowM3S.max).nullable().optional(),
    effectiveAreaM2: positive(units, "area", "Effective area", LIMITS.effectiveAreaM2.max).nullable().optional(),
    controllerFlowFactor: positive(units, null, "Controller flow factor", 100_000).nullable().optional(),
  };
  const terminalBase = z.object(terminalFields).strict();
  const terminalRules = (v: z.infer<typeof terminalBase>, ctx: z.RefinementCtx) => {
    checkSize({ shape: v.sizeShape, diameterMm: v.diameterMm, widthMm: v.widthMm, heightMm: v.heightMm }, ctx, "sizeShape", isTerminalUnit(v.kind) ? "inlet" : "neck", true);
    const has = (x: number | null | undefined): x is number => x !== null && x !== undefined;
    if (isTerminalUnit(v.kind)) {
      if (has(v.effectiveAreaM2)) ctx.addIssue({ code: "custom", path: ["effectiveAreaM2"], message: "An effective area belongs to an outlet or inlet, not a terminal unit." });
      if (v.kind === "vav_box") {
        if (!has(v.designMinFlowM3S)) ctx.addIssue({ code: "custom", path: ["designMinFlowM3S"], message: "Enter the VAV box's design minimum airflow (0 if it closes fully)." });
        else if (v.designMinFlowM3S > v.designFlowM3S)
          ctx.addIssue({ code: "custom", path: ["designMinFlowM3S"], message: `The minimum (${formatIn(units.flow, v.designMinFlowM3S)}) cannot exceed the design maximum (${formatIn(units.flow, v.designFlowM3S)}).` });
        if (has(v.designHeatingFlowM3S) && v.designHeatingFlowM3S > v.designFlowM3S)
          ctx.addIssue({ code: "custom", path: ["designHeatingFlowM3S"], message: `The heating airflow (${formatIn(units.flow, v.designHeatingFlowM3S)}) cannot exceed the design maximum (${formatIn(units.flow, v.designFlowM3S)}).` });
        else if (has(v.designHeatingFlowM3S) && has(v.designMinFlowM3S) && v.designHeatingFlowM3S < v.designMinFlowM3S)
          ctx.addIssue({ code: "custom", path: ["designHeatingFlowM3S"], message: `The heating airflow (${formatIn(units.flow, v.designHeatingFlowM3S)}) cannot be below the minimum (${formatIn(units.flow, v.designMinFlowM3S)}).` });
      } else {
        for (const key of ["designMinFlowM3S", "designHeatingFlowM3S"] as const)
          if (has(v[key])) ctx.addIssue({ code: "custom", path: [key], message: "A constant-volume box holds one design airflow; leave minimum and heating empty." });
      }
    } else {
      for (const key of ["designMinFlowM3S", "designHeatingFlowM3S", "controllerFlowFactor"] as const)
        if (has(v[key])) ctx.addIssue({ code: "custom", path: [key], message: "Minimum, heating airflow and flow factor belong to terminal units (VAV or constant-volume boxes), not outlets." });
    }
  };
  const terminal = terminalBase.superRefine(terminalRules);
  const terminalPatch = terminalBase.partial().refine((v) => Object.keys(v).length > 0, "Send at least one field to change.");

  return { project, projectPatch, system, systemPatch, section, sectionPatch, terminal, terminalPatch };
}

/** The API's schemas, messages in SI. */
export const DESIGN = designSchemas();
export type ProjectInput = z.infer<typeof DESIGN.project>;
export type ProjectPatch = z.infer<typeof DESIGN.projectPatch>;
export type SystemInput = z.infer<typeof DESIGN.system>;
export type SystemPatch = z.infer<typeof DESIGN.systemPatch>;
export type SectionInput = z.infer<typeof DESIGN.section>;
export type SectionPatch = z.infer<typeof DESIGN.sectionPatch>;
export type TerminalInput = z.infer<typeof DESIGN.terminal>;
export type TerminalPatch = z.infer<typeof DESIGN.terminalPatch>;

/** `mode=preview|commit` of a schedule upload. */
export const importModeSchema = z.enum(["preview", "commit"], { error: 'mode must be "preview" or "commit".' });
