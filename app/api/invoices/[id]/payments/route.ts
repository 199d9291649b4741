import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { listPaymentsForUser } from "@/lib/billing/access";
import { takeCounterPayment } from "@/lib/billing/counter-payments";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { manualPaymentSchema } from "@/lib/validation/billing";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-invoice");
  return json({ payments: await listPaymentsForUser(getDb(), parseId((await params).id), user) });
});

/** Money taken at the counter: `{ method: "cash" | "bank-transfer" | "card-in-shop", amount, reference? }`. */
export const POST = route<Params>(async (req, { params }) => {
  const actor = await requireApiPermission("record-payment");
  const id = parseId((await params).id);
  const input = await parseJson(req, manualPaymentSchema);
  return json(await takeCounterPayment(getDb(), id, input, actor.id), 201);
});
