import Link from "next/link";
import { PendingChanges } from "@/components/offline/sync-status";
import type { SessionUser } from "@/db/queries/users";
import { NotificationBell } from "./notification-bell";
import { SignOutButton } from "./sign-out-button";
import { UnitSwitch } from "./unit-switch";
import { Wordmark } from "./wordmark";

export function AppHeader({ user, unread }: { user: SessionUser; unread: number }) {
  return (
    <header className="bg-ink text-white">
      <div className="mx-auto flex max-w-7xl flex-wrap items-center justify-between gap-3 px-gutter py-2">
        <Link href="/projects" className="flex min-h-touch items-center" aria-label="Airtally: your projects">
          <Wordmark />
        </Link>
        <nav aria-label="Main" className="flex items-center gap-1">
          <Link href="/projects" className="flex min-h-touch items-center rounded-card px-3 font-semibold hover:bg-ink-soft">
            Projects
          </Link>
          <Link href="/instruments" className="flex min-h-touch items-center rounded-card px-3 font-semibold hover:bg-ink-soft">
            Instruments
          </Link>
          {user.isAdmin && (
            <Link href="/admin/outbox" className="flex min-h-touch items-center rounded-card px-3 font-semibold hover:bg-ink-soft">
              Outbox
            </Link>
          )}
          <NotificationBell initialUnread={unread} />
        </nav>
        <PendingChanges />
        <div className="flex flex-wrap items-center gap-3">
          <UnitSwitch current={user.unitSystem} />
          <span className="text-sm text-paper-sunk">
            {user.name}
            {user.isAdmin && <span className="ml-2 rounded-full border border-paper-sunk px-2 py-0.5 text-xs">Site administrator</span>}
          </span>
          <SignOutButton />
        </div>
      </div>
    </header>
  );
}
