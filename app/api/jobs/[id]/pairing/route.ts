import { getDb } from "@/db/client";
import { applyPairing } from "@/lib/workshop/pairing";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { pairingApplySchema } from "@/lib/validation/workshop";

/**
 * Applies a piston-to-rod pairing: the piston assemblies move to their new rods, recorded in
 * the job's change history (undo with POST …/pairing/undo). Answers the new bench record.
 */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiPermission("weigh");
  const db = getDb();
  const job = await findJobForUser(db, parseId((await params).id), user);
  const { assignment, lastPairingId } = await parseJson(req, pairingApplySchema);
  return json(await applyPairing(db, job, assignment, user.id, lastPairingId));
});
