import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { sendCardByMail } from "@/lib/cards/send";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { sendCardSchema } from "@/lib/validation/cards";

type Params = { id: string; revision: string };

/**
 * E-mails the card to the customer (or `to`). 200 when the mail server accepted it; 502 with the
 * server's refusal when it did not (the message stays in the mail log as failed).
 */
export const POST = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("send-card");
  const { id, revision } = await params;
  const jobId = parseId(id);
  const rev = parseId(revision);
  const input = await parseJson(req, sendCardSchema);
  const result = await sendCardByMail(getDb(), jobId, rev, user, input);
  if (result.sent) return json(result);
  return json(
    {
      error: {
        code: "mail_failed",
        message: `The mail server did not take the message: ${result.mail.error ?? "no reason given"}`,
      },
      ...result,
    },
    502,
  );
});
