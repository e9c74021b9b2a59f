/**
 * The review cycle's bodies (camelCase, SI): a commissioning agent's decision on a traverse, a terminal
 * set or a whole system; a verification sample's draw and the agent's own readings; the audit feed's
 * query. Shared by the routes under `/api/v1/projects/{projectId}` and the review screens.
 */
import "./zod-browser";
import { z } from "zod";
import { describeValue } from "./calc";
import { boundedText, enumOf } from "./fields";

export const REVIEW_DECISIONS = ["approve", "return"] as const;
export type ReviewDecisionInput = (typeof REVIEW_DECISIONS)[number];
/** A return says what to correct in at least this many characters; an approval's comment is optional. */
export const MIN_RETURN_COMMENT = 3;
export const MAX_COMMENT = 2000;

const uuidMessage = (what: string) => (iss: { input?: unknown }) => `must be the id of ${what}; got ${describeValue(iss.input)}`;
export const idOf = (what: string) =>
  z
    .string({ error: uuidMessage(what) })
    .regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i, { error: uuidMessage(what) })
    .transform((s) => s.toLowerCase());

/** `return` needs a comment (the technician is told what to correct). */
function commentRequiredOnReturn(body: { decision: ReviewDecisionInput; comment?: string }, ctx: z.RefinementCtx) {
  if (body.decision === "return" && (body.comment ?? "").trim().length < MIN_RETURN_COMMENT)
    ctx.addIssue({
      code: "custom",
      path: ["comment"],
      message: `is required when returning: say what the technician should correct (at least ${MIN_RETURN_COMMENT} characters); got ${body.comment === undefined ? "nothing" : JSON.stringify(body.comment.trim())}`,
    });
}

const decisionFields = {
  decision: enumOf(REVIEW_DECISIONS, "approve the readings, or return them to the technician"),
  comment: boundedText(MAX_COMMENT, { what: "the reviewer's comment" }).optional(),
  /** The agent was present while the readings were taken. */
  witnessed: z.boolean({ error: (iss) => `must be true or false (the agent was present while the readings were taken); got ${describeValue(iss.input)}` }).optional(),
};

export const reviewDecisionSchema = z.strictObject(decisionFields).superRefine(commentRequiredOnReturn);
export type ReviewDecisionBody = z.output<typeof reviewDecisionSchema>;

/** One decision for every submitted item (traverses and the terminal set) of one system, in one transaction. */
export const systemReviewSchema = z.strictObject(decisionFields).superRefine(commentRequiredOnReturn);
export type SystemReviewBody = z.output<typeof systemReviewSchema>;

/** Submission: an optional note for the reviewer. */
export const submitSchema = z.strictObject({ notes: boundedText(MAX_COMMENT, { what: "a note for the reviewer" }).optional() });
export type SubmitBody = z.output<typeof submitSchema>;

export const sampleDrawSchema = z.strictObject({
  systemId: idOf("an air system of this project"),
  /** A seed to draw with (0 to 4294967295); left out, the server picks one and stores it. */
  seed: z
    .number({ error: (iss) => `must be a whole number from 0 to 4294967295; got ${describeValue(iss.input)}` })
    .int({ error: (iss) => `must be a whole number from 0 to 4294967295; got ${describeValue(iss.input)}` })
    .min(0, { error: (iss) => `must be a whole number from 0 to 4294967295; got ${describeValue(iss.input)}` })
    .max(4294967295, { error: (iss) => `must be a whole number from 0 to 4294967295; got ${describeValue(iss.input)}` })
    .optional(),
});
export type SampleDraw = z.output<typeof sampleDrawSchema>;

const flow = (what: string) =>
  z
    .number({ error: (iss) => `must be ${what}, a number above 0 and at most 100 m³/s; got ${describeValue(iss.input)}` })
    .gt(0, { error: (iss) => `must be above 0 m³/s; got ${describeValue(iss.input)}` })
    .max(100, { error: (iss) => `must be at most 100 m³/s; got ${describeValue(iss.input)}` });

