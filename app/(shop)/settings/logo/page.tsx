import Link from "next/link";
import { LogoForm } from "@/components/cards/logo-form";
import { findShopLogo } from "@/db/cards";
import { getDb } from "@/db/client";
import { requirePagePermission } from "@/lib/auth/guard";
import { describeLogo } from "@/lib/cards/logo";

export const metadata = { title: "Logo on balance cards" };

export default async function LogoSettingsPage() {
  await requirePagePermission("manage-settings", "/settings/logo");
  const logo = describeLogo(await findShopLogo(getDb()));
  return (
    <section className="max-w-3xl space-y-4">
      <h1 className="text-2xl font-semibold">Logo on balance cards</h1>
      <p className="text-sm text-graphite-600">
        Printed at the top of every balance card issued from now on, beside the shop&apos;s name and
        details from the{" "}
        <Link href="/settings" className="underline">
          shop settings
        </Link>
        . Cards already issued keep the logo they were issued with.
      </p>
      <LogoForm logo={logo} />
    </section>
  );
}
