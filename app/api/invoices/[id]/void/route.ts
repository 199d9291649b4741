import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { voidInvoice } from "@/lib/billing/invoices";
import { json, parseId, route } from "@/lib/http/route";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const actor = await requireApiPermission("write-invoices");
  return json({ invoice: await voidInvoice(getDb(), parseId((await params).id), actor.id) });
});
