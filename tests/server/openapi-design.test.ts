import { describe, expect, it } from "vitest";
import { openApiDocument } from "@/lib/openapi";

type Schema = { properties: Record<string, Record<string, unknown>>; required?: string[] };
const body = (path: string, method: string) =>
  (openApiDocument().paths[path]![method] as { requestBody: { content: Record<string, { schema: Schema }> } }).requestBody.content;

describe("the set-up operations in the API description", () => {
  it("describe each body from the validation schema, limits included", () => {
    const section = body("/api/v1/projects/{projectId}/sections", "post")["application/json"]!.schema;
    expect(section.required).toEqual(expect.arrayContaining(["systemId", "tag", "shape", "designFlowM3S"]));
    expect(section.properties.designFlowM3S).toMatchObject({ type: "number", exclusiveMinimum: 0, maximum: 200 });
    expect(section.properties.diameterMm).toBeDefined();
    const terminal = body("/api/v1/projects/{projectId}/terminals", "post")["application/json"]!.schema;
    expect(terminal.properties.kind).toMatchObject({ enum: ["diffuser", "grille", "register", "vav_box", "constant_volume_box"] });
    expect(Object.keys(body("/api/v1/projects/{projectId}/design/import", "post"))).toEqual(["text/csv"]);
  });

  it("list the refusals each route can answer", () => {
    const del = openApiDocument().paths["/api/v1/projects/{projectId}/sections/{sectionId}"]!.delete as { responses: Record<string, unknown> };
    expect(Object.keys(del.responses).sort()).toEqual(["200", "401", "403", "404", "409"]);
  });
});
