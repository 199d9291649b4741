import { getDb } from "@/db/client";
import { requireApiUser } from "@/lib/auth/guard";
import { moveQuote } from "@/lib/billing/quotes";
import { json, parseId, route } from "@/lib/http/route";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const actor = await requireApiUser(["owner", "counter"]);
  const id = parseId((await params).id);
  return json({ quote: await moveQuote(getDb(), id, "withdraw", actor.id) });
});
