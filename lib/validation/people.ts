import "./zod-browser";
import { z } from "zod";
import { memberRole } from "@/db/schema";
import { newPasswordSchema } from "./auth";

const ROLE_WORDS = 'one of "technician", "commissioning_agent", "engineer", "owner"';
export const roleSchema = z.enum(memberRole.enumValues, { error: `Choose a role: ${ROLE_WORDS}.` });

const email = z.string({ error: "Enter an e-mail address." }).trim().min(1, "Enter an e-mail address.").max(254, "E-mail addresses are at most 254 characters.").email("That is not an e-mail address.");

export const inviteSchema = z.object({ email, role: roleSchema }).strict();
export type InviteInput = z.infer<typeof inviteSchema>;

export const changeRoleSchema = z.object({ role: roleSchema }).strict();

export const acceptInvitationSchema = z
  .object({
    name: z.string({ error: "Enter your name." }).trim().min(1, "Enter your name as colleagues know it.").max(120, "Names are at most 120 characters."),
    password: newPasswordSchema,
  })
  .strict();
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

export const supervisorSchema = z
  .object({
    userId: z.uuid("Choose a technician of this project."),
    certifyingBody: z.string({ error: "Name the certifying body." }).trim().min(2, "Name the body that certified the supervisor.").max(200, "At most 200 characters."),
    certificateNumber: z.string({ error: "Enter the certificate number." }).trim().min(1, "Enter the certificate number.").max(80, "At most 80 characters."),
  })
  .strict();
export type SupervisorInput = z.infer<typeof supervisorSchema>;

export const signCertificationSchema = z
  .object({
    password: z.string({ error: "Enter your password to sign." }).min(1, "Enter your password to sign.").max(200),
    confirm: z.literal(true, { error: "Tick the box to confirm the statement." }),
  })
  .strict();
export type SignCertificationInput = z.infer<typeof signCertificationSchema>;
