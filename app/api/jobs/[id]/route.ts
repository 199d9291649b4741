import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { findJobForUser } from "@/lib/jobs/access";
import { updateJobSettings } from "@/lib/jobs/settings";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { jobChangesSchema } from "@/lib/validation/jobs";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-job");
  return json({ job: await findJobForUser(getDb(), parseId((await params).id), user) });
});

/** Answers the job as saved and `notices`: what the server changed beyond what was typed. */
export const PATCH = route<Params>(async (req, { params }) => {
  const actor = await requireApiPermission("edit-job");
  const job = await findJobForUser(getDb(), parseId((await params).id), actor);
  const changes = await parseJson(req, jobChangesSchema);
  return json(await updateJobSettings(getDb(), job, changes, actor));
});
