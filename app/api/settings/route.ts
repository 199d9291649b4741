import { getDb } from "@/db/client";
import { findShopSettings } from "@/db/settings";
import { updateShopSettings } from "@/lib/settings/shop-settings";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { settingsSchema } from "@/lib/validation/billing";

export const GET = route(async () => {
  await requireApiPermission("read-shop-setup");
  return json({ settings: await findShopSettings(getDb()) });
});

export const PUT = route(async (req) => {
  const actor = await requireApiPermission("manage-settings");
  const { version, ...input } = await parseJson(req, settingsSchema);
  return json({ settings: await updateShopSettings(getDb(), version, input, actor.id) });
});
