import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { offerQuote } from "@/lib/billing/quotes";
import { json, parseId, route } from "@/lib/http/route";

/** Shows a draft quote to the customer; the service e-mails them through the outbox. */
export const POST = route<{ id: string }>(async (_req, { params }) => {
  const actor = await requireApiPermission("write-quotes");
  return json({ quote: await offerQuote(getDb(), parseId((await params).id), actor.id) });
});
