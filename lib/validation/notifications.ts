import "./zod-browser";
import { z } from "zod";

export const markReadSchema = z.union(
  [
    z.object({ ids: z.array(z.uuid("Each id is a notification id.")).min(1, "Name at least one notification.").max(200, "At most 200 at a time.") }).strict(),
    z.object({ all: z.literal(true) }).strict(),
  ],
  { error: 'Send {"ids": [...]} or {"all": true}.' },
);
export type MarkReadInput = z.infer<typeof markReadSchema>;
