import { NextResponse } from "next/server";
import { getSystemInProject } from "@/db/queries/design";
import { listConditionsByIds, listTerminalReadings, listTerminalSets } from "@/db/queries/terminal-readings";
import { listTerminalsOfProject } from "@/db/queries/design";
import { conditionsJson } from "@/lib/server/field-json";
import { defineRoute, jsonError } from "@/lib/server/route";
import { formatFor, terminalReadingJson } from "@/lib/server/terminal-reading-json";
import { instrumentMap } from "@/lib/server/terminal-readings";

/**
 * Every terminal reading of the project (or of one system with `?systemId=`), newest first, with the
 * terminal sets they belong to and the operating conditions they name, so a screen can compare them.
 * Any member of the project.
 */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ req, user, access }) => {
  const project = access!.project;
  const format = formatFor(user, project);
  const query = req.nextUrl.searchParams;
  for (const key of query.keys()) if (key !== "systemId") return jsonError(400, `Unknown query parameter ${key.slice(0, 40)}.`, { [key.slice(0, 40)]: "is not a parameter of this list; only systemId is" });
  const systemId = query.get("systemId") ?? undefined;
  if (systemId !== undefined && !(await getSystemInProject({ projectId: project.id, systemId }))) return jsonError(404, "No such air system in this project.");
  const [{ rows, truncated }, sets, terminals, instruments] = await Promise.all([
    listTerminalReadings({ projectId: project.id, systemId }),
    listTerminalSets({ projectId: project.id, systemId }),
    listTerminalsOfProject({ projectId: project.id, systemId }),
    instrumentMap(),
  ]);
  const byId = new Map(terminals.map((t) => [t.id, t]));
  const readings = rows.flatMap((r) => {
    const terminal = byId.get(r.terminalId);
    return terminal ? [terminalReadingJson(r, { terminal, project, instruments, format })] : [];
  });
  const conditions = (await listConditionsByIds({ ids: rows.flatMap((r) => (r.conditionsId ? [r.conditionsId] : [])) })).map(conditionsJson);
  return NextResponse.json({
    systemId: systemId ?? null,
    sets: sets.map((s) => ({ id: s.id, systemId: s.systemId, status: s.status, version: s.version, revision: s.revision, updatedAt: s.updatedAt })),
    readings,
    conditions,
    truncated,
  });
});
