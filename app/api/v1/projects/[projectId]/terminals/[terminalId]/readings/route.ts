import { NextResponse } from "next/server";
import { getTerminalInProject } from "@/db/queries/design";
import { listTerminalReadings } from "@/db/queries/terminal-readings";
import { terminalResource } from "@/lib/design/resources";
import { BODY_LIMITS, defineRoute, jsonError, parseJsonBody } from "@/lib/server/route";
import { formatFor, terminalReadingJson } from "@/lib/server/terminal-reading-json";
import { instrumentMap, recordReadingOfTerminal } from "@/lib/server/terminal-readings";
import { latestByPhase } from "@/lib/terminals/history";
import { terminalReadingCreateSchema } from "@/lib/validation/terminal-readings";

const NO_TERMINAL = "No such outlet, inlet or terminal unit in this project.";

/**
 * A terminal's readings, newest first (re-readings after adjustment are kept, never overwritten), with
 * the latest initial and final reading at each setpoint. Any member of the project.
 */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ params, user, access }) => {
  const project = access!.project;
  const format = formatFor(user, project);
  const place = await getTerminalInProject({ projectId: project.id, terminalId: params.terminalId ?? "" });
  if (!place) return jsonError(404, NO_TERMINAL);
  const [{ rows, truncated }, instruments] = await Promise.all([listTerminalReadings({ projectId: project.id, terminalId: place.terminal.id }), instrumentMap()]);
  const readings = rows.map((r) => terminalReadingJson(r, { terminal: place.terminal, project, instruments, format }));
  return NextResponse.json({ terminal: terminalResource(place.terminal), systemId: place.system.id, readings, latest: latestByPhase(readings), truncated });
});

/**
 * Records a reading of an outlet, inlet or terminal unit: by capture hood, velocity × effective area,
 * or a traverse of its own duct. 201 with the reading, its airflow (actual and standard), % of design
 * and verdict; 200 with the stored reading when the same client `id` was recorded before. Technicians only.
 */
export const POST = defineRoute({ project: { param: "projectId", action: "terminal.record" } }, async ({ req, params, user, access }) => {
  const project = access!.project;
  const place = await getTerminalInProject({ projectId: project.id, terminalId: params.terminalId ?? "" });
  if (!place) return jsonError(404, NO_TERMINAL);
  const body = await parseJsonBody(req, terminalReadingCreateSchema, BODY_LIMITS.form);
  if (!body.ok) return body.response;
  const outcome = await recordReadingOfTerminal({ user, project, place, body: body.value });
  if ("message" in outcome) return jsonError(outcome.status, outcome.message, outcome.fields);
  return NextResponse.json({ reading: outcome.reading, warnings: outcome.warnings }, { status: outcome.status });
});
