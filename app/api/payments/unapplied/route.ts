import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, route } from "@/lib/http/route";
import { listPaymentsToReconcile } from "@/lib/payments/reconcile";
import { unappliedListQuerySchema } from "@/lib/payments/schemas";

/** Online payments received and not applied (open ones unless `?status=` says otherwise). */
export const GET = route(async (req) => {
  await requireApiPermission("record-payment");
  const query = unappliedListQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  return json({ payments: await listPaymentsToReconcile(getDb(), query) });
});
