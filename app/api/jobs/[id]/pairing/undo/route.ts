import { getDb } from "@/db/client";
import { undoPairing } from "@/lib/workshop/pairing";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { pairingUndoSchema } from "@/lib/validation/workshop";

/**
 * Undoes the last pairing applied (one step back; 409 when `pairingId` is not the last pairing
 * or was already undone), recorded in the job's change history. Answers the new bench record.
 */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiPermission("weigh");
  const db = getDb();
  const job = await findJobForUser(db, parseId((await params).id), user);
  const { pairingId } = await parseJson(req, pairingUndoSchema);
  return json(await undoPairing(db, job, pairingId, user.id));
});
