import type { Operation } from "../registry";
import { readingsSaveSchema, traverseCreateSchema, traversePatchSchema } from "@/lib/validation/traverses";

const TRAVERSE_FIELDS =
  "`{id, sectionId, sectionTag, systemId, systemTag, revision, status, version, method, lines, pointsPerLine, portOffsetMm, readingsKind, " +
  "air: {dryBulbC, relativeHumidityPct, wetBulbC, staticPa, barometricPa}, instrument: {readingInstrumentId, probeInstrumentId, airInstrumentId, barometerInstrumentId, overdueReason, standardDensityKgM3, probeCoefficient, probeHeadDiameterMm, accuracy, reading, probe, airMeter, barometer, calibrationProblems}, " +
  "conditionsId, conditions, notes, takenBy, takenByName, takenAt, createdAt, updatedAt, section, project: {altitudeM, standardDensityKgM3}, " +
  "readings: (number|null)[][] (line by line, 0-based, Pa or m/s), unreadable: [line, point][], layout (the calc `layout` output in camelCase: points, insertion depths, reach), " +
  "engineInput (exactly what `npm run -s calc -- traverse` takes), result (its output in camelCase: densityKgM3, meanVelocityMS, flowM3S, standardFlowM3S, massFlowKgS, quality, uncertainty {expandedPct, coverageFactor 2, shown…}, points, integrationRule, filledPoints, warnings…, " +
  "plus pctOfDesign, counts {points, read, unreadable, notRead} and complete) or null with resultError {message, fields?}}`";

/** Pitot and anemometer traverses, taken by technicians. */
export const traverseOperations: Operation[] = [
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/traverses",
    tag: "Traverses",
    summary: "Start a traverse of a duct section (the next revision when the section already has one)",
    description:
      "Counts left out are the engine's recommendation for the duct and its straight run. Instruments are ids from the register (a manometer for velocity pressures, an anemometer for velocities; a pitot tube; a thermo-hygrometer; a barometer): their accuracies, probe coefficient and head diameter are copied onto the traverse for the engine. " +
      "`air.staticPa` must be given, null when not measured (0 Pa is then assumed and the result says so); `air.barometricPa` left out uses the project's altitude. A client-chosen `id` makes the request safe to retry.",
    roles: "Technicians of the project.",
    body: traverseCreateSchema,
    responses: { "201": { description: `\`{traverse}\`, status "draft", ${TRAVERSE_FIELDS}` }, "200": { description: "The same `id` was created before by this user: `{traverse}` as stored." } },
    errors: [403, 409, 413],
  },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/traverses/{traverseId}",
    tag: "Traverses",
    summary: "A traverse with its readings, layout, the engine's input and result, and the section's revisions",
    roles: "Any member of the project.",
    responses: { "200": { description: `\`{traverse}\`, ${TRAVERSE_FIELDS}, plus revisions: [{id, revision, status, method, createdAt, takenAt, takenByName, readCount}] latest first.` } },
    errors: [404],
  },
  {
    method: "put",
    path: "/api/v1/projects/{projectId}/traverses/{traverseId}/readings",
    tag: "Traverses",
    summary: "Save the whole readings grid at the traverse's current version",
    description:
      "`readings` has the traverse's lines × pointsPerLine, null for a point not read; `unreadable` lists [line, point] (0-based) that could not be read for an obstruction (their readings are null): the engine integrates around both and says how. " +
      "A grid of another shape, a value out of range or a value on an unreadable point answers 400 naming `readings.L.P`. `air`, `instrument` and `conditionsId` may be sent with the readings (one versioned save). " +
      "A stale `version` answers 409 `{error, traverse: current}` and nothing changes; a submitted or approved traverse answers 409 `{error, status}` (re-traverse instead).",
    roles: "Technicians of the project.",
    body: readingsSaveSchema,
    responses: { "200": { description: `\`{traverse}\` at the next version with its result, ${TRAVERSE_FIELDS}` } },
    errors: [403, 404, 409, 413],
  },
  {
    method: "patch",
    path: "/api/v1/projects/{projectId}/traverses/{traverseId}",
    tag: "Traverses",
    summary: "Change the air, instruments, operating conditions, port offset or notes of a draft traverse",
    description: "At the current `version`; a stale one answers 409 `{error, traverse: current}` and nothing changes. Before and after go to the audit log.",
    roles: "Technicians of the project.",
    body: traversePatchSchema,
    responses: { "200": { description: "`{traverse}` at the next version." } },
    errors: [403, 404, 409, 413],
  },
];
