import { z } from "zod";

export const signInSchema = z.object({
  email: z.string({ error: "Enter your e-mail address." }).trim().min(1, "Enter your e-mail address.").max(254).email("That is not an e-mail address."),
  password: z.string({ error: "Enter your password." }).min(1, "Enter your password.").max(200, "Passwords are at most 200 characters."),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const preferencesSchema = z
  .object({
    unit_system: z.union([z.enum(["IP", "SI"]), z.null()], {
      error: 'Choose "IP" (inch-pound), "SI", or null to follow each project\'s setting.',
    }),
  })
  .strict();
export type PreferencesInput = z.infer<typeof preferencesSchema>;
