import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { issueInvoiceToCustomer } from "@/lib/billing/invoices";
import { json, parseId, route } from "@/lib/http/route";

/** Numbers and issues a draft; the service e-mails the customer through the outbox. */
export const POST = route<{ id: string }>(async (_req, { params }) => {
  const actor = await requireApiPermission("write-invoices");
  const id = parseId((await params).id);
  return json({ invoice: await issueInvoiceToCustomer(getDb(), id, actor.id) });
});
