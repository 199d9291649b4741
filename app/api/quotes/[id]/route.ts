import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { loadQuoteView } from "@/lib/billing/job-billing";
import { replaceQuoteLines } from "@/lib/billing/quotes";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { documentLinesSchema } from "@/lib/validation/billing";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-quote");
  // With `allowedActions`: what this person may do to it now (lib/billing/actions.ts).
  return json({ quote: await loadQuoteView(getDb(), parseId((await params).id), user) });
});

/** Replaces a draft quote's lines: `{ version, lines: [{ priceItemId | lineId, quantity, description? }] }`. */
export const PUT = route<Params>(async (req, { params }) => {
  const actor = await requireApiPermission("write-quotes");
  const id = parseId((await params).id);
  const { version, lines } = await parseJson(req, documentLinesSchema);
  return json({ quote: await replaceQuoteLines(getDb(), id, version, lines, actor.id) });
});
