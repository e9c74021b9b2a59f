import { AppHeader } from "@/components/layout/app-header";
import { Providers } from "@/components/providers";
import { requireUser } from "@/lib/auth/guards";
import { OfflineProvider } from "@/lib/offline/offline-context";

export const dynamic = "force-dynamic";

export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const user = await requireUser();
  return (
    <Providers>
      <OfflineProvider owner={user.id}>
        <AppHeader user={user} />
        {children}
      </OfflineProvider>
    </Providers>
  );
}
