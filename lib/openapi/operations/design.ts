import "@/lib/validation/zod-browser";
import { z } from "zod";
import type { Operation } from "../registry";
import { deletedSchema, fieldDataHeldSchema, projectResourceSchema, sectionResourceSchema, systemResourceSchema, terminalResourceSchema } from "@/lib/design/resources";
import { SCHEDULE_LIMITS } from "@/lib/design/schedule-csv";
import { DESIGN } from "@/lib/validation/design";

const P = "/api/v1/projects/{projectId}";
const ENGINEERS = "Engineers of the project and site administrators";
const DESIGN_VIEW = "Technicians, commissioning agents and engineers of the project; site administrators";

const cellError = z.object({ column: z.string(), message: z.string() });
const previewSchema = z.object({
  ok: z.boolean().describe("True when no row has an error: the file can be committed"),
  fileErrors: z.array(z.string()),
  rows: z.array(
    z.object({
      line: z.number().int(),
      record: z.enum(["section", "terminal"]).nullable(),
      system: z.string(),
      tag: z.string(),
      parent: z.string(),
      size: z.string(),
      airflow: z.string(),
      action: z.enum(["add", "update", "unchanged"]).nullable(),
      errors: z.array(cellError),
    }),
  ),
  counts: z.object({ rows: z.number().int(), add: z.number().int(), update: z.number().int(), unchanged: z.number().int(), withErrors: z.number().int() }),
  units: z.record(z.string(), z.string()),
});
const tags = z.object({ sections: z.array(z.string()), terminals: z.array(z.string()) });
const held = z.object({ error: z.object({ message: z.string() }), held: fieldDataHeldSchema });

