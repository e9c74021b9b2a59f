/**
 * The API description, built from the same zod schemas the route handlers validate with, so the
 * document cannot drift from what the server accepts. Each area lists its operations in
 * lib/openapi/operations/<area>.ts; lib/openapi/index.ts gathers them.
 */
import "@/lib/validation/zod-browser";
import { z, type ZodType } from "zod";

export type HttpMethod = "get" | "post" | "put" | "patch" | "delete";

export interface Operation {
  method: HttpMethod;
  /** OpenAPI path with {braces}, e.g. /api/v1/projects/{projectId}/traverses. */
  path: string;
  summary: string;
  description?: string;
  tag: string;
  /** Who may call it, in words (the policy in lib/auth/policy.ts decides). */
  roles?: string;
  /** False for the few public routes; signed-in by default. */
  signedIn?: boolean;
  body?: ZodType;
  /** Content type of the body when it is not JSON (e.g. multipart/form-data, text/csv). */
  bodyContentType?: string;
  query?: Record<string, { description: string; required?: boolean; schema?: Record<string, unknown> }>;
  /** Success responses by status; the error statuses are added from `errors`. */
  responses: Record<string, { description: string; schema?: ZodType; contentType?: string }>;
  errors?: number[];
}

const ERROR_DESCRIPTIONS: Record<number, string> = {
  400: "The input is not valid: `error.fields` names each field (dotted path) with what is allowed.",
  401: "Not signed in.",
  403: "Signed in, but the role in this project does not allow it.",
  404: "No such resource in a project the caller belongs to (another project's ids answer the same).",
  408: "The body took too long to arrive; nothing was kept.",
  409: "Conflicts with the current state (e.g. a stale version); the body says what the state is.",
  413: "The body is larger than this route accepts.",
  415: "The body is not of the content type this route takes.",
  429: "Too many attempts; wait and try again (see Retry-After).",
  503: "Busy or unavailable for a moment; try again (see Retry-After).",
};

const errorBody = {
  type: "object",
  required: ["error"],
  properties: {
    error: {
      type: "object",
      required: ["message"],
      properties: { message: { type: "string" }, fields: { type: "object", additionalProperties: { type: "string" } } },
    },
  },
};

function jsonSchema(schema: ZodType): Record<string, unknown> {
  // "input": what a caller sends (before defaults and transforms); refinements cannot be expressed and are described in prose.
  const doc = z.toJSONSchema(schema, { io: "input", unrepresentable: "any" }) as Record<string, unknown>;
  delete doc.$schema; // the document's own dialect (OpenAPI 3.1 is JSON Schema 2020-12) applies
  return doc;
}

function pathParameters(path: string) {
  return [...path.matchAll(/\{(\w+)\}/g)].map(([, name]) => ({ name, in: "path", required: true, schema: { type: "string" } }));
}

export function buildOpenApiDocument(operations: readonly Operation[], info: { version: string }) {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const op of operations) {
    const errors = [...new Set([...(op.signedIn === false ? [] : [401]), ...(op.body ? [400] : []), ...(op.errors ?? [])])].sort();
    const responses: Record<string, unknown> = {};
    for (const [status, r] of Object.entries(op.responses))
      responses[status] = { description: r.description, ...(r.schema || r.contentType ? { content: { [r.contentType ?? "application/json"]: r.schema ? { schema: jsonSchema(r.schema) } : {} } } : {}) };
    for (const status of errors)
      responses[String(status)] = { description: ERROR_DESCRIPTIONS[status] ?? "Error.", content: { "application/json": { schema: { $ref: "#/components/schemas/Error" } } } };
    const parameters = [
      ...pathParameters(op.path),
      ...Object.entries(op.query ?? {}).map(([name, q]) => ({ name, in: "query", required: q.required ?? false, description: q.description, schema: q.schema ?? { type: "string" } })),
    ];
    paths[op.path] ??= {};
    paths[op.path]![op.method] = {
      summary: op.summary,
      ...(op.description ? { description: op.description } : {}),
      tags: [op.tag],
      ...(op.roles ? { "x-roles": op.roles } : {}),
      ...(op.signedIn === false ? { security: [] } : {}),
      ...(parameters.length ? { parameters } : {}),
      ...(op.body ? { requestBody: { required: true, content: { [op.bodyContentType ?? "application/json"]: { schema: jsonSchema(op.body) } } } } : {}),
      responses,
    };
  }
  return {
    openapi: "3.1.0",
    info: {
      title: "Airtally API",
      version: info.version,
      description:
        "Airflow commissioning data: projects, duct trees, traverses, terminal readings and the calculation engine. " +
        "Resource JSON is camelCase in SI units (m, m³/s, Pa, °C, kg/m³); the calc commands take snake_case with mm. " +
        "Every error is {\"error\":{\"message\",\"fields?\"}}.",
    },
    components: {
      securitySchemes: { session: { type: "apiKey", in: "cookie", name: "airtally_session", description: "Set by POST /api/auth/sign-in (named __Host-airtally_session when served over HTTPS)." } },
      schemas: { Error: errorBody },
    },
    security: [{ session: [] }],
    paths,
  };
}
