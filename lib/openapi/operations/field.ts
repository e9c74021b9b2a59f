import type { Operation } from "../registry";
import { conditionsCreateSchema } from "@/lib/validation/conditions";
import { instrumentCreateSchema, instrumentPatchSchema } from "@/lib/validation/instruments";

const INSTRUMENT_FIELDS =
  "`{id, kind, make, model, serial, certificateNumber, calibratedOn, calibrationDueOn, rangeMin, rangeMax, accuracyPct, accuracyFloor, humidityAccuracyPct, " +
  "probeCoefficient, probeHeadDiameterMm, hoodCorrectionFactor, notes, retiredAt, createdBy, createdAt, updatedAt, name, " +
  "calibrationStatus: {status: \"ok\"|\"due-soon\"|\"overdue\"|\"no-due-date\"|\"retired\", ok, reasonRequired, usable, daysUntilDue, message}}`. " +
  "Range and accuracy floor are in the SI unit of the kind: Pa (manometer, barometer), mm of usable length (pitot tube), m³/s (capture hood), " +
  "m/s (anemometers), rpm (tachometer), A (clamp meter), °C (thermo-hygrometer; its % RH accuracy is humidityAccuracyPct).";

const CONDITIONS_FIELDS =
  "`{id, systemId, fanSpeedRpm, vfdHz, boxes, outsideAirDamperPct, ductStaticSetpointPa, filterState, notes, recordedBy, recordedByName, recordedAt}` (Pa for the set point)";

const KEEPERS = "Read: any signed-in user. Change: a technician on at least one project, or a site administrator.";

/** The instrument register (deployment-wide) and each system's operating conditions. */
export const fieldOperations: Operation[] = [
  {
    method: "get",
    path: "/api/v1/instruments",
    tag: "Instrument register",
    summary: "The instrument register, with each instrument's calibration status today",
    roles: "Any signed-in user.",
    query: {
      kind: { description: "Comma-separated kinds, e.g. `manometer,pitot_tube`." },
      includeRetired: { description: "`true` to include retired instruments.", schema: { type: "string", enum: ["true", "false"] } },
    },
    responses: { "200": { description: `\`{instruments: [instrument]}\`, each ${INSTRUMENT_FIELDS}` } },
    errors: [400],
  },
  {
    method: "post",
    path: "/api/v1/instruments",
    tag: "Instrument register",
    summary: "Add an instrument to the register",
    description: "Values in SI for the kind. Fields that belong to another kind (a hood factor on a manometer) are refused, as are a range minimum not below its maximum and a due date not after the calibration date.",
    roles: KEEPERS,
    body: instrumentCreateSchema,
    responses: { "201": { description: "`{instrument}`" } },
    errors: [403, 409, 413],
  },
  {
    method: "get",
    path: "/api/v1/instruments/{instrumentId}",
    tag: "Instrument register",
    summary: "One instrument, with how often it was used for readings",
    roles: "Any signed-in user.",
    responses: { "200": { description: "`{instrument: {…, usage: {traverses, terminalReadings, lastUsedAt}}}`" } },
    errors: [404],
  },
  {
    method: "patch",
    path: "/api/v1/instruments/{instrumentId}",
    tag: "Instrument register",
    summary: "Change an instrument, retire it (`retired: true`) or return it to service (`retired: false`)",
    description:
      "The result must still be a valid record. A used instrument keeps its kind (409). With `ifUpdatedAt` (the `updatedAt` last read), a change made by someone else meanwhile answers 409 `{error, instrument: current}` and nothing is saved. Before and after go to the audit log.",
    roles: KEEPERS,
    body: instrumentPatchSchema,
    responses: { "200": { description: "`{instrument}`" } },
    errors: [403, 404, 409, 413],
  },
  {
    method: "delete",
    path: "/api/v1/instruments/{instrumentId}",
    tag: "Instrument register",
    summary: "Remove an entry made in error; one used for any reading is kept (409): retire it instead",
    roles: KEEPERS,
    responses: { "204": { description: "Removed." } },
    errors: [403, 404, 409],
  },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/systems/{systemId}/conditions",
    tag: "Operating conditions",
    summary: "A system's recorded operating conditions, newest first",
    roles: "Any member of the project.",
    responses: { "200": { description: `\`{systemId, current, conditions: [conditions]}\`, each ${CONDITIONS_FIELDS}; \`current\` is the newest or null.` } },
    errors: [404],
  },
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/systems/{systemId}/conditions",
    tag: "Operating conditions",
    summary: "Record the conditions a system runs under while readings are taken",
    description:
      "Give the fan speed (rpm) or the drive frequency (Hz), or both. A client-chosen `id` makes the request safe to retry: the same id on the same system answers 200 with the stored record. " +
      "Plausible but unusual values (a fan speed far from the schedule) are stored and returned with `warnings`.",
    roles: "Technicians of the project.",
    body: conditionsCreateSchema,
    responses: {
      "201": { description: "`{conditions, warnings: string[]}`" },
      "200": { description: "The same `id` was recorded before: `{conditions, warnings}` as stored." },
    },
    errors: [403, 404, 409, 413],
  },
];
