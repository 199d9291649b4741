import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { moveQuote } from "@/lib/billing/quotes";
import { json, parseId, route } from "@/lib/http/route";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const actor = await requireApiPermission("write-quotes");
  const id = parseId((await params).id);
  return json({ quote: await moveQuote(getDb(), id, "withdraw", actor.id) });
});
