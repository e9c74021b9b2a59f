/**
 * A reading of an air outlet, inlet or terminal unit (camelCase, SI), shared by
 * `POST /api/v1/projects/{projectId}/terminals/{terminalId}/readings` and the entry panel on the
 * Terminals screen. The fields of each method are checked together, and fields that belong to
 * another method are refused, so a reading never carries numbers that were not used.
 */
import "./zod-browser";
import { z } from "zod";
import { MAX_VELOCITY_READINGS } from "@/lib/airflow/terminal-flow";
import { HOOD_FACTOR } from "./instruments";
import { describeValue } from "./calc";
import { MAX_BACKDATE_DAYS, MAX_FUTURE_MINUTES } from "./conditions";
import { boundedText, clientId, enumOf, nullableNumber } from "./fields";
import { READING_METHODS, READING_PHASES, TERMINAL_SETPOINTS } from "@/lib/terminals/setpoints";

export const VELOCITY_BASES = ["actual", "standard"] as const;

/** Plausible bounds (SI), beyond which a value is a typo or a unit slip rather than a reading (our choice). */
export const READING_LIMITS = {
  /** A capture hood or a box's display, m³/s: 10 m³/s is far beyond any outlet (hoods top out near 1 m³/s). Negative hood readings mean reversed air and are kept, flagged. */
  flowM3S: { min: -10, max: 10 },
  /** Anemometer velocity, m/s; negative only for an instrument that shows direction. */
  velocityMS: { min: -50, max: 50 },
  effectiveAreaM2: { min: 0.0001, max: 10 },
  /** Air at an outlet, °C. */
  dryBulbC: { min: -30, max: 60 },
  barometricPa: { min: 50_000, max: 110_000 },
  flowFactor: { min: 0.001, max: 100_000 },
} as const;

const uuid = (what: string) =>
  z
    .string({ error: (iss) => `must be the id of ${what}; got ${describeValue(iss.input)}` })
    .regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i, { error: (iss) => `must be the id of ${what}; got ${describeValue(iss.input)}` })
    .transform((s) => s.toLowerCase());

const flag = (what: string) => z.boolean({ error: (iss) => `must be true or false (${what}); got ${describeValue(iss.input)}` });

const velocity = z
  .number({ error: (iss) => `must be a velocity in m/s from ${READING_LIMITS.velocityMS.min} to ${READING_LIMITS.velocityMS.max}; got ${describeValue(iss.input)}` })
  .min(READING_LIMITS.velocityMS.min, { error: (iss) => `must be a velocity in m/s from ${READING_LIMITS.velocityMS.min} to ${READING_LIMITS.velocityMS.max}; got ${describeValue(iss.input)}` })
  .max(READING_LIMITS.velocityMS.max, { error: (iss) => `must be a velocity in m/s from ${READING_LIMITS.velocityMS.min} to ${READING_LIMITS.velocityMS.max}; got ${describeValue(iss.input)}` });

const takenAtField = z
  .string({ error: (iss) => `must be a date and time such as 2026-11-24T09:40:00Z; got ${describeValue(iss.input)}` })
  .max(40, { error: "must be a date and time such as 2026-11-24T09:40:00Z" })
  .refine((s) => !Number.isNaN(Date.parse(s)) && /^\d{4}-\d{2}-\d{2}T/.test(s), { error: (iss) => `must be a date and time such as 2026-11-24T09:40:00Z; got ${describeValue(iss.input)}` });

/** The fields that belong to one method only. */
const HOOD_FIELDS = ["hoodFlowM3S", "hoodCorrectionFactor", "hoodDensityCorrected", "hoodBackPressureCompensated"] as const;
const VELOCITY_FIELDS = ["velocitiesMS", "velocityBasis", "effectiveAreaM2"] as const;
const AIR_FIELDS = ["dryBulbC", "relativeHumidityPct", "barometricPa", "airInstrumentId"] as const;

