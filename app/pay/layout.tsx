import type { ReactNode } from "react";
import { AppHeader } from "@/components/shell/app-header";
import { requirePagePermission } from "@/lib/auth/guard";

// Where the payment page sends people back to; it reads the database, so never prerendered.
export const dynamic = "force-dynamic";

export default async function PayLayout({ children }: { children: ReactNode }) {
  const user = await requirePagePermission("use-app", "/invoices");
  return (
    <>
      <AppHeader user={user} />
      <main className="mx-auto max-w-3xl px-4 py-10">{children}</main>
    </>
  );
}
