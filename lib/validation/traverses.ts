/**
 * Traverse resources (camelCase, SI: mm, Pa, °C, kg/m³, m/s), shared by the traverse routes under
 * `/api/v1/projects/{projectId}/traverses` and the technician's screens. Checks that need the stored
 * traverse (the grid's shape, the layout counts for the section's duct, instrument kinds) are made by
 * lib/server/traverses.ts with the same wording.
 */
import "./zod-browser";
import { z } from "zod";
import { describeValue, MAX_LINES, MAX_POINTS_PER_LINE } from "./calc";
import { boundedText, clientId, enumOf, nullableNumber } from "./fields";

export const TRAVERSE_METHODS = ["equal-area", "log-linear"] as const;
export const READINGS_KINDS = ["velocity_pressure", "velocity_actual", "velocity_standard"] as const;
export type ReadingsKind = (typeof READINGS_KINDS)[number];

/** Accepted reading values by kind (as the calc command accepts them): Pa for pitot readings, m/s for anemometers. */
export const READING_LIMITS: Readonly<Record<ReadingsKind, { min: number; max: number; unit: string; what: string }>> = {
  velocity_pressure: { min: -500, max: 5_000, unit: "Pa", what: "a velocity pressure" },
  velocity_actual: { min: -100, max: 100, unit: "m/s", what: "an actual velocity" },
  velocity_standard: { min: -100, max: 100, unit: "m/s", what: "a standard velocity" },
};

const uuidMessage = (what: string) => (iss: { input?: unknown }) => `must be the id of ${what}; got ${describeValue(iss.input)}`;
const idOf = (what: string) =>
  z
    .string({ error: uuidMessage(what) })
    .regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i, { error: uuidMessage(what) })
    .transform((s) => s.toLowerCase());

const STATIC_ALLOWED = "the duct static pressure at the plane, a number from -10000 to 10000 Pa (gauge), or null if it was not measured (0 Pa is then assumed and the result says so)";

/**
 * Air at the plane. Dry-bulb, and relative humidity or wet-bulb (one of them); the duct static pressure
 * must be given, null when it was not measured; barometric pressure when measured (else the project's
 * altitude gives it).
 */
export const traverseAirSchema = z
  .strictObject(
    {
      dryBulbC: z.number({ error: (iss) => `must be the dry-bulb temperature, a number from -40 to 120 °C; got ${describeValue(iss.input)}` }).min(-40, { error: (iss) => `must be from -40 to 120 °C; got ${describeValue(iss.input)}` }).max(120, { error: (iss) => `must be from -40 to 120 °C; got ${describeValue(iss.input)}` }),
      relativeHumidityPct: nullableNumber(0, 100, "%").optional(),
      wetBulbC: nullableNumber(-40, 120, "°C").optional(),
      staticPa: z.custom<number | null>((v) => v === null || (typeof v === "number" && Number.isFinite(v) && v >= -10_000 && v <= 10_000), {
        error: (iss) => (iss.input === undefined ? `is needed: give ${STATIC_ALLOWED}; got nothing` : `must be ${STATIC_ALLOWED}; got ${describeValue(iss.input)}`),
      }),
      barometricPa: nullableNumber(50_000, 110_000, "Pa").optional(),
    },
    { error: (iss) => `must be an object with dryBulbC, relativeHumidityPct or wetBulbC, staticPa and optionally barometricPa; got ${describeValue(iss.input)}` },
  )
  .superRefine((air, ctx) => {
    const rh = air.relativeHumidityPct ?? null;
    const wb = air.wetBulbC ?? null;
    if ((rh === null) === (wb === null))
      ctx.addIssue({ code: "custom", path: ["relativeHumidityPct"], message: rh === null ? "give relativeHumidityPct (%) or wetBulbC (°C); got neither" : "give relativeHumidityPct or wetBulbC, not both" });
    if (wb !== null && typeof air.dryBulbC === "number" && wb > air.dryBulbC)
      ctx.addIssue({ code: "custom", path: ["wetBulbC"], message: `must be at or below the dry-bulb ${air.dryBulbC} °C; got ${wb}` });
  });
export type TraverseAirInput = z.input<typeof traverseAirSchema>;

/** The instruments a traverse is read with, by id from the register, and what the register cannot say. */
export const traverseInstrumentSchema = z.strictObject(
  {
    /** Manometer (pitot readings) or thermal / vane anemometer (velocity readings). */
    readingInstrumentId: idOf("a manometer or anemometer in the instrument register").nullable().optional(),
    /** The pitot-static tube: its coefficient and head diameter go to the engine. */
    probeInstrumentId: idOf("a pitot tube in the instrument register").nullable().optional(),
    /** The thermo-hygrometer that read dry-bulb and humidity. */
    airInstrumentId: idOf("a thermo-hygrometer in the instrument register").nullable().optional(),
    barometerInstrumentId: idOf("a barometer in the instrument register").nullable().optional(),
    /** Why an instrument past its calibration due date (or without one) was used. */
    overdueReason: boundedText(500).optional(),
    /** Anemometers reading standard velocity: the density they refer to, from their manual (default: the project's standard air). */
    standardDensityKgM3: nullableNumber(1.0, 1.3, "kg/m³").optional(),
  },
  { error: (iss) => `must be an object with readingInstrumentId, probeInstrumentId, airInstrumentId, barometerInstrumentId and overdueReason; got ${describeValue(iss.input)}` },
);
export type TraverseInstrumentInput = z.input<typeof traverseInstrumentSchema>;

