import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { loadInvoiceView } from "@/lib/billing/job-billing";
import { deleteDraftInvoice, replaceInvoiceLines } from "@/lib/billing/invoices";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { documentLinesSchema } from "@/lib/validation/billing";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-invoice");
  // With its payments and `allowedActions`: what this person may do to it now.
  return json({ invoice: await loadInvoiceView(getDb(), parseId((await params).id), user) });
});

/** Replaces a draft invoice's lines: `{ version, lines }` as for quotes. */
export const PUT = route<Params>(async (req, { params }) => {
  const actor = await requireApiPermission("write-invoices");
  const id = parseId((await params).id);
  const { version, lines } = await parseJson(req, documentLinesSchema);
  return json({ invoice: await replaceInvoiceLines(getDb(), id, version, lines, actor.id) });
});

/** Only a draft can be thrown away; an issued invoice is voided instead. */
export const DELETE = route<Params>(async (_req, { params }) => {
  const actor = await requireApiPermission("write-invoices");
  await deleteDraftInvoice(getDb(), parseId((await params).id), actor.id);
  return new Response(null, { status: 204 });
});
