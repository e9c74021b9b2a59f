import type { Operation } from "../registry";
import { terminalReadingCreateSchema } from "@/lib/validation/terminal-readings";

const READING_FIELDS =
  "`{id, terminalId, terminalTag, sectionId, systemId, setId, phase, method, setpoint, hoodFlowM3S, hoodCorrectionFactor, hoodDensityCorrected, hoodBackPressureCompensated, " +
  "velocitiesMS, velocityBasis, meanVelocityMS, effectiveAreaM2, traverseId, traverseVersion, traverseChanged, dryBulbC, relativeHumidityPct, barometricPa, densityKgM3, " +
  "flowM3S, standardFlowM3S, designFlowM3S, pctOfDesign, withinTolerance, tolerance: {minusPct, plusPct}, controllerFlowM3S, controllerFlowFactor, controllerRatio, suggestedFlowFactor, " +
  "damperMarked, conditionsId, instrumentId, instrumentName, airInstrumentId, overdueReason, notes, takenBy, takenByName, takenAt, createdAt, steps: string[], warnings: string[], flags: string[]}`. " +
  "`flowM3S` is the airflow at the air's density at the terminal, `standardFlowM3S` the same mass flow at the project's standard density, which design airflows are scheduled at; " +
  "`pctOfDesign` and `withinTolerance` compare the standard airflow with the design at the setpoint read, in the project's band for outlets or terminal units (null where nothing is scheduled). " +
  "`flags` say in words what is implausible (negative, above 3 × or below a tenth of design, beyond the instrument's range, a final outlet reading without the damper marked); the reading is kept whatever they say. " +
  "The words (`steps`, `warnings`, `flags`) use the caller's units (their preference, else the project's). `suggestedFlowFactor` = controllerFlowFactor × (standardFlowM3S ÷ controllerFlowM3S)²: the controller's factor multiplies the velocity pressure its sensor reads, and the airflow goes as its square root.";

/** Readings of air outlets, inlets and terminal units. */
export const terminalOperations: Operation[] = [
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/terminals/{terminalId}/readings",
    tag: "Terminal readings",
    summary: "Record an initial or final reading of an outlet, inlet or terminal unit",
    description:
      "`method`: `hood` (`hoodFlowM3S`, `hoodDensityCorrected`, `hoodBackPressureCompensated`, `dryBulbC`; `hoodCorrectionFactor` defaults to the register's factor for the hood), " +
      "`velocity_area` (`velocitiesMS` averaged, `velocityBasis`, `dryBulbC`; `effectiveAreaM2` defaults to the terminal's Ak) or `traverse` (`traverseId` of a traverse of the terminal's own duct: the section that feeds it and nothing else). " +
      "A reading the hood did not density-correct, and actual velocities, are referred to standard air with the density of the air at the terminal (its dry-bulb; RH 50 % when not given; the barometer's `barometricPa` or the standard atmosphere at the project's altitude). " +
      "Terminal units name the `setpoint` they were forced to (`maximum`, `minimum`, or `heating` where scheduled) and may give the controller's displayed airflow `controllerFlowM3S` and its factor as found. " +
      "Every reading names the system's operating conditions (`conditionsId`; a traverse's own by default) and, for hood and velocity readings, the instrument (`instrumentId`, optional `airInstrumentId`); an instrument past its calibration due date needs `overdueReason`. " +
      "The reading joins the system's open terminal set (a new draft set is opened when none is). A client-chosen `id` makes the request safe to retry. Nothing is overwritten: re-readings are new readings.",
    roles: "Technicians of the project.",
    body: terminalReadingCreateSchema,
    responses: {
      "201": { description: `\`{reading, warnings: string[]}\`, the reading ${READING_FIELDS} \`warnings\` add how its operating conditions differ from the terminal's previous reading.` },
      "200": { description: "The same `id` was recorded before on this terminal: `{reading, warnings}` as stored." },
    },
    errors: [403, 404, 409, 413],
  },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/terminals/{terminalId}/readings",
    tag: "Terminal readings",
    summary: "A terminal's readings, newest first, with the latest initial and final reading at each setpoint",
    roles: "Any member of the project.",
    responses: { "200": { description: "`{terminal, systemId, readings: [reading], latest: {<setpoint>: {initial, final}}, truncated}`" } },
    errors: [404],
  },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/terminal-readings",
    tag: "Terminal readings",
    summary: "Every terminal reading of the project or of one system, with the terminal sets and the operating conditions they name",
    roles: "Any member of the project.",
    query: { systemId: { description: "Only this air system's readings." } },
    responses: {
      "200": { description: "`{systemId, sets: [{id, systemId, status, version, revision, updatedAt}], readings: [reading], conditions: [conditions], truncated}`, newest reading first (at most 5,000)." },
    },
    errors: [400, 404],
  },
];
