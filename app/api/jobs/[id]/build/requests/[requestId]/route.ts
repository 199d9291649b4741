import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { buildRequestStateSchema } from "@/lib/build-record/request-schemas";
import { changeRequest } from "@/lib/build-record/requests";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";

type Params = { id: string; requestId: string };

/** Ticks a request done, explains why it was not done, or opens it again (with the version read). */
export const PATCH = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("edit-build-record");
  const { id, requestId } = await params;
  const job = await findJobForUser(getDb(), parseId(id), user);
  const requestNumber = parseId(requestId);
  const change = await parseJson(req, buildRequestStateSchema);
  return json({ request: await changeRequest(getDb(), job, requestNumber, change, user) });
});