export const terminalReadingCreateSchema = z
  .strictObject({
    /** Chosen by the device, so a create retried after a lost answer is recognised, not stored twice. */
    id: clientId.optional(),
    phase: enumOf(READING_PHASES, "initial: as found; final: after adjustment"),
    method: enumOf(READING_METHODS, "capture hood, velocity × effective area, or a traverse of the terminal's own duct"),
    /** Outlets: "design" (the default). Terminal units: the setpoint the unit was forced to. */
    setpoint: enumOf(TERMINAL_SETPOINTS, "the setpoint the terminal was read at").optional(),

    hoodFlowM3S: z
      .number({ error: (iss) => `must be the hood's reading in m³/s from ${READING_LIMITS.flowM3S.min} to ${READING_LIMITS.flowM3S.max}; got ${describeValue(iss.input)}` })
      .min(READING_LIMITS.flowM3S.min, { error: (iss) => `must be the hood's reading in m³/s from ${READING_LIMITS.flowM3S.min} to ${READING_LIMITS.flowM3S.max}; got ${describeValue(iss.input)}` })
      .max(READING_LIMITS.flowM3S.max, { error: (iss) => `must be the hood's reading in m³/s from ${READING_LIMITS.flowM3S.min} to ${READING_LIMITS.flowM3S.max}; got ${describeValue(iss.input)}` })
      .optional(),
    /** Null or absent: the register's factor for the hood (1 when it has none). */
    hoodCorrectionFactor: nullableNumber(HOOD_FACTOR.min, HOOD_FACTOR.max, "").optional(),
    hoodDensityCorrected: flag("whether the hood corrected its reading for density, per its instructions").optional(),
    hoodBackPressureCompensated: flag("whether the hood's back pressure was compensated, per its instructions").optional(),

    velocitiesMS: z
      .array(velocity, { error: (iss) => `must be a list of velocities in m/s; got ${describeValue(iss.input)}` })
      .min(1, { error: "give at least one velocity reading" })
      .max(MAX_VELOCITY_READINGS, { error: (iss) => `give at most ${MAX_VELOCITY_READINGS} velocity readings; got ${Array.isArray(iss.input) ? iss.input.length : "more"}` })
      .optional(),
    velocityBasis: enumOf(VELOCITY_BASES, "actual velocities, or velocities referred to standard air").optional(),
    /** Null or absent: the terminal's Ak on record. */
    effectiveAreaM2: nullableNumber(READING_LIMITS.effectiveAreaM2.min, READING_LIMITS.effectiveAreaM2.max, "m²").optional(),

    traverseId: uuid("a traverse of this terminal's own duct").optional(),

    dryBulbC: nullableNumber(READING_LIMITS.dryBulbC.min, READING_LIMITS.dryBulbC.max, "°C").optional(),
    relativeHumidityPct: nullableNumber(0, 100, "% RH").optional(),
    /** A barometer's station reading; absent: the standard atmosphere at the project's altitude. */
    barometricPa: nullableNumber(READING_LIMITS.barometricPa.min, READING_LIMITS.barometricPa.max, "Pa").optional(),

    controllerFlowM3S: nullableNumber(0, READING_LIMITS.flowM3S.max, "m³/s").optional(),
    /** The flow factor found in the controller; null or absent: the one in the design. */
    controllerFlowFactor: nullableNumber(READING_LIMITS.flowFactor.min, READING_LIMITS.flowFactor.max, "").optional(),

    damperMarked: flag("whether the damper position was marked").default(false),
    conditionsId: uuid("operating conditions recorded for this terminal's system").nullable().optional(),
    instrumentId: uuid("an instrument in the register").nullable().optional(),
    airInstrumentId: uuid("a thermometer or thermo-hygrometer in the register").nullable().optional(),
    overdueReason: boundedText(500).default(""),
    notes: boundedText(1_000).default(""),
    /** When the reading was taken, if not now (a reading made offline and sent later). */
    takenAt: takenAtField.optional(),
  })
  .superRefine(
    (r, ctx) => {
      const has = (key: string) => (r as Record<string, unknown>)[key] !== undefined && (r as Record<string, unknown>)[key] !== null;
      const need = (key: string, message: string) => {
        if ((r as Record<string, unknown>)[key] === undefined || (r as Record<string, unknown>)[key] === null) ctx.addIssue({ code: "custom", path: [key], message });
      };
      const refuse = (keys: readonly string[], method: string) => {
        for (const key of keys) if (has(key)) ctx.addIssue({ code: "custom", path: [key], message: `belongs to another method; leave it out of a ${method} reading` });
      };
      if (r.method === "hood") {
        need("hoodFlowM3S", "give the hood's reading in m³/s");
        need("hoodDensityCorrected", "say whether the hood corrected its reading for density (true) or not (false), per its instructions");
        need("hoodBackPressureCompensated", "say whether the hood's back pressure was compensated (true) or not (false), per its instructions");
        need("dryBulbC", "give the dry-bulb at the outlet in °C: the air's density refers the reading to standard air");
        refuse([...VELOCITY_FIELDS, "traverseId"], "capture-hood");
      } else if (r.method === "velocity_area") {
        need("velocitiesMS", "give the anemometer's velocity readings in m/s");
        need("velocityBasis", 'say whether the velocities are "actual" or "standard"');
        need("dryBulbC", "give the dry-bulb at the outlet in °C: the air's density refers the airflow to standard air");
        refuse([...HOOD_FIELDS, "traverseId"], "velocity × area");
      } else if (r.method === "traverse") {
        need("traverseId", "give the id of the traverse of this terminal's own duct");
        refuse([...HOOD_FIELDS, ...VELOCITY_FIELDS, ...AIR_FIELDS], "traverse");
      }
      if (typeof r.takenAt === "string" && !Number.isNaN(Date.parse(r.takenAt))) {
        const at = Date.parse(r.takenAt);
        const now = Date.now();
        if (at > now + MAX_FUTURE_MINUTES * 60_000) ctx.addIssue({ code: "custom", path: ["takenAt"], message: `cannot be in the future; got ${r.takenAt}` });
        else if (at < now - MAX_BACKDATE_DAYS * 86_400_000) ctx.addIssue({ code: "custom", path: ["takenAt"], message: `cannot be more than ${MAX_BACKDATE_DAYS} days ago; got ${r.takenAt}` });
      }
    },
    { when: (payload) => typeof payload.value === "object" && payload.value !== null },
  );
export type TerminalReadingCreateInput = z.input<typeof terminalReadingCreateSchema>;
export type TerminalReadingCreate = z.output<typeof terminalReadingCreateSchema>;

/** `GET …/terminal-readings?systemId=`: the query's only parameter. */
export const terminalReadingsQuerySchema = z.strictObject({ systemId: uuid("an air system of this project").optional() });
