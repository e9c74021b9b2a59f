import "./zod-browser";
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

/** NIST SP 800-63B §5.1.1.2 asks for at least 8 characters and allows long passphrases; 12 is common practice today. */
export const PASSWORD_MIN = 12;
export const PASSWORD_MAX = 200;

/** Every new password (a change, an invitation, the first site administrator): long enough to resist guessing, bounded so hashing stays cheap. */
export const newPasswordSchema = z
  .string({ error: "Choose a password." })
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
  .max(PASSWORD_MAX, `Passwords are at most ${PASSWORD_MAX} characters.`);

export const passwordChangeSchema = z
  .object({
    current_password: z.string({ error: "Enter your current password." }).min(1, "Enter your current password.").max(PASSWORD_MAX),
    new_password: z
      .string({ error: "Enter a new password." })
      .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters for the new password.`)
      .max(PASSWORD_MAX, `Passwords are at most ${PASSWORD_MAX} characters.`),
  })
  .strict()
  .refine((v) => v.current_password !== v.new_password, { path: ["new_password"], message: "The new password must differ from the current one." });
export type PasswordChangeInput = z.infer<typeof passwordChangeSchema>;
