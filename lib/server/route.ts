import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import type { ZodType } from "zod";
import type { SessionUser } from "@/db/queries/users";
import type { ProjectAccess } from "@/db/queries/projects";
import { checkProjectAccess, currentUser } from "@/lib/auth/guards";
import type { Action } from "@/lib/auth/policy";
import { failFromZod, type ErrorBody } from "@/lib/validation/result";

export function jsonError(status: number, message: string, fields?: Record<string, string>): NextResponse<ErrorBody> {
  return NextResponse.json({ error: fields ? { message, fields } : { message } }, { status });
}

type Params = Record<string, string>;

interface RouteContext<B> {
  req: NextRequest;
  params: Params;
  user: SessionUser;
  body: B;
  /** Present when the route names a project parameter. */
  access: ProjectAccess | undefined;
}

interface RouteOptions<B> {
  /** Zod schema for the JSON body; omitted → no body is read. */
  body?: ZodType<B>;
  /** The project the route acts on, taken from a path parameter, and the action it performs. */
  project?: { param: string; action: Action };
}

/**
 * Every signed-in API route goes through here: authenticate → validate → authorize → act,
 * with one error shape. Forgetting a guard is impossible because there is no other way in.
 */
export function defineRoute<B = undefined>(
  options: RouteOptions<B>,
  handler: (ctx: RouteContext<B>) => Promise<Response>,
) {
  return async (req: NextRequest, ctx: { params: Promise<Params> }): Promise<Response> => {
    try {
      const user = await currentUser();
      if (!user) return jsonError(401, "Sign in to use this.");
      const params = await ctx.params;

      let body = undefined as B;
      if (options.body) {
        const raw = await readJson(req);
        if (!raw.ok) return jsonError(400, raw.message, { "(body)": raw.message });
        const parsed = options.body.safeParse(raw.value);
        if (!parsed.success) {
          const failure = failFromZod(parsed.error);
          return NextResponse.json({ error: failure.error }, { status: 400 });
        }
        body = parsed.data;
      }

      let access: ProjectAccess | undefined;
      if (options.project) {
        const check = await checkProjectAccess(user, params[options.project.param] ?? "", options.project.action);
        if (check.status === "not_found") return jsonError(404, "No such project, or you are not a member of it.");
        if (check.status === "forbidden") return jsonError(403, "Your role in this project does not allow this.");
        access = check.access;
      }
      return await handler({ req, params, user, body, access });
    } catch (err) {
      // Database and library messages go to the log, never to the client.
      console.error(`[api] ${req.method} ${req.nextUrl.pathname} failed`, err);
      return jsonError(500, "Something went wrong on the server. Your saved data is unchanged; try again.");
    }
  };
}

export async function readJson(req: Request): Promise<{ ok: true; value: unknown } | { ok: false; message: string }> {
  const text = await req.text();
  if (text.trim() === "") return { ok: false, message: "The request body is empty; send a JSON document." };
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch {
    return { ok: false, message: "The request body is not valid JSON." };
  }
}
