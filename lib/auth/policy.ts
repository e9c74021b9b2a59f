import type { MemberRole } from "@/db/schema";

/**
 * What each role may do in a project: the single source of truth for authorization.
 * Route handlers and server actions ask `can()`; navigation uses it only to hide links.
 */
export const ACTIONS = [
  "project.view",
  "project.edit",
  "traverse.record",
  "terminal.record",
  "conditions.record",
  "traverse.submit",
  "traverse.review",
  "design.view",
  "design.edit",
  "deviation.accept",
  "report.issue",
  "report.approve",
  "report.download",
  "members.manage",
  "members.view",
  "members.invite",
  "supervisor.sign",
  "photo.add",
  "audit.view",
] as const;
export type Action = (typeof ACTIONS)[number];

const ALL: readonly MemberRole[] = ["technician", "commissioning_agent", "engineer", "owner"];

export const POLICY: Record<Action, readonly MemberRole[]> = {
  "project.view": ALL,
  "project.edit": ["engineer"],
  "traverse.record": ["technician"],
  "terminal.record": ["technician"],
  /** The operating conditions readings are taken under: recorded by those who take the readings. */
  "conditions.record": ["technician"],
  "traverse.submit": ["technician"],
  "traverse.review": ["commissioning_agent"],
  // Owners read design against measured: it is what their closeout report shows them.
  "design.view": ALL,
  "design.edit": ["engineer"],
  "deviation.accept": ["engineer"],
  // The commissioning agent and the engineer of record each approve the report's content; either of
  // them (or a site administrator) then issues it once the supervisor has signed.
  "report.approve": ["commissioning_agent", "engineer"],
  "report.issue": ["commissioning_agent", "engineer"],
  "report.download": ALL,
  // Changing or removing an engineer of record, and anything about oneself, stays with site administrators.
  "members.manage": [],
  "members.view": ALL,
  // Invite people, change roles, remove members, designate the TAB supervisor.
  "members.invite": ["engineer"],
  // Only the designated supervisor signs; the handler also checks it is them.
  "supervisor.sign": ["technician"],
  "photo.add": ["technician"],
  // The project's audit trail: who submitted, decided, changed what. Those who answer for the results read it.
  "audit.view": ["commissioning_agent", "engineer"],
};

/** Site-wide administrators set projects up (settings, design, people) and may look at everything, but take no readings and sign nothing. */
const ADMIN_ACTIONS: ReadonlySet<Action> = new Set([
  "project.view",
  "project.edit",
  "design.view",
  "design.edit",
  "report.download",
  "report.issue",
  "members.manage",
  "members.view",
  "members.invite",
  "audit.view",
]);

export interface Actor {
  isAdmin: boolean;
}

export function can(actor: Actor, role: MemberRole | null, action: Action): boolean {
  if (role !== null && POLICY[action].includes(role)) return true;
  return actor.isAdmin && ADMIN_ACTIONS.has(action);
}

/**
 * The instrument register is deployment-wide, not a project's: it is kept by the people who carry the
 * instruments (a technician on at least one project) and by site administrators. Every signed-in user may read it.
 */
export function canKeepInstrumentRegister(actor: Actor, roles: readonly (MemberRole | null)[]): boolean {
  return actor.isAdmin || roles.includes("technician");
}

export const ROLE_LABELS: Record<MemberRole, string> = {
  technician: "Technician",
  commissioning_agent: "Commissioning agent",
  engineer: "Engineer of record",
  owner: "Owner",
};

/**
 * API routes that act on no project, each with who may call it. Every other route under app/api
 * declares `project: { param, action }` in defineRoute; tests/auth/routes.test.ts walks app/api and
 * fails on a route that does neither, or on one missing from this list. Keys: "METHOD /api/path"
 * with the folder names as written ([param] and [...rest] included).
 */
export const ROUTES_OUTSIDE_PROJECTS: Record<string, "public" | "signed-in"> = {
  "GET /api/health": "public",
  "POST /api/auth/sign-in": "public",
  "POST /api/auth/sign-out": "public",
  "POST /api/auth/sign-out-everywhere": "signed-in",
  "POST /api/auth/password": "signed-in",
  "GET /api/auth/me": "signed-in",
  "GET /api/v1/projects": "signed-in",
  // Site administrators and engineers of a project start projects; the handler checks which before reading the body.
  "POST /api/v1/projects": "signed-in",
  // The organisation's instrument register: read by everyone signed in; kept by technicians and site administrators (checked in the handler).
  "GET /api/v1/instruments": "signed-in",
  "POST /api/v1/instruments": "signed-in",
  "GET /api/v1/instruments/[instrumentId]": "signed-in",
  "PATCH /api/v1/instruments/[instrumentId]": "signed-in",
  "DELETE /api/v1/instruments/[instrumentId]": "signed-in",
  // Calibration certificates belong to the register: read by everyone signed in, attached by its keepers (checked in the handler).
  "GET /api/v1/instruments/[instrumentId]/certificate": "signed-in",
  "POST /api/v1/instruments/[instrumentId]/certificate": "signed-in",
  // Each user's own notifications.
  "GET /api/v1/notifications": "signed-in",
  "POST /api/v1/notifications/read": "signed-in",
  // Every e-mail written: site administrators only (checked in the handler).
  "GET /api/v1/admin/outbox": "signed-in",
  // Invitation links are used before an account exists: the token is the credential.
  "GET /api/v1/invitations/[token]": "public",
  "POST /api/v1/invitations/[token]/accept": "public",
  // Anyone may check an issued report, with the deployment's public key and a report's signature.
  "POST /api/v1/reports/verify": "public",
  "GET /api/v1/reports/public-key": "public",
  "GET /api/v1/reports/[code]/signature": "public",
  // The API description holds no data.
  "GET /api/v1/openapi.json": "public",
  "PATCH /api/v1/me": "signed-in",
  "POST /api/v1/calc/[command]": "signed-in",
  // Unknown API paths answer a JSON 404 to anyone.
  "GET /api/[...path]": "public",
  "POST /api/[...path]": "public",
  "PUT /api/[...path]": "public",
  "PATCH /api/[...path]": "public",
  "DELETE /api/[...path]": "public",
};
