import { NextResponse } from "next/server";
import { AUDIT, recordAudit } from "@/db/queries/audit";
import { setUserUnitSystem } from "@/db/queries/users";
import { defineRoute } from "@/lib/server/route";
import { preferencesSchema } from "@/lib/validation/auth";

/** The signed-in user's own preferences (read them at GET /api/auth/me): the unit system every screen shows (null: the project's). */
export const PATCH = defineRoute({ outsideProject: "signed-in", body: preferencesSchema }, async ({ user, body }) => {
  const updated = await setUserUnitSystem({ id: user.id, unitSystem: body.unit_system });
  await recordAudit({
    userId: user.id,
    actorEmail: user.email,
    action: AUDIT.preferencesChanged,
    entityType: "user",
    entityId: user.id,
    detail: { unit_system: { from: user.unitSystem, to: body.unit_system } },
  });
  return NextResponse.json({ user: updated && { id: updated.id, email: updated.email, name: updated.name, isAdmin: updated.isAdmin, unitSystem: updated.unitSystem } });
});
