import type { ReactNode } from "react";
import { Providers } from "@/components/providers";
import { AppHeader } from "@/components/shell/app-header";
import { requirePagePermission } from "@/lib/auth/guard";

// Every shop page depends on who is signed in: never prerendered.
export const dynamic = "force-dynamic";

export default async function ShopLayout({ children }: { children: ReactNode }) {
  const user = await requirePagePermission("use-app");
  return (
    <>
      <AppHeader user={user} />
      <main className="mx-auto max-w-7xl px-4 py-6">
        <Providers>{children}</Providers>
      </main>
    </>
  );
}
