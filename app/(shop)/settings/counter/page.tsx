import Link from "next/link";
import { CounterSettingsForm } from "@/components/customer/counter-settings-form";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { findShopSettings } from "@/db/settings";
import { requirePagePermission } from "@/lib/auth/guard";

export const metadata = { title: "E-mails and time zone" };

export default async function CounterSettingsPage() {
  await requirePagePermission("manage-settings", "/settings/counter");
  const [settings, shop] = await Promise.all([
    findCounterSettings(getDb()),
    findShopSettings(getDb()),
  ]);
  return (
    <section className="max-w-4xl space-y-4">
      <h1 className="text-2xl font-semibold">E-mails and time zone</h1>
      <p className="text-sm text-graphite-600">
        Who the shop&apos;s e-mails to customers come from, where their replies go, how they are
        signed and which ones go out; and the time zone the shop&apos;s dates are read in. Every
        message is kept in the outbox with how its sending went. Back to the{" "}
        <Link href="/settings" className="underline">
          shop settings
        </Link>
        .
      </p>
      <CounterSettingsForm initial={settings} shopName={shop.shopName} shopEmail={shop.email} />
    </section>
  );
}
