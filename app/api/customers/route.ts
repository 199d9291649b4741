import { getDb } from "@/db/client";
import { listCustomers } from "@/db/customers";
import { createCustomer } from "@/lib/customers/manage";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { customerSchema, listQuerySchema } from "@/lib/validation/customers";

export const GET = route(async (req) => {
  await requireApiPermission("read-customers");
  const query = listQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const { customers, total } = await listCustomers(getDb(), {
    search: query.search,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return json({ customers, total, page: query.page, pageSize: query.pageSize });
});

export const POST = route(async (req) => {
  const actor = await requireApiPermission("manage-customers");
  const input = await parseJson(req, customerSchema);
  return json({ customer: await createCustomer(getDb(), input, actor.id) }, 201);
});
