import Link from "next/link";
import { SettingsForm } from "@/components/billing/settings-form";
import { getDb } from "@/db/client";
import { findShopSettings } from "@/db/settings";
import { requirePagePermission } from "@/lib/auth/guard";

export const metadata = { title: "Shop settings" };

export default async function SettingsPage() {
  await requirePagePermission("manage-settings", "/settings");
  const settings = await findShopSettings(getDb());
  return (
    <section className="max-w-3xl space-y-4">
      <h1 className="text-2xl font-semibold">Shop settings</h1>
      <p className="text-sm text-graphite-600">
        Printed on quotes and invoices. A new tax rate applies to invoices issued from now on;
        invoices already issued keep the rate they were issued with. The oil allowance per rod is
        where every new job starts; each job can change its own.
      </p>
      <SettingsForm settings={settings} />
      <p className="text-sm">
        The shop&apos;s logo on balance cards:{" "}
        <Link href="/settings/logo" className="underline">
          upload or change the logo
        </Link>
        .
      </p>
      <p className="text-sm">
        Ring gap factors, coil-bind margin and the other figures the engine build record starts
        from:{" "}
        <Link href="/settings/build" className="underline">
          engine build settings
        </Link>
        .
      </p>
      <p className="text-sm">
        Who the shop&apos;s e-mails to customers come from, their signature, which ones go out, and
        the shop&apos;s time zone:{" "}
        <Link href="/settings/counter" className="underline">
          e-mails and time zone
        </Link>
        .
      </p>
    </section>
  );
}
