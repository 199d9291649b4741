import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { buildRequestNewSchema } from "@/lib/build-record/request-schemas";
import { addRequest, listRequests } from "@/lib/build-record/requests";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";

type Params = { id: string };

/** The customer's requests for the build, each open, done or explained. */
export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-job");
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  return json({ requests: await listRequests(getDb(), job) });
});

/** Writes a request down; it stays open until ticked done or explained. */
export const POST = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("add-build-request");
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  const input = await parseJson(req, buildRequestNewSchema);
  return json({ request: await addRequest(getDb(), job, input, user) }, 201);
});
