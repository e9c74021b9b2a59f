/**
 * Accepting a result outside its tolerance, and withdrawing an acceptance (camelCase), shared by
 * `POST /api/v1/projects/{projectId}/deviations`, `POST …/deviations/{deviationId}/withdrawal` and the form.
 */
import "./zod-browser";
import { z } from "zod";
import { describeValue } from "./calc";
import { boundedText, enumOf } from "./fields";

export const DEVIATION_SUBJECTS = ["section", "terminal", "junction", "system"] as const;
/** Which result of the subject: a section's % of design, a terminal's setpoint, a junction's continuity, a system's fan, unaccounted airflow or minimum outside air. */
export const DEVIATION_MEASURES = ["design", "maximum", "minimum", "heating", "continuity", "fan", "unaccounted", "outside_air"] as const;
export type DeviationMeasure = (typeof DEVIATION_MEASURES)[number];

/** What each subject may be judged on. */
export const MEASURES_OF: Record<(typeof DEVIATION_SUBJECTS)[number], readonly DeviationMeasure[]> = {
  section: ["design"],
  terminal: ["design", "maximum", "minimum", "heating"],
  junction: ["continuity"],
  system: ["fan", "unaccounted", "outside_air"],
};

export const MAX_REASON_CHARS = 2000;
/** A reason shorter than this says nothing a later reader can act on. */
export const MIN_REASON_CHARS = 10;

const uuid = z
  .string({ error: (iss) => `must be the id (a UUID) of the item; got ${describeValue(iss.input)}` })
  .regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i, { error: (iss) => `must be the id (a UUID) of the item; got ${describeValue(iss.input)}` })
  .transform((s) => s.toLowerCase());

const reason = boundedText(MAX_REASON_CHARS, { min: 1, what: "the reason" }).refine((s) => s.length >= MIN_REASON_CHARS, {
  error: `must say why in at least ${MIN_REASON_CHARS} characters`,
});

export const deviationAcceptSchema = z
  .strictObject({
    subject: enumOf(DEVIATION_SUBJECTS, "what is accepted: a section, a terminal, a junction or a system"),
    entityId: uuid,
    measure: enumOf(DEVIATION_MEASURES, "which result"),
    reason,
  })
  .superRefine((d, ctx) => {
    const allowed = d.subject ? MEASURES_OF[d.subject] : undefined;
    if (allowed && d.measure && !allowed.includes(d.measure)) {
      ctx.addIssue({ code: "custom", path: ["measure"], message: `must be one of ${allowed.map((m) => `"${m}"`).join(", ")} for a ${d.subject}; got "${d.measure}"` });
    }
  });
export type DeviationAcceptBody = z.infer<typeof deviationAcceptSchema>;

export const deviationWithdrawSchema = z.strictObject({ reason });
export type DeviationWithdrawBody = z.infer<typeof deviationWithdrawSchema>;
