import { loadExistingDesign } from "@/db/queries/design-import";
import { exportSchedule } from "@/lib/design/schedule-csv";
import { defineRoute, jsonError } from "@/lib/server/route";
import { unitSystemFor } from "@/lib/units";

/** The project's design schedule as CSV, in the caller's units unless `units=IP|SI` says otherwise; it re-imports as it is. */
export const GET = defineRoute({ project: { param: "projectId", action: "design.view" } }, async ({ req, user, access }) => {
  const asked = req.nextUrl.searchParams.get("units");
  if (asked !== null && asked !== "IP" && asked !== "SI") return jsonError(400, 'units must be "IP" or "SI".', { units: `"${asked.slice(0, 20)}" is not IP or SI.` });
  const { project } = access!;
  const units = asked ?? unitSystemFor(user, project);
  const csv = exportSchedule(await loadExistingDesign({ projectId: project.id }), units);
  const name = `${project.name.replace(/[^A-Za-z0-9]+/g, "-").replace(/^-|-$/g, "").slice(0, 60) || "project"}-design-schedule.csv`;
  return new Response("\uFEFF" + csv, {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${name}"`, "cache-control": "no-store" },
  });
});
