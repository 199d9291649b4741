import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { csvResponse } from "@/lib/http/csv-response";
import { parseId, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { planToCsv } from "@/lib/workshop/csv";
import { loadWorkshop } from "@/lib/workshop/load";

/** The removal plan as CSV, one row per part. */
export const GET = route<{ id: string }>(async (_req, { params }) => {
  // The bench's working: shop staff only (a customer reads their job's own page instead).
  const user = await requireApiPermission("read-bench");
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  const { plan } = await loadWorkshop(getDb(), job);
  return csvResponse(planToCsv(plan, job), `removal-plan-${job.number}.csv`);
});
