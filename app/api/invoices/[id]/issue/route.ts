import { tellInvoiceIssued } from "@/lib/mail/events";
import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { issueInvoice } from "@/lib/billing/invoices";
import { json, parseId, route } from "@/lib/http/route";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const actor = await requireApiPermission("write-invoices");
  const invoice = await issueInvoice(getDb(), parseId((await params).id), actor.id);
  await tellInvoiceIssued(getDb(), invoice, actor.id); // through the outbox; never throws
  return json({ invoice });
});
