import { NextResponse } from "next/server";
import { listProjectsForUser } from "@/db/queries/projects";
import { defineRoute } from "@/lib/server/route";

export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ user }) => {
  const projects = await listProjectsForUser({ userId: user.id, isAdmin: user.isAdmin });
  return NextResponse.json({
    user: { id: user.id, email: user.email, name: user.name, isAdmin: user.isAdmin, unitSystem: user.unitSystem },
    memberships: projects.filter((p) => p.role !== null).map((p) => ({ projectId: p.id, role: p.role })),
  });
});
