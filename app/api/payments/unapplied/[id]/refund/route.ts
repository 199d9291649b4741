import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { markUnappliedPaymentRefunded } from "@/lib/payments/reconcile";
import { refundUnappliedSchema } from "@/lib/payments/schemas";

/** "Mark refunded" `{ version, note }`: the money went back to the payer at the payment service. */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const actor = await requireApiPermission("record-payment");
  const id = parseId((await params).id);
  const input = await parseJson(req, refundUnappliedSchema);
  return json({ item: await markUnappliedPaymentRefunded(getDb(), id, input, actor.id) });
});
