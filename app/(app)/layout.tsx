import { AppHeader } from "@/components/layout/app-header";
import { Providers } from "@/components/providers";
import { countUnreadNotifications } from "@/db/queries/notifications";
import { requireUser } from "@/lib/auth/guards";
import { OfflineProvider } from "@/lib/offline/offline-context";

export const dynamic = "force-dynamic";

export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const user = await requireUser();
  const unread = await countUnreadNotifications({ userId: user.id });
  return (
    <Providers>
      <OfflineProvider owner={user.id}>
        <AppHeader user={user} unread={unread} />
        {children}
      </OfflineProvider>
    </Providers>
  );
}
