import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { loadWorkshop } from "@/lib/workshop/load";

/** The job with its weights, targets, rotating-part records and the worked-out plan. */
export const GET = route<{ id: string }>(async (_req, { params }) => {
  // The bench's working: shop staff only (a customer reads their job's own page instead).
  const user = await requireApiPermission("read-bench");
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  return json(await loadWorkshop(getDb(), job));
});
