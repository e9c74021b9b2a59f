import { NextResponse } from "next/server";
import { countUnreadNotifications, listNotifications } from "@/db/queries/notifications";
import { defineRoute } from "@/lib/server/route";

/** The caller's notifications, newest first (`?unread=1` for unread only, `?limit=` up to 100), and the unread count. */
export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ req, user }) => {
  const q = req.nextUrl.searchParams;
  const limit = Math.min(Math.max(Number.parseInt(q.get("limit") ?? "50", 10) || 50, 0), 100);
  const [notifications, unread] = await Promise.all([
    limit === 0 ? [] : listNotifications({ userId: user.id, unreadOnly: q.get("unread") === "1", limit }),
    countUnreadNotifications({ userId: user.id }),
  ]);
  return NextResponse.json({ notifications, unread });
});
