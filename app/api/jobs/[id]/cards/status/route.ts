import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { findCardStatus } from "@/lib/cards/status";
import { json, parseId, route } from "@/lib/http/route";

/** Whether the current balance card still matches the job, and what changed (shop staff). */
export const GET = route<{ id: string }>(async (_req, { params }) => {
  const user = await requireApiPermission("read-bench");
  const jobId = parseId((await params).id);
  return json({ status: await findCardStatus(getDb(), jobId, user) });
});
