import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { applyUnappliedPayment } from "@/lib/payments/reconcile";
import { applyUnappliedSchema } from "@/lib/payments/schemas";

/** "Apply as payment" `{ version }`: on its invoice where it fits what is owed, else 409 with why. */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const actor = await requireApiPermission("record-payment");
  const id = parseId((await params).id);
  const input = await parseJson(req, applyUnappliedSchema);
  return json(await applyUnappliedPayment(getDb(), id, input.version, actor.id));
});
