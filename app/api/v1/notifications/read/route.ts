import { NextResponse } from "next/server";
import { countUnreadNotifications, markNotificationsRead } from "@/db/queries/notifications";
import { BODY_LIMITS, defineRoute } from "@/lib/server/route";
import { markReadSchema } from "@/lib/validation/notifications";

/** Marks the caller's own notifications read: `{ids: [...]}` or `{all: true}`. */
export const POST = defineRoute({ outsideProject: "signed-in", body: markReadSchema, maxBodyBytes: BODY_LIMITS.form }, async ({ user, body }) => {
  const marked = await markNotificationsRead({ userId: user.id, ids: "all" in body ? "all" : body.ids });
  return NextResponse.json({ marked, unread: await countUnreadNotifications({ userId: user.id }) });
});
