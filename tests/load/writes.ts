/**
 * The write side of `npm run load`, chosen with `--write <name>`. Each mix turns the signed-in
 * sessions and the demo project into the requests one write connection cycles through.
 * Add a mix here when a new save endpoint exists (the traverse readings save is meant to replace
 * `preference` as the default once it lands).
 */
import type { Request as CannonRequest } from "autocannon";

export interface LoadContext {
  /** Session cookie header per demo account e-mail. */
  cookies: Record<string, string>;
  /** Ids of the demo projects by name. */
  projects: Record<string, string>;
}

export type WriteMix = (ctx: LoadContext) => CannonRequest[];

const json = (cookie: string) => ({ cookie, "content-type": "application/json" });

export const WRITE_MIXES: Record<string, WriteMix> = {
  /** PATCH /api/v1/me: each demo account saves its unit preference (one row update and one audit entry per request). */
  preference: ({ cookies }) =>
    Object.values(cookies).flatMap((cookie) =>
      (["IP", "SI", null] as const).map((unit_system) => ({ method: "PATCH" as const, path: "/api/v1/me", headers: json(cookie), body: JSON.stringify({ unit_system }) })),
    ),
};

export const DEFAULT_WRITE_MIX = "preference";
