import "@/lib/validation/zod-browser";
import { z } from "zod";
import type { Operation } from "../registry";
import { passwordChangeSchema, preferencesSchema, signInSchema } from "@/lib/validation/auth";
import { layoutInputSchema, networkInputSchema, traverseInputSchema } from "@/lib/validation/calc";

/** Sign-in, the caller, health, projects and the calculation engine. */
export const coreOperations: Operation[] = [
  {
    method: "post",
    path: "/api/auth/sign-in",
    tag: "Sign-in",
    summary: "Sign in with e-mail and password",
    signedIn: false,
    body: signInSchema,
    responses: { "204": { description: "Signed in; the session cookie is set." } },
    errors: [401, 429],
  },
  { method: "post", path: "/api/auth/sign-out", tag: "Sign-in", summary: "Sign out (clears the cookie)", signedIn: false, responses: { "204": { description: "Signed out." } } },
  {
    method: "post",
    path: "/api/auth/sign-out-everywhere",
    tag: "Sign-in",
    summary: "End every session of the caller, on every device",
    responses: { "204": { description: "Every session has ended." } },
  },
  {
    method: "post",
    path: "/api/auth/password",
    tag: "Sign-in",
    summary: "Change the caller's password; every other session of theirs ends",
    body: passwordChangeSchema,
    responses: { "204": { description: "Changed." } },
    errors: [503],
  },
  { method: "get", path: "/api/auth/me", tag: "Sign-in", summary: "The signed-in user and their project memberships", responses: { "200": { description: "The user and memberships." } } },
  {
    method: "get",
    path: "/api/health",
    tag: "Service",
    summary: "Whether the service and its database are up",
    signedIn: false,
    responses: { "200": { description: "Up." }, "503": { description: "The database is not available." } },
  },
  { method: "get", path: "/api/v1/projects", tag: "Projects", summary: "The caller's projects with their role and progress", responses: { "200": { description: "`{projects}`" } } },
  {
    method: "get",
    path: "/api/v1/projects/{projectId}",
    tag: "Projects",
    summary: "One project with the caller's role, its air systems, duct sections and terminals (SI)",
    responses: { "200": { description: "`{project, role, systems, sections, terminals}`" } },
    errors: [404],
  },
  {
    method: "patch",
    path: "/api/v1/me",
    tag: "Sign-in",
    summary: "The caller's unit system (null: each project's own)",
    body: preferencesSchema,
    responses: { "200": { description: "`{user}`" } },
  },
  {
    method: "get",
    path: "/api/v1/openapi.json",
    tag: "Service",
    summary: "This description",
    signedIn: false,
    responses: { "200": { description: "OpenAPI 3.1 document." } },
  },
  ...(
    [
      ["layout", layoutInputSchema, "Traverse point layout: positions, insertion depths, recommended counts"],
      ["traverse", traverseInputSchema, "Reduce a traverse: density, velocities, mean, flows, plane quality, uncertainty"],
      ["network", networkInputSchema, "Continuity by mass at every junction of a duct tree"],
    ] as const
  ).map(
    ([command, schema, summary]): Operation => ({
      method: "post",
      path: `/api/v1/calc/${command}`,
      tag: "Engine",
      summary,
      description: "The same input and output as `npm run -s calc -- " + command + "` (snake_case; mm, Pa, °C).",
      body: schema,
      responses: { "200": { description: "The result.", schema: z.object({}).passthrough() } },
    }),
  ),
];
