import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { listQuotesForUser } from "@/lib/billing/access";
import { createQuote } from "@/lib/billing/quotes";
import { json, parseJson, route } from "@/lib/http/route";
import { jobIdQuerySchema, newQuoteSchema } from "@/lib/validation/billing";

export const GET = route(async (req) => {
  const user = await requireApiPermission("list-quotes");
  const { jobId } = jobIdQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  return json({ quotes: await listQuotesForUser(getDb(), jobId, user) });
});

export const POST = route(async (req) => {
  const actor = await requireApiPermission("write-quotes");
  const input = await parseJson(req, newQuoteSchema);
  return json({ quote: await createQuote(getDb(), input, actor.id) }, 201);
});
