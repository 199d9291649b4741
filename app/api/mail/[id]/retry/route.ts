import { getDb } from "@/db/client";
import { requireApiUser } from "@/lib/auth/guard";
import { json, parseId, route } from "@/lib/http/route";
import { retryMail } from "@/lib/mail/send";

type Params = { id: string };

export const POST = route<Params>(async (_req, { params }) => {
  await requireApiUser(["owner"]);
  return json({ mail: await retryMail(getDb(), parseId((await params).id)) });
});
