import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { updateCounterSettings } from "@/lib/settings/counter-settings";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { counterSettingsSchema } from "@/lib/validation/counter-settings";

/** How the shop's e-mails go out (sender, reply-to, signature, messages on or off) and its time zone. */
export const GET = route(async () => {
  await requireApiPermission("read-shop-setup");
  return json({ settings: await findCounterSettings(getDb()) });
});

/** Saves them (owner), over the version read (0 when never saved); a stale version is 409. */
export const PUT = route(async (req) => {
  const user = await requireApiPermission("manage-settings");
  const { version, ...input } = await parseJson(req, counterSettingsSchema);
  return json({ settings: await updateCounterSettings(getDb(), version, input, user.id) });
});
