import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, route } from "@/lib/http/route";
import { retryMail } from "@/lib/mail/send";

type Params = { id: string };

export const POST = route<Params>(async (_req, { params }) => {
  await requireApiPermission("manage-mail");
  const mail = await retryMail(getDb(), parseId((await params).id));
  // Not accepted by the mail server: the same answer the card's send route gives.
  return json({ mail }, mail.status === "sent" ? 200 : 502);
});
