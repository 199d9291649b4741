import { getDb } from "@/db/client";
import { findCustomerById } from "@/db/customers";
import { updateCustomer } from "@/lib/customers/manage";
import { requireApiPermission } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/errors";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { customerSchema } from "@/lib/validation/customers";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  await requireApiPermission("read-customers");
  const customer = await findCustomerById(getDb(), parseId((await params).id));
  if (!customer) throw new HttpError(404, "not_found", "No such customer.");
  return json({ customer });
});

export const PATCH = route<Params>(async (req, { params }) => {
  const actor = await requireApiPermission("manage-customers");
  const id = parseId((await params).id);
  const input = await parseJson(req, customerSchema);
  return json({ customer: await updateCustomer(getDb(), id, input, actor.id) });
});
