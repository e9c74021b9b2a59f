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
  "traverse.submit",
  "traverse.review",
  "design.view",
  "design.edit",
  "deviation.accept",
  "report.issue",
  "report.download",
  "members.manage",
  "members.view",
  "members.invite",
  "supervisor.sign",
  "photo.add",
  "instrument.view",
  "instrument.edit",
] as const;
export type Action = (typeof ACTIONS)[number];

const ALL: readonly MemberRole[] = ["technician", "commissioning_agent", "engineer", "owner"];

export const POLICY: Record<Action, readonly MemberRole[]> = {
  "project.view": ALL,
  "project.edit": ["engineer"],
  "traverse.record": ["technician"],
  "terminal.record": ["technician"],
  "traverse.submit": ["technician"],
  "traverse.review": ["commissioning_agent"],
  "design.view": ["technician", "commissioning_agent", "engineer"],
  "design.edit": ["engineer"],
  "deviation.accept": ["engineer"],
  "report.issue": ["commissioning_agent"],
  "report.download": ALL,
  // Changing or removing an engineer of record, and anything about oneself, stays with site administrators.
  "members.manage": [],
  "members.view": ALL,
  // Invite people, change roles, remove members, designate the TAB supervisor.
  "members.invite": ["engineer"],
  // Only the designated supervisor signs; the handler also checks it is them.
  "supervisor.sign": ["technician"],
  "photo.add": ["technician"],
  // The instrument register is the organisation's: these are asked of any project role the user holds.
  "instrument.view": ALL,
  "instrument.edit": ["technician", "engineer"],
};

/** Site-wide administrators set projects up (settings, design, people) and may look at everything, but take no readings and sign nothing. */
const ADMIN_ACTIONS: ReadonlySet<Action> = new Set([
  "project.view",
  "project.edit",
  "design.view",
  "design.edit",
  "report.download",
  "members.manage",
  "members.view",
  "members.invite",
  "instrument.view",
  "instrument.edit",
]);

export interface Actor {
  isAdmin: boolean;
}

export function can(actor: Actor, role: MemberRole | null, action: Action): boolean {
  if (role !== null && POLICY[action].includes(role)) return true;
  return actor.isAdmin && ADMIN_ACTIONS.has(action);
}

/** Register-wide actions (the instrument register): allowed when any of the user's project roles allows it. */
export function canInRegister(actor: Actor, roles: readonly MemberRole[], action: Action): boolean {
  return actor.isAdmin ? ADMIN_ACTIONS.has(action) : roles.some((role) => POLICY[action].includes(role));
}

export const ROLE_LABELS: Record<MemberRole, string> = {
  technician: "Technician",
  commissioning_agent: "Commissioning agent",
  engineer: "Engineer",
  owner: "Owner",
};
