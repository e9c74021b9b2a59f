import { NextResponse } from "next/server";
import { getProjectDesign } from "@/db/queries/airflow";
import { defineRoute } from "@/lib/server/route";

/** One project with the caller's role and its design side: air systems, duct sections and terminals (SI units). */
export const GET = defineRoute({ project: { param: "projectId", action: "design.view" } }, async ({ access }) => {
  const { project, role } = access;
  const design = await getProjectDesign({ projectId: project.id });
  return NextResponse.json({ project, role, ...design });
});
