import { getDb } from "@/db/client";
import { savePartTarget } from "@/lib/workshop/save-target";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { targetWriteSchema } from "@/lib/validation/workshop";

/**
 * Sets the target for one kind of part, or clears it back to the lightest (null). Answers the
 * target as saved and the job's plan worked out with it.
 */
export const PUT = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiPermission("weigh");
  const db = getDb();
  const job = await findJobForUser(db, parseId((await params).id), user);
  const { version, ...write } = await parseJson(req, targetWriteSchema);
  return json(await savePartTarget(db, { ...write, jobId: job.id, baseVersion: version }, user.id));
});
