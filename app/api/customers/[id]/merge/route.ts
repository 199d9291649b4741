import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { mergeCustomers } from "@/lib/customers/merge";
import { mergeCustomerSchema } from "@/lib/customers/merge-schema";
import { json, parseId, parseJson, route } from "@/lib/http/route";

type Params = { id: string };

/** Merges the customer in the body into this one (kept); counter and owner only. */
export const POST = route<Params>(async (req, { params }) => {
  const actor = await requireApiPermission("manage-customers");
  const keepId = parseId((await params).id);
  const { removeId } = await parseJson(req, mergeCustomerSchema);
  return json(await mergeCustomers(getDb(), keepId, removeId, actor.id));
});