export const SAMPLE_READING_METHODS = ["hood", "velocity_area", "spot_traverse"] as const;

/**
 * The agent's own reading of a sampled item, as standard airflow (m³/s at the project's standard
 * density, the basis of the technician's readings). An outlet or terminal unit: the capture hood's
 * airflow (after its correction factor), or velocity × effective area. A section: a spot traverse's
 * standard airflow, or a repeat of a few of the technician's points (their mean velocity × area is
 * compared with the technician's mean of the same points, by the server).
 */
export const sampleReadingSchema = z
  .strictObject({
    method: enumOf(SAMPLE_READING_METHODS, "how the agent read it"),
    standardFlowM3S: flow("the standard airflow read").optional(),
    velocitiesMS: z
      .array(z.number({ error: (iss) => `must be a velocity in m/s; got ${describeValue(iss.input)}` }).min(0, { error: "must be at least 0 m/s" }).max(100, { error: "must be at most 100 m/s" }), {
        error: (iss) => `must be a list of velocities in m/s; got ${describeValue(iss.input)}`,
      })
      .min(1, { error: "must hold at least one velocity" })
      .max(100, { error: "must hold at most 100 velocities" })
      .optional(),
    effectiveAreaM2: z
      .number({ error: (iss) => `must be the effective area in m² (above 0, at most 10); got ${describeValue(iss.input)}` })
      .gt(0, { error: "must be above 0 m²" })
      .max(10, { error: "must be at most 10 m²" })
      .optional(),
    conditionsId: idOf("operating conditions recorded for this system").nullable(),
    notes: boundedText(MAX_COMMENT, { what: "notes" }).optional(),
    witnessed: z.boolean({ error: (iss) => `must be true or false; got ${describeValue(iss.input)}` }).optional(),
  })
  .superRefine((b, ctx) => {
    if (b.method === "velocity_area") {
      if (!b.velocitiesMS) ctx.addIssue({ code: "custom", path: ["velocitiesMS"], message: "is required for velocity × area: give the anemometer's velocity readings in m/s" });
      if (b.effectiveAreaM2 === undefined) ctx.addIssue({ code: "custom", path: ["effectiveAreaM2"], message: "is required for velocity × area: give the outlet's effective area (Ak) in m²" });
    } else if (b.standardFlowM3S === undefined)
      ctx.addIssue({ code: "custom", path: ["standardFlowM3S"], message: `is required for ${b.method === "hood" ? "a capture hood reading" : "a spot traverse"}: give the standard airflow in m³/s` });
  });
export type SampleReading = z.output<typeof sampleReadingSchema>;

export const sampleWitnessSchema = z.strictObject({
  witnessed: z.boolean({ error: (iss) => `must be true or false (the agent was present while this item was read); got ${describeValue(iss.input)}` }),
});

/** The audit feed: newest first, pages of at most 200, `before` an entry id. */
export const AUDIT_PAGE_MAX = 200;
export const AUDIT_KINDS = ["review", "field", "design", "people", "reports", "access", "other"] as const;
export type AuditKind = (typeof AUDIT_KINDS)[number];
export const auditQuerySchema = z.strictObject({
  before: z.coerce
    .number({ error: (iss) => `must be an entry id (a whole number above 0); got ${describeValue(iss.input)}` })
    .int({ error: "must be a whole number" })
    .min(1, { error: "must be above 0" })
    .max(Number.MAX_SAFE_INTEGER, { error: "is too large" })
    .optional(),
  limit: z.coerce
    .number({ error: (iss) => `must be a whole number from 1 to ${AUDIT_PAGE_MAX}; got ${describeValue(iss.input)}` })
    .int({ error: `must be a whole number from 1 to ${AUDIT_PAGE_MAX}` })
    .min(1, { error: `must be from 1 to ${AUDIT_PAGE_MAX}` })
    .max(AUDIT_PAGE_MAX, { error: `must be at most ${AUDIT_PAGE_MAX}` })
    .optional(),
  kind: enumOf(AUDIT_KINDS, "a kind of event").optional(),
});
export type AuditQuery = z.output<typeof auditQuerySchema>;
