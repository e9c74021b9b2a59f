import type { Operation } from "../registry";
import { deviationAcceptSchema, deviationWithdrawSchema } from "@/lib/validation/deviations";

const DEVIATION_FIELDS =
  "`{id, subject, entityId, measure, label, acceptedValue, valueUnit, tolerance, reason, acceptedBy, acceptedByName, acceptedAt, withdrawn, withdrawnBy, withdrawnByName, withdrawnAt, withdrawReason}`";

/** The engineer of record's acceptance of results outside their bands. */
export const deviationOperations: Operation[] = [
  {
    method: "get",
    path: "/api/v1/projects/{projectId}/deviations",
    tag: "Deviations",
    summary: "The project's accepted deviations, newest first",
    description:
      "Standing acceptances only, unless `includeWithdrawn=true`. `subject` is `section`, `terminal`, `junction` (`entityId` the junction's parent section) or `system`; `measure` says which result " +
      "(`design` for a section's or outlet's % of design; `maximum`, `minimum`, `heating` for a terminal unit's setpoint; `continuity`; a system's `fan`, `unaccounted` or `outside_air`). " +
      "`acceptedValue` in `valueUnit` is the result when it was accepted, `tolerance` the band it was outside.",
    roles: "Any member of the project.",
    query: { includeWithdrawn: { description: "`true` adds withdrawn acceptances (with who withdrew them, when and why)." } },
    responses: { "200": { description: `\`{deviations: [deviation]}\`, each ${DEVIATION_FIELDS}.` } },
    errors: [400, 404],
  },
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/deviations",
    tag: "Deviations",
    summary: "Accept a result outside its tolerance, with a reason",
    description:
      "The result must be measured and outside its band now: the server records its own value of it (what every screen shows), never a value sent by the client. " +
      "409 when it is within its band, not measured yet, or already accepted (withdraw first). An item of another project answers 404 like an unknown one. Recorded in the audit log.",
    roles: "The project's engineer of record.",
    body: deviationAcceptSchema,
    responses: { "201": { description: `\`{deviation}\`, ${DEVIATION_FIELDS}.` } },
    errors: [400, 403, 404, 409, 413],
  },
  {
    method: "post",
    path: "/api/v1/projects/{projectId}/deviations/{deviationId}/withdrawal",
    tag: "Deviations",
    summary: "Withdraw an accepted deviation, with a reason",
    description: "The acceptance is kept as history with who withdrew it, when and why; the result counts as an open exception again. 409 when it was already withdrawn. Recorded in the audit log.",
    roles: "The project's engineer of record.",
    body: deviationWithdrawSchema,
    responses: { "200": { description: `\`{deviation}\`, ${DEVIATION_FIELDS}, now with \`withdrawn: true\`.` } },
    errors: [400, 403, 404, 409, 413],
  },
];
