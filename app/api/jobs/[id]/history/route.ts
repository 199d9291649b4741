import { listJobChangesPage } from "@/db/audit";
import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { jobHistoryQuerySchema } from "@/lib/validation/jobs";

/** The job's changes, newest first, a page at a time: `?before=<earlier>` for the next page. */
export const GET = route<{ id: string }>(async (req, { params }) => {
  // Shop staff only, as on the job page (a customer's page has no change list).
  const user = await requireApiPermission("read-bench");
  const { before } = jobHistoryQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  return json(await listJobChangesPage(getDb(), job.id, before));
});
