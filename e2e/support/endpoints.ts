/**
 * Every API endpoint with a sample request, for the authorization matrix
 * (e2e/authorization-matrix.spec.ts). tests/auth/routes.test.ts checks that every route under
 * app/api has a row here with the same declaration, so a new route needs its row: add one per
 * method with a body that the route accepts, and the status it answers when the caller may.
 */
import type { Action } from "../../lib/auth/policy";
import type { MemberRole } from "../../db/schema";

export interface Endpoint {
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  /** The route's folder pattern, as in ROUTES_OUTSIDE_PROJECTS ("/api/v1/projects/[projectId]"). */
  route: string;
  /** The concrete path called; `{projectId}` is replaced by the project under test. */
  path: string;
  /** What the route declares in defineRoute. */
  rule: { action: Action } | { outsideProject: "public" | "signed-in" };
  /** A request body the route accepts (a function for a fresh one per call). */
  body?: unknown;
  /** The status when the caller may do this. */
  ok: number;
  /**
   * For routes outside projects that are open to some signed-in users only: who may (site
   * administrators, or holders of one of these roles in any project); everyone else gets 403.
   */
  only?: { admins: boolean; rolesAnywhere: MemberRole[] };
  /**
   * True for calls that end the caller's sessions or change their password: the matrix then checks
   * only the refusals (signed out, foreign origin); e2e/sessions.spec.ts covers the rest.
   */
  endsSessions?: boolean;
  /**
   * True for calls that no unknown id or invalid body makes harmless (ending the TAB supervisor's
   * designation names no child): the matrix checks only the refusals, so it changes nothing in the
   * demo; the route's own tests and journeys cover the rest.
   */
  changesDemo?: boolean;
  /**
   * The status an allowed caller gets on the demo's second project (the clinic) when it differs
   * from `ok` because the demo holds none of what the row reads there (no issued report).
   */
  okOnSecondProject?: number;
}

/** An id that no row has: callers the policy allows get 404 for the row, others 403 or the project's 404. */
const UNKNOWN_ID = "00000000-0000-4000-8000-00000000abcd";
const REGISTER_KEEPERS: Endpoint["only"] = { admins: true, rolesAnywhere: ["technician"] };
const LAYOUT = { duct: { shape: "round", diameter_mm: 600 }, method: "equal-area" };

