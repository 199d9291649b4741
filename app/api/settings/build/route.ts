import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { loadBuildSettings, saveSettings } from "@/lib/build-record/record";
import { buildSettingsWriteSchema } from "@/lib/build-record/settings-schema";
import { json, parseJson, route } from "@/lib/http/route";

/** The shop's build settings: ring gap factors, coil-bind margin, clearance window, cam lift. */
export const GET = route(async () => {
  await requireApiPermission("read-shop-setup");
  return json(await loadBuildSettings(getDb()));
});

/** Saves the shop's build settings (owner), with the version read (0 when never saved). */
export const PUT = route(async (req) => {
  const user = await requireApiPermission("manage-settings");
  const write = await parseJson(req, buildSettingsWriteSchema);
  return json(await saveSettings(getDb(), write, user));
});
