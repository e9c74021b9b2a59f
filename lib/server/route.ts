import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import type { ZodType } from "zod";
import { AUDIT, recordAuditQuietly } from "@/db/queries/audit";
import type { SessionUser } from "@/db/queries/users";
import type { ProjectAccess } from "@/db/queries/projects";
import { currentUser, currentUserWithProject, judgeProjectAccess } from "@/lib/auth/guards";
import type { Action } from "@/lib/auth/policy";
import { failFromZod, type ErrorBody } from "@/lib/validation/result";
import { BODY_LIMITS, foreignOrigin, readJsonBody } from "./request";

export { BODY_LIMITS } from "./request";

/** Every API answer carries this: responses hold personal and project data that no cache may keep. */
const NO_STORE = { "Cache-Control": "no-store" };

export function jsonError(status: number, message: string, fields?: Record<string, string>, headers?: Record<string, string>): NextResponse<ErrorBody> {
  return NextResponse.json({ error: fields ? { message, fields } : { message } }, { status, headers: { ...NO_STORE, ...headers } });
}

type Params = Record<string, string>;

/** The same answer for a project that does not exist and one the caller may not see: existence is not revealed. */
export const PROJECT_NOT_FOUND = "No such project, or you are not a member of it.";
export const PROJECT_FORBIDDEN = "Your role in this project does not allow this.";

interface CommonOptions<B> {
  /** Zod schema for the JSON body; omitted → no body is read (the handler may read one itself). */
  body?: ZodType<B>;
  /** Cap on the JSON body in bytes (default BODY_LIMITS.json, 1 MiB); over it → 413. */
  maxBodyBytes?: number;
}

/** A route inside a project: the project comes from a path parameter, and the role must allow the action. */
export interface ProjectRouteOptions<B> extends CommonOptions<B> {
  project: { param: string; action: Action };
  outsideProject?: never;
}

/**
 * A route outside any project, declared as such (and listed in ROUTES_OUTSIDE_PROJECTS,
 * lib/auth/routes.ts): "signed-in" needs a session, "public" answers anyone.
 */
export interface OutsideProjectRouteOptions<B> extends CommonOptions<B> {
  outsideProject: "signed-in" | "public";
  project?: never;
}

interface BaseContext<B> {
  req: NextRequest;
  params: Params;
  body: B;
}
export interface ProjectRouteContext<B> extends BaseContext<B> {
  user: SessionUser;
  access: ProjectAccess;
}
export interface SignedInRouteContext<B> extends BaseContext<B> {
  user: SessionUser;
  /** Always undefined outside projects; kept so handlers written for either shape compile. */
  access: undefined;
}
export interface PublicRouteContext<B> extends BaseContext<B> {
  /** The caller, when signed in (one query, made only when asked). */
  getUser: () => Promise<SessionUser | null>;
}

/**
 * A route that names neither: it still compiles (the first calling shape, `defineRoute({ body })`)
 * and requires a session, but tests/auth/routes.test.ts fails until it declares one or the other.
 */
export interface UndeclaredRouteOptions<B> extends CommonOptions<B> {
  project?: undefined;
  outsideProject?: undefined;
}

/** What a route declares, attached to its handler so tests can enumerate every route's rule. */
export type RouteDeclaration =
  | { scope: "project"; param: string; action: Action }
  | { scope: "signed-in"; declared: boolean }
  | { scope: "public" };

export type RouteHandler = ((req: NextRequest, ctx: { params: Promise<Params> }) => Promise<Response>) & { declaration: RouteDeclaration };

/**
 * Every API route goes through here, in this order:
 * origin check (state-changing requests from another site → 403) → authenticate (401) →
 * authorize against the project membership (404 for a project the caller cannot see, 403 for a role
 * that may not act; both before any body is read) → content type (415) → body size (413) →
 * validate (400) → act. One error shape, `Cache-Control: no-store` on every answer, refusals of
 * signed-in callers written to the audit log, and no way in that skips a step.
 */
