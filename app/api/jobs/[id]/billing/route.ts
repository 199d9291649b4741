import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { loadJobBilling } from "@/lib/billing/job-billing";
import { json, parseId, route } from "@/lib/http/route";

/**
 * The job's quotes and invoices as this person may see them (a customer: their own job's, no
 * drafts, no withdrawn quotes), each with `allowedActions`, and the prices for new lines.
 */
export const GET = route<{ id: string }>(async (_req, { params }) => {
  const user = await requireApiPermission("read-billing");
  return json(await loadJobBilling(getDb(), parseId((await params).id), user));
});
