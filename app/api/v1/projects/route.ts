import { NextResponse } from "next/server";
import { listProjectsForUser } from "@/db/queries/projects";
import { defineRoute } from "@/lib/server/route";

/** The signed-in user's projects with their role in each. */
export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ user }) => {
  const projects = await listProjectsForUser({ userId: user.id, isAdmin: user.isAdmin });
  return NextResponse.json({ projects });
});