/** Project set-up: projects, air systems, duct sections, terminals and the design schedule file. */
export const designOperations: Operation[] = [
  {
    method: "post",
    path: "/api/v1/projects",
    tag: "Set-up",
    summary: "Start a project; its creator becomes the project's engineer",
    description: "Standard air defaults to 0.075 lb/ft³ (1.2014 kg/m³) for IP projects and 1.204 kg/m³ for SI ones; tolerances default to common practice.",
    roles: "Site administrators, and users who are an engineer on at least one project",
    body: DESIGN.project,
    responses: { "201": { description: "`{project}`", schema: z.object({ project: projectResourceSchema }) } },
    errors: [403],
  },
  {
    method: "patch",
    path: P,
    tag: "Set-up",
    summary: "Change the project's settings: site, address, altitude, units, standard air, tolerances",
    roles: ENGINEERS,
    body: DESIGN.projectPatch,
    responses: { "200": { description: "`{project}`", schema: z.object({ project: projectResourceSchema }) } },
    errors: [403, 404],
  },
  {
    method: "post",
    path: `${P}/systems`,
    tag: "Set-up",
    summary: "Add an air system (fan or air handler) with its design airflow, static pressure, fan speed and motor nameplate",
    roles: ENGINEERS,
    body: DESIGN.system,
    responses: { "201": { description: "`{system}`", schema: z.object({ system: systemResourceSchema }) } },
    errors: [403, 404, 409],
  },
  {
    method: "patch",
    path: `${P}/systems/{systemId}`,
    tag: "Set-up",
    summary: "Change an air system",
    roles: ENGINEERS,
    body: DESIGN.systemPatch,
    responses: { "200": { description: "`{system}`", schema: z.object({ system: systemResourceSchema }) } },
    errors: [403, 404, 409],
  },
  {
    method: "delete",
    path: `${P}/systems/{systemId}`,
    tag: "Set-up",
    summary: "Delete an air system with its duct tree and terminals",
    description: "Refused with 409 while any traverse, terminal reading, set of terminal readings or operating-conditions record belongs to it; the body says what holds it.",
    roles: ENGINEERS,
    responses: { "200": { description: "What was removed", schema: deletedSchema }, "409": { description: "Field data holds the system", schema: held } },
    errors: [403, 404],
  },
  {
    method: "post",
    path: `${P}/sections`,
    tag: "Set-up",
    summary: "Add a duct section: a trunk (no parentId) or a branch below a section of the same system",
    roles: ENGINEERS,
    body: DESIGN.section,
    responses: { "201": { description: "`{section}`", schema: z.object({ section: sectionResourceSchema }) } },
    errors: [403, 404, 409],
  },
  {
    method: "patch",
    path: `${P}/sections/{sectionId}`,
    tag: "Set-up",
    summary: "Change a duct section or move it under another parent",
    description: "A move that would put a section below its own branches is refused (400 on parentId). Changing the shape clears the other shape's dimensions.",
    roles: ENGINEERS,
    body: DESIGN.sectionPatch,
    responses: { "200": { description: "`{section}`", schema: z.object({ section: sectionResourceSchema }) } },
    errors: [403, 404, 409],
  },
  {
    method: "delete",
    path: `${P}/sections/{sectionId}`,
    tag: "Set-up",
    summary: "Delete a duct section with the sections and terminals below it",
    description: "Refused with 409 while any of them has traverses or terminal readings; the body says which.",
    roles: ENGINEERS,
    responses: { "200": { description: "What was removed", schema: deletedSchema }, "409": { description: "Field data holds the section", schema: held } },
    errors: [403, 404],
  },
  {
    method: "get",
    path: `${P}/terminals`,
    tag: "Set-up",
    summary: "The project's outlets, inlets and terminal units",
    roles: DESIGN_VIEW,
    query: { systemId: { description: "Only this air system's terminals" }, sectionId: { description: "Only the terminals on this duct section" } },
    responses: { "200": { description: "`{terminals}`", schema: z.object({ terminals: z.array(terminalResourceSchema) }) } },
    errors: [400, 403, 404],
  },
  {
    method: "post",
    path: `${P}/terminals`,
    tag: "Set-up",
    summary: "Add an outlet or inlet (diffuser, grille, register) or a terminal unit (VAV or constant-volume box) to a duct section",
    roles: ENGINEERS,
    body: DESIGN.terminal,
    responses: { "201": { description: "`{terminal}`", schema: z.object({ terminal: terminalResourceSchema }) } },
    errors: [403, 404, 409],
  },
  {
    method: "patch",
    path: `${P}/terminals/{terminalId}`,
    tag: "Set-up",
    summary: "Change a terminal, or move it to another section",
    description: "Changing `kind` clears the fields that do not apply to the new kind unless the same request sets them.",
    roles: ENGINEERS,
    body: DESIGN.terminalPatch,
    responses: { "200": { description: "`{terminal}`", schema: z.object({ terminal: terminalResourceSchema }) } },
    errors: [403, 404, 409],
  },
  {
    method: "delete",
    path: `${P}/terminals/{terminalId}`,
    tag: "Set-up",
    summary: "Delete a terminal",
    description: "Refused with 409 while it has readings.",
    roles: ENGINEERS,
    responses: { "200": { description: "What was removed", schema: deletedSchema }, "409": { description: "Readings hold the terminal", schema: held } },
    errors: [403, 404],
  },
  {
    method: "post",
    path: `${P}/design/import`,
    tag: "Set-up",
    summary: "Check or apply a design schedule (CSV of sections and terminals; columns in the README)",
    description:
      `The body is the CSV itself (Content-Type: text/csv, UTF-8, at most ${SCHEDULE_LIMITS.maxBytes / 1_048_576} MiB and ${SCHEDULE_LIMITS.maxRows} rows). ` +
      "`mode=preview` (default) saves nothing and lists every row with its errors; `mode=commit` applies the whole file in one transaction only when no row has an error (otherwise 400 with the preview). Existing tags are updated, new tags added; nothing is deleted.",
    roles: ENGINEERS,
    body: z.string().describe("The CSV file"),
    bodyContentType: "text/csv",
    query: { mode: { description: "preview (default) or commit", schema: { type: "string", enum: ["preview", "commit"] } } },
    responses: {
      "200": { description: "`{preview}`, and `applied` after a commit", schema: z.object({ preview: previewSchema, applied: z.object({ added: tags, updated: tags }).optional() }) },
    },
    errors: [403, 404, 413, 415],
  },
  {
    method: "get",
    path: `${P}/design/export.csv`,
    tag: "Set-up",
    summary: "The project's design schedule as CSV, in the import's columns",
    roles: DESIGN_VIEW,
    query: { units: { description: "IP (cfm, in., ft, ft²) or SI (L/s, mm, m, m²); default the caller's units", schema: { type: "string", enum: ["IP", "SI"] } } },
    responses: { "200": { description: "The CSV file", contentType: "text/csv" } },
    errors: [400, 403, 404],
  },
];
