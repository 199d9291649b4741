"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db/client";
import type { ShopSettings } from "@/db/settings";
import { updateShopSettings } from "@/lib/settings/shop-settings";
import { checkPermission } from "@/lib/auth/guard";
import { type ActionResult, toActionFailure } from "@/lib/http/action-result";
import { settingsSchema } from "@/lib/validation/billing";

export async function saveSettingsAction(
  _prev: ActionResult<ShopSettings> | null,
  form: FormData,
): Promise<ActionResult<ShopSettings>> {
  const access = await checkPermission("manage-settings");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const values = Object.fromEntries(
      [...form].filter(([k, v]) => typeof v === "string" && !k.startsWith("$")),
    );
    const { version, ...input } = settingsSchema.parse(values);
    const settings = await updateShopSettings(getDb(), version, input, access.user.id);
    revalidatePath("/settings");
    return { ok: true, data: settings, message: "Shop settings saved." };
  } catch (error) {
    return toActionFailure(error);
  }
}
