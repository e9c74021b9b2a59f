import "@/lib/validation/zod-browser";
import { z } from "zod";
import type { Operation } from "../registry";
import { markReadSchema } from "@/lib/validation/notifications";
import { acceptInvitationSchema, changeRoleSchema, inviteSchema, signCertificationSchema, supervisorSchema } from "@/lib/validation/people";

const P = "/api/v1/projects/{projectId}";

/** Members, invitations, the TAB supervisor, notifications and the outbox. */
export const peopleOperations: Operation[] = [
  { method: "get", path: `${P}/members`, tag: "People", summary: "Members with their roles, the TAB supervisor and (for those who invite) open invitations", roles: "every member; site administrators", responses: { "200": { description: "`{members, supervisor, invitations?}`" } }, errors: [404] },
  { method: "patch", path: `${P}/members/{userId}`, tag: "People", summary: "Change a member's role", roles: "engineer, site administrator (engineers of record and one's own role: site administrators only)", body: changeRoleSchema, responses: { "200": { description: "`{member}`" } }, errors: [403, 404] },
  { method: "delete", path: `${P}/members/{userId}`, tag: "People", summary: "Remove a member from the project", roles: "engineer, site administrator", responses: { "204": { description: "Removed." } }, errors: [403, 404] },
  { method: "get", path: `${P}/invitations`, tag: "People", summary: "Open invitations (not used, not withdrawn)", roles: "engineer, site administrator", responses: { "200": { description: "`{invitations}`" } }, errors: [403, 404] },
  {
    method: "post",
    path: `${P}/invitations`,
    tag: "People",
    summary: "Invite an e-mail address with a role",
    description: "Sends a single-use link valid for 72 hours. An address with an account already is added at once and answered with `member` instead of `invitation`.",
    roles: "engineer, site administrator (inviting an engineer: site administrators)",
    body: inviteSchema,
    responses: { "201": { description: "`{kind: \"invitation\", invitation}` or `{kind: \"member\", member}`" } },
    errors: [403, 404, 409],
  },
  { method: "delete", path: `${P}/invitations/{invitationId}`, tag: "People", summary: "Withdraw an open invitation", roles: "engineer, site administrator", responses: { "204": { description: "Withdrawn." } }, errors: [403, 404] },
  { method: "get", path: "/api/v1/invitations/{token}", tag: "People", summary: "What an invitation link is for, or why it no longer works", signedIn: false, responses: { "200": { description: "`{invitation: {email, role, project, expiresAt, …}}`" }, "410": { description: "Used, withdrawn or expired." } }, errors: [404, 429] },
  {
    method: "post",
    path: "/api/v1/invitations/{token}/accept",
    tag: "People",
    summary: "Use an invitation: choose name and password; signs the person in",
    signedIn: false,
    body: acceptInvitationSchema,
    responses: { "201": { description: "`{userId, projectId, next}`; the session cookie is set." }, "410": { description: "Used, withdrawn or expired." } },
    errors: [404, 409, 413, 415, 429],
  },
  { method: "get", path: `${P}/supervisor`, tag: "People", summary: "The TAB supervisor, the statement they sign, and their current signature", roles: "every member", responses: { "200": { description: "`{supervisor, statement, signature}`" } }, errors: [404] },
  { method: "put", path: `${P}/supervisor`, tag: "People", summary: "Designate a technician member as the certified TAB supervisor", roles: "engineer, site administrator", body: supervisorSchema, responses: { "200": { description: "`{supervisor, statement, signature}`" } }, errors: [403, 404] },
  { method: "delete", path: `${P}/supervisor`, tag: "People", summary: "End the TAB supervisor designation (signatures stay on record)", roles: "engineer, site administrator", responses: { "204": { description: "Ended." } }, errors: [403, 404] },
  {
    method: "post",
    path: `${P}/supervisor/signature`,
    tag: "People",
    summary: "The TAB supervisor signs the certification statement (password confirms)",
    roles: "the designated TAB supervisor",
    body: signCertificationSchema,
    responses: { "201": { description: "`{signature: {name, certifyingBody, certificateNumber, statement, signedAt}}`" } },
    errors: [403, 404, 409],
  },
  { method: "get", path: "/api/v1/notifications", tag: "Notifications", summary: "The caller's notifications, newest first, and the unread count", query: { unread: { description: "1: unread only" }, limit: { description: "0–100 (default 50)" } }, responses: { "200": { description: "`{notifications, unread}`" } } },
  { method: "post", path: "/api/v1/notifications/read", tag: "Notifications", summary: "Mark the caller's notifications read", body: markReadSchema, responses: { "200": { description: "`{marked, unread}`", schema: z.object({ marked: z.number(), unread: z.number() }) } } },
  {
    method: "get",
    path: "/api/v1/admin/outbox",
    tag: "Notifications",
    summary: "Every e-mail the app wrote, newest first (the local outbox without SMTP_URL)",
    roles: "site administrators",
    query: { to: { description: "one recipient address" }, limit: { description: "1–200 (default 50)" } },
    responses: { "200": { description: "`{delivery: \"outbox\"|\"smtp\", messages}`" } },
    errors: [403],
  },
];
