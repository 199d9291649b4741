import { getDb } from "@/db/client";
import { listInvoices } from "@/db/invoices";
import { requireApiPermission } from "@/lib/auth/guard";
import { createInvoice } from "@/lib/billing/invoices";
import { json, parseJson, route } from "@/lib/http/route";
import { customerScope } from "@/lib/jobs/access";
import { invoiceListQuerySchema, newInvoiceSchema } from "@/lib/validation/billing";

export const GET = route(async (req) => {
  const user = await requireApiPermission("list-invoices");
  const query = invoiceListQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const customerId = customerScope(user);
  const { invoices, total } = await listInvoices(getDb(), {
    customerId,
    excludeDrafts: customerId !== undefined,
    jobId: query.jobId,
    status: query.status,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return json({ invoices, total, page: query.page, pageSize: query.pageSize });
});

/** A draft invoice: `{ jobId, quoteId }` from an accepted quote, or `{ jobId, lines }`. */
export const POST = route(async (req) => {
  const actor = await requireApiPermission("write-invoices");
  const input = await parseJson(req, newInvoiceSchema);
  return json({ invoice: await createInvoice(getDb(), input, actor.id) }, 201);
});
