/**
 * Operating conditions of an air system while readings are taken (camelCase, SI), shared by
 * `POST /api/v1/projects/{projectId}/systems/{systemId}/conditions` and the conditions form.
 */
import "./zod-browser";
import { z } from "zod";
import { describeValue } from "./calc";
import { boundedText, clientId, enumOf, nullableNumber } from "./fields";

export const BOX_OVERRIDES = ["none", "maximum", "minimum", "mixed"] as const;
export const FILTER_STATES = ["clean", "part_loaded", "loaded", "unknown"] as const;

/** How far back a record may be dated when it reaches the server late (a tablet offline for a long job). */
export const MAX_BACKDATE_DAYS = 60;
/** Clock skew allowed between the tablet and the server. */
export const MAX_FUTURE_MINUTES = 10;

export const conditionsCreateSchema = z
  .strictObject({
    /** Chosen by the device, so a create retried after a lost answer is recognised, not stored twice. */
    id: clientId.optional(),
    fanSpeedRpm: nullableNumber(1, 20_000, "rpm").default(null),
    vfdHz: nullableNumber(1, 120, "Hz").default(null),
    boxes: enumOf(BOX_OVERRIDES, "terminal units left to their controls, forced to maximum or minimum, or a mix").default("none"),
    outsideAirDamperPct: nullableNumber(0, 100, "% open").default(null),
    ductStaticSetpointPa: nullableNumber(-2_500, 2_500, "Pa").default(null),
    filterState: enumOf(FILTER_STATES, "filter state").default("unknown"),
    notes: boundedText(1_000).default(""),
    /** When the conditions were seen, if not now (a record made offline and sent later). */
    recordedAt: z
      .string({ error: (iss) => `must be a date and time such as 2026-11-24T09:40:00Z; got ${describeValue(iss.input)}` })
      .max(40, { error: "must be a date and time such as 2026-11-24T09:40:00Z" })
      .refine((s) => !Number.isNaN(Date.parse(s)) && /^\d{4}-\d{2}-\d{2}T/.test(s), { error: (iss) => `must be a date and time such as 2026-11-24T09:40:00Z; got ${describeValue(iss.input)}` })
      .optional(),
  })
  .superRefine(
    (c, ctx) => {
      // Runs even when single fields failed, so every problem is reported at once: read the raw values defensively.
      const absent = (v: unknown) => v === null || v === undefined;
      if (absent(c.fanSpeedRpm) && absent(c.vfdHz))
        ctx.addIssue({
          code: "custom",
          path: ["fanSpeedRpm"],
          message: "give the fan speed in rpm (tachometer) or the drive frequency in Hz (VFD display); got neither",
        });
      if (typeof c.recordedAt === "string" && !Number.isNaN(Date.parse(c.recordedAt))) {
        const at = Date.parse(c.recordedAt);
        const now = Date.now();
        if (at > now + MAX_FUTURE_MINUTES * 60_000) ctx.addIssue({ code: "custom", path: ["recordedAt"], message: `cannot be in the future; got ${c.recordedAt}` });
        else if (at < now - MAX_BACKDATE_DAYS * 86_400_000)
          ctx.addIssue({ code: "custom", path: ["recordedAt"], message: `cannot be more than ${MAX_BACKDATE_DAYS} days ago; got ${c.recordedAt}` });
      }
    },
    { when: (payload) => typeof payload.value === "object" && payload.value !== null },
  );
export type ConditionsCreateInput = z.input<typeof conditionsCreateSchema>;
export type ConditionsCreate = z.output<typeof conditionsCreateSchema>;
