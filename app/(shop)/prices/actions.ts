"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db/client";
import type { PriceItem } from "@/db/prices";
import { checkPermission } from "@/lib/auth/guard";
import { createPriceItem, updatePriceItem } from "@/lib/billing/prices";
import { type ActionResult, toActionFailure } from "@/lib/http/action-result";
import { priceItemChangesSchema, priceItemSchema } from "@/lib/validation/billing";

function priceValues(form: FormData) {
  const text = (k: string) => {
    const v = form.get(k);
    return typeof v === "string" ? v : undefined;
  };
  return {
    code: text("code"),
    description: text("description"),
    kind: text("kind"),
    unitPrice: text("unitPrice"),
    unit: text("unit") || undefined,
    active: form.get("active") === "on" || form.get("active") === "true",
  };
}

export async function createPriceAction(
  _prev: ActionResult<PriceItem> | null,
  form: FormData,
): Promise<ActionResult<PriceItem>> {
  const access = await checkPermission("manage-prices");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const input = priceItemSchema.parse({ ...priceValues(form), active: true });
    const price = await createPriceItem(getDb(), input, access.user.id);
    revalidatePath("/prices");
    return { ok: true, data: price, message: `${price.code} added.` };
  } catch (error) {
    return toActionFailure(error);
  }
}

const idSchema = z.object({
  id: z.coerce.number().int().positive(),
  version: z.coerce.number().int().positive(),
});

export async function updatePriceAction(
  _prev: ActionResult<PriceItem> | null,
  form: FormData,
): Promise<ActionResult<PriceItem>> {
  const access = await checkPermission("manage-prices");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const { id, version } = idSchema.parse({ id: form.get("id"), version: form.get("version") });
    const { version: _v, ...changes } = priceItemChangesSchema.parse({
      ...priceValues(form),
      version,
    });
    const price = await updatePriceItem(getDb(), id, version, changes, access.user.id);
    revalidatePath("/prices");
    return { ok: true, data: price, message: `${price.code} saved.` };
  } catch (error) {
    return toActionFailure(error);
  }
}
