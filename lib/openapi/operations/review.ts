import type { Operation } from "../registry";
import { reviewDecisionSchema, sampleDrawSchema, sampleReadingSchema, sampleWitnessSchema, submitSchema, systemReviewSchema } from "@/lib/validation/review";

const TERMINAL_SET_FIELDS = "`{terminalSet: {id, systemId, systemTag, status, version, revision, notes, submittedBy, submittedByName, submittedAt, readingCount, terminalCount, createdAt, updatedAt}}`";
const SAMPLE_FIELDS =
  "`{sample: {id, systemId, systemTag, seed, rule: {samplePct, minCount, tolerancePct, allowedFailures}, populationCount, populationByKind, sizes: {perKind, total}, reproduced (the stored seed draws the same items again), status: open|closed, drawnBy, drawnByName, drawnAt, " +
  "outcome: {read, agreed, disagreed, notRead, recommendReturn, message, agreedCount, disagreedCount}, recommendReturn, items: [{id, position, kind: outlet|terminal_unit|section, terminalId, sectionId, tag, technician: {flowM3S, readingId, traverseId, conditionsId}, agent: {method, flowM3S, detail, conditionsId, readBy, readByName, readAt} | null, conditionsDiffer: string[], differencePct, agrees: boolean|null, witnessed}]}}` (flows are standard airflow, m³/s)";

