import { AppHeader } from "@/components/layout/app-header";
import { Providers } from "@/components/providers";
import { requireUser } from "@/lib/auth/guards";

export const dynamic = "force-dynamic";

export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const user = await requireUser();
  return (
    <Providers>
      <AppHeader user={user} />
      {children}
    </Providers>
  );
}
