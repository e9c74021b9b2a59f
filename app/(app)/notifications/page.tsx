import type { Metadata } from "next";
import { NotificationList } from "@/components/notifications/notification-list";
import { countUnreadNotifications, listNotifications } from "@/db/queries/notifications";
import { requireUser } from "@/lib/auth/guards";

export const metadata: Metadata = { title: "Notifications" };

export default async function NotificationsPage() {
  const user = await requireUser();
  const [notifications, unread] = await Promise.all([listNotifications({ userId: user.id, limit: 100 }), countUnreadNotifications({ userId: user.id })]);
  return (
    <main className="mx-auto grid max-w-4xl gap-gutter px-gutter py-6">
      <h1>Notifications</h1>
      <NotificationList initial={{ notifications: notifications.map((n) => ({ ...n, readAt: n.readAt?.toISOString() ?? null, createdAt: n.createdAt.toISOString() })), unread }} />
    </main>
  );
}
