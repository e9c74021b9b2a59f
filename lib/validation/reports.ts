import "./zod-browser";
import { z } from "zod";

/** `POST …/reports/approvals`: the caller approves the report's content as it stands, with an optional comment. */
export const reportApprovalSchema = z
  .object({
    comment: z.string({ error: "The comment must be text." }).max(2000, "The comment is at most 2000 characters.").optional(),
  })
  .strict();

/** `POST …/reports`: issue the next revision; `reason` is required from revision 2 on. */
export const reportIssueSchema = z
  .object({
    reason: z.string({ error: "The reason must be text." }).max(2000, "The reason is at most 2000 characters.").optional(),
  })
  .strict();
