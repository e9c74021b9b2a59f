import { NextResponse } from "next/server";
import { listMembershipsForUser } from "@/db/queries/projects";
import { defineRoute } from "@/lib/server/route";

export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ user }) => {
  const memberships = await listMembershipsForUser({ userId: user.id });
  return NextResponse.json({
    user: { id: user.id, email: user.email, name: user.name, isAdmin: user.isAdmin, unitSystem: user.unitSystem },
    memberships,
  });
});
