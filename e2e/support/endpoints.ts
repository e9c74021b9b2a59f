/**
 * Every API endpoint with a sample request, for the authorization matrix
 * (e2e/authorization-matrix.spec.ts). tests/auth/routes.test.ts checks that every route under
 * app/api has a row here with the same declaration, so a new route needs its row: add one per
 * method with a body that the route accepts, and the status it answers when the caller may.
 */
import type { Action } from "../../lib/auth/policy";

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
   * True for calls that end the caller's sessions or change their password: the matrix then checks
   * only the refusals (signed out, foreign origin); e2e/sessions.spec.ts covers the rest.
   */
  endsSessions?: boolean;
}

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
  ...(["GET", "POST", "PUT", "PATCH", "DELETE"] as const).map(
    (method): Endpoint => ({ method, route: "/api/[...path]", path: "/api/v1/no-such-endpoint", rule: { outsideProject: "public" }, body: method === "GET" ? undefined : {}, ok: 404 }),
  ),
];
