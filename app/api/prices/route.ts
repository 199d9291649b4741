import { getDb } from "@/db/client";
import { listPriceItems } from "@/db/prices";
import { requireApiPermission } from "@/lib/auth/guard";
import { createPriceItem } from "@/lib/billing/prices";
import { json, parseJson, route } from "@/lib/http/route";
import { priceItemSchema } from "@/lib/validation/billing";

export const GET = route(async (req) => {
  await requireApiPermission("read-shop-setup");
  const activeOnly = new URL(req.url).searchParams.get("active") === "1";
  return json({ prices: await listPriceItems(getDb(), { activeOnly }) });
});

export const POST = route(async (req) => {
  const actor = await requireApiPermission("manage-prices");
  const input = await parseJson(req, priceItemSchema);
  return json({ price: await createPriceItem(getDb(), input, actor.id) }, 201);
});
