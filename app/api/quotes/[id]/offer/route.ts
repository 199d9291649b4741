import { tellQuoteOffered } from "@/lib/mail/events";
import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { moveQuote } from "@/lib/billing/quotes";
import { json, parseId, route } from "@/lib/http/route";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const actor = await requireApiPermission("write-quotes");
  const id = parseId((await params).id);
  const quote = await moveQuote(getDb(), id, "offer", actor.id);
  await tellQuoteOffered(getDb(), quote, actor.id); // through the outbox; never throws
  return json({ quote });
});