/** Submission, decisions, verification samples and the audit trail. */
export const reviewOperations: Operation[] = [
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/traverses/{traverseId}/submit",
    tag: "Review",
    summary: "Submit a draft or returned traverse for review",
    description:
      "Only from draft or returned (409 `{error, status}` otherwise). The submission checks must pass, else 400 naming each field: `readings` (every point read or marked unreadable, and a result the engine accepts), `air.dryBulbC`, `air.relativeHumidityPct`, `conditionsId`, and the instruments' calibration (`instrument.*`, `instrument.overdueReason`). " +
      "While submitted the readings are locked (409 on `PUT …/readings` and `PATCH`). The project's commissioning agents are notified in the same transaction.",
    roles: "Technicians of the project.",
    body: submitSchema,
    responses: { "200": { description: '`{traverse: {status: "submitted", …}}` (the traverse resource).' } },
    errors: [400, 403, 404, 409, 413],
  },
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/traverses/{traverseId}/review",
    tag: "Review",
    summary: "Approve or return a submitted traverse",
    description:
      "`decision` \"approve\" or \"return\"; a return needs `comment` (400 naming `comment`). Only on a submitted traverse (409 otherwise). The decision is kept in `reviews` with the traverse's version; the technician is notified of a return with the comment, the engineer and owner of an approval. " +
      "An approved traverse is locked: `PUT …/readings` answers 409 saying to re-traverse; a re-traverse (`POST …/traverses` on the same section) is the section's next revision and the section counts as not approved until that one is.",
    roles: "Commissioning agents of the project.",
    body: reviewDecisionSchema,
    responses: { "200": { description: '`{traverse: {status: "approved"|"returned", …}}`.' } },
    errors: [400, 403, 404, 409, 413],
  },
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/terminal-sets/{setId}/submit",
    tag: "Review",
    summary: "Submit a system's terminal readings (its open terminal set) for review",
    description:
      "Only from draft or returned (409 otherwise). Checks, 400 naming each field: `readings` (at least one), `terminals` (every outlet and terminal unit of the system read in this set or an approved one), `readings.<tag>.overdueReason` and `readings.<tag>.conditionsId`. While submitted, new terminal readings of the system answer 409; after approval they open the next set.",
    roles: "Technicians of the project.",
    body: submitSchema,
    responses: { "200": { description: TERMINAL_SET_FIELDS } },
    errors: [400, 403, 404, 409, 413],
  },
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/terminal-sets/{setId}/review",
    tag: "Review",
    summary: "Approve or return a submitted terminal set",
    description: "The same rules as a traverse's review; the decision is a row in `reviews` naming the set and its version.",
    roles: "Commissioning agents of the project.",
    body: reviewDecisionSchema,
    responses: { "200": { description: TERMINAL_SET_FIELDS } },
    errors: [400, 403, 404, 409, 413],
  },
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/systems/{systemId}/review",
    tag: "Review",
    summary: "Approve or return everything submitted in one system, in one transaction",
    description: "Every section's current traverse that is submitted and the system's submitted terminal set get the same decision (a return needs `comment`), all or none; each is its own row in `reviews` with `systemWide` true. 409 when nothing is submitted.",
    roles: "Commissioning agents of the project.",
    body: systemReviewSchema,
    responses: { "200": { description: "`{system: {id, tag}, decision, traverses: [{id, sectionTag, revision, status}], terminalSets: [{id, revision, status}]}`." } },
    errors: [400, 403, 404, 409, 413],
  },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/review-queue",
    tag: "Review",
    summary: "The review queue: current traverses and terminal sets that are submitted, returned or approved",
    description:
      "Each item: `{type: traverse|terminal_set, id, systemId, systemTag, tag, label, location, status, revision, version, takenByName, takenAt, submittedAt, notes, designFlowM3S, flowM3S, standardFlowM3S, massFlowKgS, pctOfDesign, withinTolerance, uncertaintyPct, uncertaintyShown (\"± x % (k = 2, about 95 %)\"), quality {verdict, reasons}, warnings, conditions, lastReview {decision, comment, witnessed, systemWide, reviewerName, at, version}}`; terminal sets add `terminals {read, of, within, outside, readings}`. Plus `counts {submitted, returned, approved}` and `systems`.",
    roles: "Any member of the project.",
    responses: { "200": { description: "`{items, counts, systems}`." } },
    errors: [404],
  },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/samples",
    tag: "Review",
    summary: "The project's verification samples, newest first",
    query: { systemId: { description: "Only this air system's samples." } },
    roles: "Any member of the project.",
    responses: { "200": { description: "`{samples: [sample]}`, each as in the draw's answer." } },
    errors: [400, 404],
  },
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/samples",
    tag: "Review",
    summary: "Draw a verification sample of a submitted system",
    description:
      "From each section whose current traverse is submitted or approved and each outlet and terminal unit read in the system's submitted (else approved) terminal set: ⌈N × samplePct / 100⌉ of each kind (at least one), topped up to the project's minimum from the rest; xoroshiro128+ (pure-rand) from `seed` (a fresh one when left out), which is stored so the same draw can be shown again. 409 when nothing in the system is submitted.",
    roles: "Commissioning agents of the project.",
    body: sampleDrawSchema,
    responses: { "201": { description: SAMPLE_FIELDS } },
    errors: [400, 403, 404, 409, 413],
  },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/samples/{sampleId}",
    tag: "Review",
    summary: "One verification sample with its items, the agent's readings and the outcome",
    roles: "Any member of the project.",
    responses: { "200": { description: SAMPLE_FIELDS } },
    errors: [404],
  },
  {
    method: "put",
    path: "/api/v1/projects/{projectId}/samples/{sampleId}/items/{itemId}/reading",
    tag: "Review",
    summary: "Enter the agent's own reading of a sampled item",
    description:
      "Outlets and terminal units: `hood` (`standardFlowM3S`, the hood's airflow after its correction factor, at standard air) or `velocity_area` (`velocitiesMS` at standard air averaged × `effectiveAreaM2`); sections: `spot_traverse` (`standardFlowM3S`). " +
      "Compared with the technician's standard airflow: agrees within ± the sample's tolerance. When the operating conditions (`conditionsId`) differ from the technician's (compareConditions), the reading is kept but not judged (`agrees` null) and `warnings` say how they differ. The sample's outcome and its recommendation to return the system follow.",
    roles: "Commissioning agents of the project.",
    body: sampleReadingSchema,
    responses: { "200": { description: `${SAMPLE_FIELDS}, plus \`item\`, \`outcome\` and \`warnings\` when not compared.` } },
    errors: [400, 403, 404, 413],
  },
  {
    method: "patch",
    path: "/api/v1/projects/{projectId}/samples/{sampleId}/items/{itemId}",
    tag: "Review",
    summary: "Mark a sampled item witnessed (the agent was present while it was read)",
    roles: "Commissioning agents of the project.",
    body: sampleWitnessSchema,
    responses: { "200": { description: SAMPLE_FIELDS } },
    errors: [400, 403, 404, 413],
  },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/audit",
    tag: "Review",
    summary: "The project's audit trail, newest first",
    description:
      "`{events: [{id, at, who: {userId, name, email (as recorded)}, action, kind, summary, entityType, entityId, before, after, detail}], nextBefore, limit}`. Pages of `limit` (default 50, at most 200); pass `nextBefore` as `before` for the next page (null on the last). The audit table only grows: no route changes it and a database trigger refuses UPDATE and DELETE.",
    query: {
      before: { description: "Only entries with a smaller id (the previous page's `nextBefore`)." },
      limit: { description: "Entries per page, 1–200 (default 50)." },
      kind: { description: "review, field, design, people, reports, access or other." },
    },
    roles: "Commissioning agents, engineers and site administrators.",
    responses: { "200": { description: "`{events, nextBefore, limit}`." } },
    errors: [400, 403, 404],
  },
];
