import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { weightWriteSchema } from "@/lib/validation/workshop";
import { saveWeighing } from "@/lib/workshop/save-weight";

/**
 * Saves one part's readings (machinist or owner); answers the saved weight (with its new
 * version) and the new plan worked out without the pairing search (`plan.pairingDeferred`; the
 * pairing comes with GET /api/jobs/:id/workshop), so a save stays cheap at the bench.
 * Zero is refused (422 on `readings`). Readings far from the rest of their kind are refused with
 * a 422 of code `outlier` until sent again with `confirmOutlier: true` (lib/workshop/save-weight.ts).
 */
export const PUT = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiPermission("weigh");
  const db = getDb();
  const job = await findJobForUser(db, parseId((await params).id), user);
  const input = await parseJson(req, weightWriteSchema);
  return json(await saveWeighing(db, job, input, user.id));
});
