"use client";

/**
 * The header's way to the inbox: a bell, the word, and the unread count in words and figures. The
 * count the server rendered stands until the live count (components/layout/notification-bell-live.tsx,
 * refreshed every minute and when the inbox is read) arrives after the page is up: keeping its query
 * machinery out of every page's first load. Without network before that part was ever fetched, the
 * server's count stays.
 */
import Link from "next/link";
import { Component, lazy, Suspense, useSyncExternalStore, type ReactNode } from "react";

const LiveBell = lazy(() => import("./notification-bell-live").then((m) => ({ default: m.LiveBell })));
const noop = () => () => {};

export function NotificationBell({ initialUnread }: { initialUnread: number }) {
  const mounted = useSyncExternalStore(noop, () => true, () => false);
  const still = <BellLink unread={initialUnread} />;
  if (!mounted) return still;
  return (
    <StillOnError still={still}>
      <Suspense fallback={still}>
        <LiveBell initialUnread={initialUnread} />
      </Suspense>
    </StillOnError>
  );
}

export function BellLink({ unread }: { unread: number }) {
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

class StillOnError extends Component<{ still: ReactNode; children: ReactNode }, { failed: boolean }> {
  state = { failed: false };

  static getDerivedStateFromError(): { failed: boolean } {
    return { failed: true };
  }

  render() {
    return this.state.failed ? this.props.still : this.props.children;
  }
}