const countOf = (what: string, max: number) =>
  z
    .number({ error: (iss) => `must be a whole number of ${what} from 1 to ${max}; got ${describeValue(iss.input)}` })
    .int({ error: (iss) => `must be a whole number of ${what}; got ${describeValue(iss.input)}` })
    .min(1, { error: (iss) => `must be at least 1; got ${describeValue(iss.input)}` })
    .max(max, { error: (iss) => `must be at most ${max}; got ${describeValue(iss.input)}` });

export const traverseCreateSchema = z.strictObject(
  {
    /** Chosen by the device, so a create retried after a lost answer is recognised, not stored twice. */
    id: clientId.optional(),
    sectionId: idOf("a duct section of this project"),
    method: enumOf(TRAVERSE_METHODS, "equal-area, or log-linear (log-Tchebycheff on rectangular ducts)"),
    lines: countOf("lines (diameters on a round duct)", MAX_LINES).optional(),
    pointsPerLine: countOf("points per line", MAX_POINTS_PER_LINE).optional(),
    portOffsetMm: nullableNumber(0, 2_000, "mm (from the outside of the port to the inside of the duct wall)").optional(),
    readingsKind: enumOf(READINGS_KINDS, "velocity pressures in Pa from a pitot tube, or velocities in m/s from an anemometer").optional(),
    air: traverseAirSchema,
    instrument: traverseInstrumentSchema.optional(),
    /** The operating conditions the readings are taken under (a record of the section's system). */
    conditionsId: idOf("operating conditions recorded for the section's system").nullable().optional(),
    notes: boundedText(2_000).optional(),
  },
  { error: (iss) => `must be an object with sectionId, method and air; got ${describeValue(iss.input)}` },
);
export type TraverseCreateInput = z.input<typeof traverseCreateSchema>;
export type TraverseCreate = z.output<typeof traverseCreateSchema>;

const versionSchema = z
  .number({ error: (iss) => `must be the traverse's version as last read (a whole number); got ${describeValue(iss.input)}` })
  .int({ error: (iss) => `must be a whole number; got ${describeValue(iss.input)}` })
  .min(1, { error: (iss) => `must be at least 1; got ${describeValue(iss.input)}` });

const readingValue = z.custom<number | null>((v) => v === null || (typeof v === "number" && Number.isFinite(v)), {
  error: (iss) => `must be a number (or null for a point not read); got ${describeValue(iss.input)}`,
});

/** A grid line by line, point by point in layout order. Its shape is checked against the traverse. */
export const readingsGridSchema = z
  .array(
    z
      .array(readingValue, { error: (iss) => `must be a list of readings along one line; got ${describeValue(iss.input)}` })
      .max(MAX_POINTS_PER_LINE, { error: (iss) => `has ${(iss.input as unknown[]).length} readings; a line holds at most ${MAX_POINTS_PER_LINE}` }),
    { error: (iss) => `must be a list of lines, each a list of readings (number or null); got ${describeValue(iss.input)}` },
  )
  .max(MAX_LINES, { error: (iss) => `has ${(iss.input as unknown[]).length} lines; a traverse has at most ${MAX_LINES}` });

const pointRef = z.tuple(
  [
    z.number({ error: "must be a line number, counted from 0" }).int({ error: "must be a whole line number, counted from 0" }).min(0, { error: "must be a line number, counted from 0" }),
    z.number({ error: "must be a point number, counted from 0" }).int({ error: "must be a whole point number, counted from 0" }).min(0, { error: "must be a point number, counted from 0" }),
  ],
  { error: (iss) => `must be [line, point], both counted from 0 as in readings; got ${describeValue(iss.input)}` },
);

/**
 * `PUT …/traverses/{id}/readings`: the whole grid (Pa, or m/s for anemometer kinds; null for a point
 * not read) and the points that could not be read for an obstruction. The screens also send the air,
 * instruments and conditions here with the same version, so an offline device saves everything it
 * holds in one versioned request.
 */
export const readingsSaveSchema = z.strictObject(
  {
    version: versionSchema,
    readings: readingsGridSchema,
    unreadable: z
      .array(pointRef, { error: (iss) => `must be a list of [line, point] pairs, counted from 0; got ${describeValue(iss.input)}` })
      .max(MAX_LINES * MAX_POINTS_PER_LINE, { error: "lists more points than a traverse has" })
      .optional(),
    air: traverseAirSchema.optional(),
    instrument: traverseInstrumentSchema.optional(),
    conditionsId: idOf("operating conditions recorded for the section's system").nullable().optional(),
  },
  { error: (iss) => `must be an object with version and readings; got ${describeValue(iss.input)}` },
);
export type ReadingsSaveInput = z.input<typeof readingsSaveSchema>;
export type ReadingsSave = z.output<typeof readingsSaveSchema>;

/** `PATCH …/traverses/{id}`: the air, instruments, conditions, port offset or notes of a draft. */
export const traversePatchSchema = z.strictObject(
  {
    version: versionSchema,
    air: traverseAirSchema.optional(),
    instrument: traverseInstrumentSchema.optional(),
    conditionsId: idOf("operating conditions recorded for the section's system").nullable().optional(),
    portOffsetMm: nullableNumber(0, 2_000, "mm").optional(),
    notes: boundedText(2_000).optional(),
  },
  { error: (iss) => `must be an object with version and the fields to change; got ${describeValue(iss.input)}` },
);
export type TraversePatch = z.output<typeof traversePatchSchema>;
