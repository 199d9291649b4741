import { getDb } from "@/db/client";
import { findPriceItemById } from "@/db/prices";
import { requireApiPermission } from "@/lib/auth/guard";
import { updatePriceItem } from "@/lib/billing/prices";
import { HttpError } from "@/lib/http/errors";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { priceItemChangesSchema } from "@/lib/validation/billing";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  await requireApiPermission("read-shop-setup");
  const price = await findPriceItemById(getDb(), parseId((await params).id));
  if (!price) throw new HttpError(404, "not_found", "No such price.");
  return json({ price });
});

export const PATCH = route<Params>(async (req, { params }) => {
  const actor = await requireApiPermission("manage-prices");
  const id = parseId((await params).id);
  const { version, ...changes } = await parseJson(req, priceItemChangesSchema);
  return json({ price: await updatePriceItem(getDb(), id, version, changes, actor.id) });
});