export function defineRoute<B = undefined>(options: ProjectRouteOptions<B>, handler: (ctx: ProjectRouteContext<B>) => Promise<Response>): RouteHandler;
export function defineRoute<B = undefined>(
  options: OutsideProjectRouteOptions<B> & { outsideProject: "signed-in" },
  handler: (ctx: SignedInRouteContext<B>) => Promise<Response>,
): RouteHandler;
export function defineRoute<B = undefined>(
  options: OutsideProjectRouteOptions<B> & { outsideProject: "public" },
  handler: (ctx: PublicRouteContext<B>) => Promise<Response>,
): RouteHandler;
export function defineRoute<B = undefined>(options: UndeclaredRouteOptions<B>, handler: (ctx: SignedInRouteContext<B>) => Promise<Response>): RouteHandler;
export function defineRoute<B>(
  options: ProjectRouteOptions<B> | OutsideProjectRouteOptions<B> | UndeclaredRouteOptions<B>,
  handler: (ctx: never) => Promise<Response>,
): RouteHandler {
  const declaration: RouteDeclaration = options.project
    ? { scope: "project", param: options.project.param, action: options.project.action }
    : options.outsideProject === "public"
      ? { scope: "public" }
      : { scope: "signed-in", declared: options.outsideProject === "signed-in" };
  const act = handler as (ctx: unknown) => Promise<Response>;

  const route = async (req: NextRequest, ctx: { params: Promise<Params> }): Promise<Response> => {
    try {
      const params = await ctx.params;
      const deny = (user: SessionUser | null, status: number, reason: string, projectId?: string) => {
        // Signed-out refusals are not recorded: anyone can make them in bulk, and the log is append-only.
        if (user) {
          return recordAuditQuietly({
            userId: user.id,
            actorEmail: user.email,
            projectId: null,
            action: AUDIT.requestDenied,
            entityType: "request",
            entityId: null,
            detail: { method: req.method, path: req.nextUrl.pathname, status, reason, ...(projectId ? { projectId } : {}) },
          });
        }
      };

      const foreign = foreignOrigin(req);

      let user: SessionUser | null = null;
      let access: ProjectAccess | undefined;
      if (declaration.scope === "project") {
        const projectId = params[declaration.param] ?? "";
        const found = await currentUserWithProject(projectId);
        if (!found) return jsonError(401, "Sign in to use this.");
        user = found.user;
        if (foreign) {
          await deny(user, 403, `foreign origin ${foreign}`);
          return jsonError(403, "This request came from another site and was refused.");
        }
        const check = judgeProjectAccess(user, found.access, declaration.action);
        if (check.status === "not_found") {
          await deny(user, 404, `not a member (${declaration.action})`);
          return jsonError(404, PROJECT_NOT_FOUND);
        }
        if (check.status === "forbidden") {
          await deny(user, 403, `role ${check.access.role ?? "administrator"} may not ${declaration.action}`, check.access.project.id);
          return jsonError(403, PROJECT_FORBIDDEN);
        }
        access = check.access;
      } else if (declaration.scope === "signed-in") {
        user = await currentUser();
        if (!user) return jsonError(401, "Sign in to use this.");
        if (foreign) {
          await deny(user, 403, `foreign origin ${foreign}`);
          return jsonError(403, "This request came from another site and was refused.");
        }
      } else if (foreign) {
        return jsonError(403, "This request came from another site and was refused.");
      }

      let body = undefined as B;
      if (options.body) {
        const read = await parseJsonBody(req, options.body, options.maxBodyBytes);
        if (!read.ok) return read.response;
        body = read.value;
      }

      const response =
        declaration.scope === "public"
          ? await act({ req, params, body, getUser: () => currentUser() } satisfies PublicRouteContext<B>)
          : await act({ req, params, body, user: user!, access });
      if (!response.headers.has("Cache-Control")) response.headers.set("Cache-Control", NO_STORE["Cache-Control"]);
      return response;
    } catch (err) {
      // Database and library messages go to the log, never to the client.
      console.error(`[api] ${req.method} ${req.nextUrl.pathname} failed`, err);
      return jsonError(500, "Something went wrong on the server. Your saved data is unchanged; try again.");
    }
  };
  return Object.assign(route, { declaration });
}

/** The declaration defineRoute attached to a handler, or null for a handler made some other way. */
export function routeDeclaration(handler: unknown): RouteDeclaration | null {
  if (typeof handler !== "function") return null;
  const d = (handler as Partial<RouteHandler>).declaration;
  return d && typeof d === "object" && "scope" in d ? d : null;
}

/**
 * Reads and validates a JSON body: content type (415), size cap (413), JSON (400 naming `(body)`),
 * schema (400 naming each field). defineRoute does this for a declared `body`; a handler that must
 * check something of its own before reading the body (who may call it) calls this afterwards.
 */
export async function parseJsonBody<T>(req: Request, schema: ZodType<T>, maxBytes: number = BODY_LIMITS.json): Promise<{ ok: true; value: T } | { ok: false; response: Response }> {
  const raw = await readJsonBody(req, maxBytes);
  if (!raw.ok) return { ok: false, response: jsonError(raw.status, raw.message, raw.status === 400 ? { "(body)": raw.message } : undefined) };
  const parsed = schema.safeParse(raw.value);
  if (!parsed.success) {
    const failure = failFromZod(parsed.error);
    return { ok: false, response: jsonError(400, failure.error.message, failure.error.fields) };
  }
  return { ok: true, value: parsed.data };
}

/**
 * @deprecated for route handlers: declare `body` in defineRoute. Kept for callers that read a body
 * themselves; applies the JSON size cap and content-type rule. Status 400, 413 or 415 on failure.
 */
export async function readJson(req: Request, limit: number = BODY_LIMITS.json) {
  return readJsonBody(req, limit);
}