export const ENDPOINTS: Endpoint[] = [
  { method: "GET", route: "/api/health", path: "/api/health", rule: { outsideProject: "public" }, ok: 200 },
  { method: "POST", route: "/api/auth/sign-in", path: "/api/auth/sign-in", rule: { outsideProject: "public" }, body: () => ({ email: `no-account-${Math.random().toString(36).slice(2)}@example.test`, password: "not-a-password" }), ok: 401 },
  { method: "POST", route: "/api/auth/sign-out", path: "/api/auth/sign-out", rule: { outsideProject: "public" }, ok: 204, endsSessions: true },
  { method: "POST", route: "/api/auth/sign-out-everywhere", path: "/api/auth/sign-out-everywhere", rule: { outsideProject: "signed-in" }, ok: 204, endsSessions: true },
  {
    method: "POST",
    route: "/api/auth/password",
    path: "/api/auth/password",
    rule: { outsideProject: "signed-in" },
    body: { current_password: "airtally-demo", new_password: "a-new-long-password" },
    ok: 204,
    endsSessions: true,
  },
  { method: "GET", route: "/api/auth/me", path: "/api/auth/me", rule: { outsideProject: "signed-in" }, ok: 200 },
  { method: "GET", route: "/api/v1/projects", path: "/api/v1/projects", rule: { outsideProject: "signed-in" }, ok: 200 },
  { method: "PATCH", route: "/api/v1/me", path: "/api/v1/me", rule: { outsideProject: "signed-in" }, body: { unit_system: null }, ok: 200 },
  { method: "POST", route: "/api/v1/calc/[command]", path: "/api/v1/calc/layout", rule: { outsideProject: "signed-in" }, body: LAYOUT, ok: 200 },
  { method: "GET", route: "/api/v1/projects/[projectId]", path: "/api/v1/projects/{projectId}", rule: { action: "design.view" }, ok: 200 },
  { method: "GET", route: "/api/v1/openapi.json", path: "/api/v1/openapi.json", rule: { outsideProject: "public" }, ok: 200 },
  // Set-up. Creations and changes that need ids of the project's own sections are sent without them:
  // a caller the policy allows gets 400 naming the field (the role is checked before the body is read),
  // so the matrix changes nothing in the demo.
  {
    method: "POST",
    route: "/api/v1/projects",
    path: "/api/v1/projects",
    rule: { outsideProject: "signed-in" },
    only: { admins: true, rolesAnywhere: ["engineer"] },
    body: {},
    ok: 400,
  },
  { method: "PATCH", route: "/api/v1/projects/[projectId]", path: "/api/v1/projects/{projectId}", rule: { action: "project.edit" }, body: { altitudeM: "high" }, ok: 400 },
  { method: "POST", route: "/api/v1/projects/[projectId]/systems", path: "/api/v1/projects/{projectId}/systems", rule: { action: "design.edit" }, body: {}, ok: 400 },
  ...(["PATCH", "DELETE"] as const).map(
    (method): Endpoint => ({ method, route: "/api/v1/projects/[projectId]/systems/[systemId]", path: `/api/v1/projects/{projectId}/systems/${UNKNOWN_ID}`, rule: { action: "design.edit" }, body: method === "PATCH" ? { name: "x" } : undefined, ok: 404 }),
  ),
  { method: "POST", route: "/api/v1/projects/[projectId]/sections", path: "/api/v1/projects/{projectId}/sections", rule: { action: "design.edit" }, body: {}, ok: 400 },
  ...(["PATCH", "DELETE"] as const).map(
    (method): Endpoint => ({ method, route: "/api/v1/projects/[projectId]/sections/[sectionId]", path: `/api/v1/projects/{projectId}/sections/${UNKNOWN_ID}`, rule: { action: "design.edit" }, body: method === "PATCH" ? { location: "x" } : undefined, ok: 404 }),
  ),
  { method: "GET", route: "/api/v1/projects/[projectId]/terminals", path: "/api/v1/projects/{projectId}/terminals", rule: { action: "design.view" }, ok: 200 },
  { method: "POST", route: "/api/v1/projects/[projectId]/terminals", path: "/api/v1/projects/{projectId}/terminals", rule: { action: "design.edit" }, body: {}, ok: 400 },
  ...(["PATCH", "DELETE"] as const).map(
    (method): Endpoint => ({ method, route: "/api/v1/projects/[projectId]/terminals/[terminalId]", path: `/api/v1/projects/{projectId}/terminals/${UNKNOWN_ID}`, rule: { action: "design.edit" }, body: method === "PATCH" ? { room: "x" } : undefined, ok: 404 }),
  ),
  { method: "GET", route: "/api/v1/projects/[projectId]/design/export.csv", path: "/api/v1/projects/{projectId}/design/export.csv", rule: { action: "design.view" }, ok: 200 },
  { method: "POST", route: "/api/v1/projects/[projectId]/design/import", path: "/api/v1/projects/{projectId}/design/import?mode=preview", rule: { action: "design.edit" }, ok: 415 },
  // The instrument register belongs to the whole deployment: every signed-in user reads it; technicians
  // (on any project) and site administrators keep it.
  { method: "GET", route: "/api/v1/instruments", path: "/api/v1/instruments", rule: { outsideProject: "signed-in" }, ok: 200 },
  { method: "POST", route: "/api/v1/instruments", path: "/api/v1/instruments", rule: { outsideProject: "signed-in" }, only: REGISTER_KEEPERS, body: {}, ok: 400 },
  { method: "GET", route: "/api/v1/instruments/[instrumentId]", path: `/api/v1/instruments/${UNKNOWN_ID}`, rule: { outsideProject: "signed-in" }, ok: 404 },
  ...(["PATCH", "DELETE"] as const).map(
    (method): Endpoint => ({ method, route: "/api/v1/instruments/[instrumentId]", path: `/api/v1/instruments/${UNKNOWN_ID}`, rule: { outsideProject: "signed-in" }, only: REGISTER_KEEPERS, body: method === "PATCH" ? { notes: "x" } : undefined, ok: 404 }),
  ),
  { method: "GET", route: "/api/v1/projects/[projectId]/systems/[systemId]/conditions", path: `/api/v1/projects/{projectId}/systems/${UNKNOWN_ID}/conditions`, rule: { action: "project.view" }, ok: 404 },
  { method: "POST", route: "/api/v1/projects/[projectId]/systems/[systemId]/conditions", path: `/api/v1/projects/{projectId}/systems/${UNKNOWN_ID}/conditions`, rule: { action: "conditions.record" }, body: {}, ok: 404 },
  // Traverses. Bodies name no section or traverse of the project (or an unknown one): a caller the
  // policy allows gets 400 or 404, so the matrix changes nothing in the demo.
  { method: "POST", route: "/api/v1/projects/[projectId]/traverses", path: "/api/v1/projects/{projectId}/traverses", rule: { action: "traverse.record" }, body: {}, ok: 400 },
  { method: "GET", route: "/api/v1/projects/[projectId]/traverses/[traverseId]", path: `/api/v1/projects/{projectId}/traverses/${UNKNOWN_ID}`, rule: { action: "project.view" }, ok: 404 },
  { method: "PATCH", route: "/api/v1/projects/[projectId]/traverses/[traverseId]", path: `/api/v1/projects/{projectId}/traverses/${UNKNOWN_ID}`, rule: { action: "traverse.record" }, body: { version: 1, notes: "x" }, ok: 404 },
  { method: "PUT", route: "/api/v1/projects/[projectId]/traverses/[traverseId]/readings", path: `/api/v1/projects/{projectId}/traverses/${UNKNOWN_ID}/readings`, rule: { action: "traverse.record" }, body: { version: 1, readings: [[null, null]] }, ok: 404 },
  // Review: submissions and decisions on unknown ids (404 once the role may), a sample draw without a system (400),
  // reads of the queue, samples and audit trail; nothing in the demo changes.
  { method: "POST", route: "/api/v1/projects/[projectId]/traverses/[traverseId]/submit", path: `/api/v1/projects/{projectId}/traverses/${UNKNOWN_ID}/submit`, rule: { action: "traverse.submit" }, body: {}, ok: 404 },
  { method: "POST", route: "/api/v1/projects/[projectId]/traverses/[traverseId]/review", path: `/api/v1/projects/{projectId}/traverses/${UNKNOWN_ID}/review`, rule: { action: "traverse.review" }, body: { decision: "approve" }, ok: 404 },
  { method: "POST", route: "/api/v1/projects/[projectId]/terminal-sets/[setId]/submit", path: `/api/v1/projects/{projectId}/terminal-sets/${UNKNOWN_ID}/submit`, rule: { action: "traverse.submit" }, body: {}, ok: 404 },
  { method: "POST", route: "/api/v1/projects/[projectId]/terminal-sets/[setId]/review", path: `/api/v1/projects/{projectId}/terminal-sets/${UNKNOWN_ID}/review`, rule: { action: "traverse.review" }, body: { decision: "approve" }, ok: 404 },
  { method: "POST", route: "/api/v1/projects/[projectId]/systems/[systemId]/review", path: `/api/v1/projects/{projectId}/systems/${UNKNOWN_ID}/review`, rule: { action: "traverse.review" }, body: { decision: "approve" }, ok: 404 },
  { method: "GET", route: "/api/v1/projects/[projectId]/review-queue", path: "/api/v1/projects/{projectId}/review-queue", rule: { action: "project.view" }, ok: 200 },
  { method: "GET", route: "/api/v1/projects/[projectId]/samples", path: "/api/v1/projects/{projectId}/samples", rule: { action: "project.view" }, ok: 200 },
  { method: "POST", route: "/api/v1/projects/[projectId]/samples", path: "/api/v1/projects/{projectId}/samples", rule: { action: "traverse.review" }, body: {}, ok: 400 },
  { method: "GET", route: "/api/v1/projects/[projectId]/samples/[sampleId]", path: `/api/v1/projects/{projectId}/samples/${UNKNOWN_ID}`, rule: { action: "project.view" }, ok: 404 },
  { method: "PATCH", route: "/api/v1/projects/[projectId]/samples/[sampleId]/items/[itemId]", path: `/api/v1/projects/{projectId}/samples/${UNKNOWN_ID}/items/${UNKNOWN_ID}`, rule: { action: "traverse.review" }, body: { witnessed: true }, ok: 404 },
  {
    method: "PUT",
    route: "/api/v1/projects/[projectId]/samples/[sampleId]/items/[itemId]/reading",
    path: `/api/v1/projects/{projectId}/samples/${UNKNOWN_ID}/items/${UNKNOWN_ID}/reading`,
    rule: { action: "traverse.review" },
    body: { method: "hood", standardFlowM3S: 0.3, conditionsId: null },
    ok: 404,
  },
  { method: "GET", route: "/api/v1/projects/[projectId]/audit", path: "/api/v1/projects/{projectId}/audit", rule: { action: "audit.view" }, ok: 200 },
  // Terminal readings: members read; technicians record (an unknown terminal answers 404 before the body is read).
  { method: "GET", route: "/api/v1/projects/[projectId]/terminals/[terminalId]/readings", path: `/api/v1/projects/{projectId}/terminals/${UNKNOWN_ID}/readings`, rule: { action: "project.view" }, ok: 404 },
  { method: "POST", route: "/api/v1/projects/[projectId]/terminals/[terminalId]/readings", path: `/api/v1/projects/{projectId}/terminals/${UNKNOWN_ID}/readings`, rule: { action: "terminal.record" }, body: {}, ok: 404 },
  { method: "GET", route: "/api/v1/projects/[projectId]/terminal-readings", path: "/api/v1/projects/{projectId}/terminal-readings", rule: { action: "project.view" }, ok: 200 },
  // Accepted deviations: every member reads; the engineer of record accepts and withdraws (an incomplete body answers 400, an unknown one 404).
  { method: "GET", route: "/api/v1/projects/[projectId]/deviations", path: "/api/v1/projects/{projectId}/deviations", rule: { action: "design.view" }, ok: 200 },
  { method: "POST", route: "/api/v1/projects/[projectId]/deviations", path: "/api/v1/projects/{projectId}/deviations", rule: { action: "deviation.accept" }, body: {}, ok: 400 },
  { method: "POST", route: "/api/v1/projects/[projectId]/deviations/[deviationId]/withdrawal", path: `/api/v1/projects/{projectId}/deviations/${UNKNOWN_ID}/withdrawal`, rule: { action: "deviation.accept" }, body: {}, ok: 404 },
  { method: "GET", route: "/api/v1/instruments/[instrumentId]/certificate", path: `/api/v1/instruments/${UNKNOWN_ID}/certificate`, rule: { outsideProject: "signed-in" }, ok: 404 },
  // The instrument is looked up before the file is read: an unknown one is refused without a body.
  { method: "POST", route: "/api/v1/instruments/[instrumentId]/certificate", path: `/api/v1/instruments/${UNKNOWN_ID}/certificate`, rule: { outsideProject: "signed-in" }, only: REGISTER_KEEPERS, ok: 404 },
  // People: members, invitations, the TAB supervisor. Unknown ids and incomplete bodies change nothing.
  { method: "GET", route: "/api/v1/projects/[projectId]/members", path: "/api/v1/projects/{projectId}/members", rule: { action: "members.view" }, ok: 200 },
  ...(["PATCH", "DELETE"] as const).map(
    (method): Endpoint => ({ method, route: "/api/v1/projects/[projectId]/members/[userId]", path: `/api/v1/projects/{projectId}/members/${UNKNOWN_ID}`, rule: { action: "members.invite" }, body: method === "PATCH" ? { role: "owner" } : undefined, ok: 404 }),
  ),
  { method: "GET", route: "/api/v1/projects/[projectId]/invitations", path: "/api/v1/projects/{projectId}/invitations", rule: { action: "members.invite" }, ok: 200 },
  { method: "POST", route: "/api/v1/projects/[projectId]/invitations", path: "/api/v1/projects/{projectId}/invitations", rule: { action: "members.invite" }, body: { role: "owner" }, ok: 400 },
  { method: "DELETE", route: "/api/v1/projects/[projectId]/invitations/[invitationId]", path: `/api/v1/projects/{projectId}/invitations/${UNKNOWN_ID}`, rule: { action: "members.invite" }, ok: 404 },
  { method: "GET", route: "/api/v1/projects/[projectId]/supervisor", path: "/api/v1/projects/{projectId}/supervisor", rule: { action: "members.view" }, ok: 200 },
  { method: "PUT", route: "/api/v1/projects/[projectId]/supervisor", path: "/api/v1/projects/{projectId}/supervisor", rule: { action: "members.invite" }, body: { certificateNumber: "x" }, ok: 400 },
  { method: "DELETE", route: "/api/v1/projects/[projectId]/supervisor", path: "/api/v1/projects/{projectId}/supervisor", rule: { action: "members.invite" }, ok: 204, changesDemo: true },
  { method: "POST", route: "/api/v1/projects/[projectId]/supervisor/signature", path: "/api/v1/projects/{projectId}/supervisor/signature", rule: { action: "supervisor.sign" }, body: { confirm: true }, ok: 400 },
  { method: "GET", route: "/api/v1/invitations/[token]", path: "/api/v1/invitations/not-an-invitation-link", rule: { outsideProject: "public" }, ok: 404 },
  { method: "POST", route: "/api/v1/invitations/[token]/accept", path: "/api/v1/invitations/not-an-invitation-link/accept", rule: { outsideProject: "public" }, body: {}, ok: 400 },
  // Notifications and the outbox.
  { method: "GET", route: "/api/v1/notifications", path: "/api/v1/notifications?limit=1", rule: { outsideProject: "signed-in" }, ok: 200 },
  { method: "POST", route: "/api/v1/notifications/read", path: "/api/v1/notifications/read", rule: { outsideProject: "signed-in" }, body: { ids: [UNKNOWN_ID] }, ok: 200 },
  { method: "GET", route: "/api/v1/admin/outbox", path: "/api/v1/admin/outbox?limit=1", rule: { outsideProject: "signed-in" }, only: { admins: true, rolesAnywhere: [] }, ok: 200 },
  // Photos of traverse locations: the section and photo are looked up before any file is read.
  { method: "GET", route: "/api/v1/projects/[projectId]/sections/[sectionId]/photos", path: `/api/v1/projects/{projectId}/sections/${UNKNOWN_ID}/photos`, rule: { action: "project.view" }, ok: 404 },
  { method: "POST", route: "/api/v1/projects/[projectId]/sections/[sectionId]/photos", path: `/api/v1/projects/{projectId}/sections/${UNKNOWN_ID}/photos`, rule: { action: "photo.add" }, ok: 404 },
  { method: "GET", route: "/api/v1/projects/[projectId]/sections/[sectionId]/photos/[photoId]", path: `/api/v1/projects/{projectId}/sections/${UNKNOWN_ID}/photos/${UNKNOWN_ID}`, rule: { action: "project.view" }, ok: 404 },
  { method: "DELETE", route: "/api/v1/projects/[projectId]/sections/[sectionId]/photos/[photoId]", path: `/api/v1/projects/{projectId}/sections/${UNKNOWN_ID}/photos/${UNKNOWN_ID}`, rule: { action: "photo.add" }, ok: 404 },
  // Issued reports: the demo's library has one (e2e/support/prepare-data.ts), the clinic none.
  { method: "GET", route: "/api/v1/projects/[projectId]/reports", path: "/api/v1/projects/{projectId}/reports", rule: { action: "report.download" }, ok: 200 },
  { method: "GET", route: "/api/v1/projects/[projectId]/reports/latest.pdf", path: "/api/v1/projects/{projectId}/reports/latest.pdf", rule: { action: "report.download" }, ok: 200, okOnSecondProject: 404 },
  // The issuing flow: invalid bodies answer 400, so the matrix approves and issues nothing.
  { method: "POST", route: "/api/v1/projects/[projectId]/reports", path: "/api/v1/projects/{projectId}/reports", rule: { action: "report.issue" }, body: { reason: 5 }, ok: 400 },
  { method: "GET", route: "/api/v1/projects/[projectId]/reports/draft.pdf", path: "/api/v1/projects/{projectId}/reports/draft.pdf", rule: { action: "report.download" }, ok: 200 },
  { method: "GET", route: "/api/v1/projects/[projectId]/reports/readiness", path: "/api/v1/projects/{projectId}/reports/readiness", rule: { action: "report.download" }, ok: 200 },
  { method: "POST", route: "/api/v1/projects/[projectId]/reports/approvals", path: "/api/v1/projects/{projectId}/reports/approvals", rule: { action: "report.approve" }, body: { comment: 5 }, ok: 400 },
  { method: "GET", route: "/api/v1/projects/[projectId]/reports/[reportId]/pdf", path: `/api/v1/projects/{projectId}/reports/${UNKNOWN_ID}/pdf`, rule: { action: "report.download" }, ok: 404 },
  { method: "GET", route: "/api/v1/projects/[projectId]/reports/[reportId]/signature", path: `/api/v1/projects/{projectId}/reports/${UNKNOWN_ID}/signature`, rule: { action: "report.download" }, ok: 404 },
  // Verification is public; a JSON body is not the multipart file it reads.
  { method: "POST", route: "/api/v1/reports/verify", path: "/api/v1/reports/verify", rule: { outsideProject: "public" }, body: {}, ok: 415 },
  { method: "GET", route: "/api/v1/reports/public-key", path: "/api/v1/reports/public-key", rule: { outsideProject: "public" }, ok: 200 },
  { method: "GET", route: "/api/v1/reports/[code]/signature", path: "/api/v1/reports/0000-0000-0000/signature", rule: { outsideProject: "public" }, ok: 404 },
  ...(["GET", "POST", "PUT", "PATCH", "DELETE"] as const).map(
    (method): Endpoint => ({ method, route: "/api/[...path]", path: "/api/v1/no-such-endpoint", rule: { outsideProject: "public" }, body: method === "GET" ? undefined : {}, ok: 404 }),
  ),
];
