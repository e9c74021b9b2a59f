import { NextResponse } from "next/server";
import { setUserUnitSystem } from "@/db/queries/users";
import { defineRoute } from "@/lib/server/route";
import { preferencesSchema } from "@/lib/validation/auth";

/** The signed-in user's own preferences (read them at GET /api/auth/me): the unit system every screen shows (null: the project's). */
export const PATCH = defineRoute({ body: preferencesSchema }, async ({ user, body }) => {
  const updated = await setUserUnitSystem({ id: user.id, unitSystem: body.unit_system });
  return NextResponse.json({ user: updated });
});
