import { getDb } from "@/db/client";
import { listPartWeights } from "@/db/weights";
import { requireApiPermission } from "@/lib/auth/guard";
import { csvResponse } from "@/lib/http/csv-response";
import { parseId, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { weightsToCsv } from "@/lib/workshop/csv";

/** The weigh-in as CSV, one row per reading, in the job's unit (named on every row). */
export const GET = route<{ id: string }>(async (_req, { params }) => {
  // The bench's working: shop staff only (a customer reads their job's own page instead).
  const user = await requireApiPermission("read-bench");
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  return csvResponse(
    weightsToCsv(await listPartWeights(getDb(), job.id), job.spec.massUnit),
    `weigh-in-${job.number}.csv`,
  );
});
