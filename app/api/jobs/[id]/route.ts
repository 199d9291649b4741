import { getDb } from "@/db/client";
import { updateJob } from "@/db/jobs";
import { ALL_ROLES, requireApiUser } from "@/lib/auth/guard";
import { findJobForUser } from "@/lib/jobs/access";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { jobChangesSchema } from "@/lib/validation/jobs";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiUser(ALL_ROLES);
  return json({ job: await findJobForUser(getDb(), parseId((await params).id), user) });
});

export const PATCH = route<Params>(async (req, { params }) => {
  const actor = await requireApiUser(["owner", "counter", "machinist"]);
  const id = parseId((await params).id);
  await findJobForUser(getDb(), id, actor);
  const { version, ...changes } = await parseJson(req, jobChangesSchema);
  return json({ job: await updateJob(getDb(), id, version, changes, actor.id) });
});
