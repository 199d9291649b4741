import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { sendBuildCard } from "@/lib/build-record/card";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { sendCardSchema } from "@/lib/validation/cards";

type Params = { id: string; revision: string };

/** E-mails one issued build record to the customer (or the address given). */
export const POST = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("send-card");
  const { id, revision } = await params;
  const job = await findJobForUser(getDb(), parseId(id), user);
  const number = parseId(revision);
  const input = await parseJson(req, sendCardSchema);
  return json(await sendBuildCard(getDb(), job, number, user, input));
});
