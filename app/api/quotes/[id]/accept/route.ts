import { getDb } from "@/db/client";
import { requireApiUser } from "@/lib/auth/guard";
import { acceptQuoteAs } from "@/lib/billing/quotes";
import { json, parseId, route } from "@/lib/http/route";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const user = await requireApiUser(["owner", "counter", "customer"]);
  const id = parseId((await params).id);
  return json({ quote: await acceptQuoteAs(getDb(), id, user) });
});
