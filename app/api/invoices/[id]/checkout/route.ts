import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, route } from "@/lib/http/route";
import { startCheckout } from "@/lib/payments/checkout";

/** Opens the provider's payment page for what is owed; answers `{ url, sessionId, amount, currency }`. */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiPermission("pay-invoice");
  const id = parseId((await params).id);
  return json(await startCheckout(getDb(), id, user, req.url), 201);
});
