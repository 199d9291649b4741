import Link from "next/link";
import { BuildSettingsForm } from "@/components/build/build-settings-form";
import { getDb } from "@/db/client";
import { requirePagePermission } from "@/lib/auth/guard";
import { loadBuildSettings } from "@/lib/build-record/record";

export const metadata = { title: "Engine build settings" };

export default async function BuildSettingsPage() {
  await requirePagePermission("manage-settings", "/settings/build");
  const { settings, version } = await loadBuildSettings(getDb());
  return (
    <section className="max-w-4xl space-y-4">
      <h1 className="text-2xl font-semibold">Engine build settings</h1>
      <p className="text-sm text-graphite-600">
        What the build record on each job starts from. Ring gap factors come from the ring
        maker&apos;s instructions for each ring set, ring and use: copy them here, and check them
        against the instructions in the box. The clearance per inch of journal is a guide used only
        where the engine maker&apos;s clearances are not entered on the job. Back to the{" "}
        <Link href="/settings" className="underline">
          shop settings
        </Link>
        .
      </p>
      <BuildSettingsForm initial={settings} version={version} />
    </section>
  );
}
