"use client";

import { useUnreadCount } from "@/lib/api-client/notifications";
import { BellLink } from "./notification-bell";

/** The bell with the live unread count (see notification-bell.tsx). */
export function LiveBell({ initialUnread }: { initialUnread: number }) {
  const { data: unread = initialUnread } = useUnreadCount(initialUnread);
  return <BellLink unread={unread} />;
}
