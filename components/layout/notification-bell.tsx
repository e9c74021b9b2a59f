"use client";

import Link from "next/link";
import { useUnreadCount } from "@/lib/api-client/notifications";

/** The header's way to the inbox: a bell, the word, and the unread count in words and figures. */
export function NotificationBell({ initialUnread }: { initialUnread: number }) {
  const { data: unread = initialUnread } = useUnreadCount(initialUnread);
  return (
    <Link href="/notifications" className="flex min-h-touch items-center gap-2 rounded-card px-3 font-semibold hover:bg-ink-soft" aria-label={unread > 0 ? `Notifications: ${unread} unread` : "Notifications: none unread"}>
      <svg viewBox="0 0 24 24" width="20" height="20" aria-hidden="true">
        <path d="M6 16V11a6 6 0 0112 0v5l2 2H4l2-2zM10 20a2 2 0 004 0" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinejoin="round" />
      </svg>
      <span>Notifications</span>
      {unread > 0 && <span className="num rounded-full bg-paper px-2 py-0.5 text-sm font-bold text-ink">{unread > 99 ? "99+" : unread} new</span>}
    </Link>
  );
}
