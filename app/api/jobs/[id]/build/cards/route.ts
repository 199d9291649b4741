import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { issueBuildCard, listJobBuildCards } from "@/lib/build-record/card";
import { json, parseId, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";

type Params = { id: string };

/** The job's issued build records, newest first (a customer sees their own job's). */
export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-job");
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  return json({ cards: await listJobBuildCards(getDb(), job) });
});

/** Issues the next revision of the build record PDF (no body). */
export const POST = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("issue-card");
  const job = await findJobForUser(getDb(), parseId((await params).id), user);
  return json({ card: await issueBuildCard(getDb(), job, user) }, 201);
});
