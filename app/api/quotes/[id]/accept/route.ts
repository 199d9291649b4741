import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { acceptQuoteAs } from "@/lib/billing/quotes";
import { json, parseId, route } from "@/lib/http/route";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const user = await requireApiPermission("accept-quote");
  const id = parseId((await params).id);
  return json({ quote: await acceptQuoteAs(getDb(), id, user) });
});
