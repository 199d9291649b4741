import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { buildRecordFor } from "@/lib/build-record/record";
import { json, parseId, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";

type Params = { id: string };

/**
 * The job's build record, the shop's build settings and what the record works out to; for a
 * customer, null until the job is ready.
 */
export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-job");
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  return json(await buildRecordFor(getDb(), job, user));
});
