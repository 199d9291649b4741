import { getDb } from "@/db/client";
import { reassignPistonAssemblies } from "@/db/weights";
import { requireApiUser } from "@/lib/auth/guard";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { pairingApplySchema } from "@/lib/validation/workshop";
import { loadWorkshop } from "@/lib/workshop/load";

/** Applies a piston-to-rod pairing: the piston assemblies move to their new rods. */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiUser(["machinist", "owner"]);
  const db = getDb();
  const job = await findJobForUser(db, parseId((await params).id), user);
  const { assignment } = await parseJson(req, pairingApplySchema);
  await reassignPistonAssemblies(db, job.id, assignment, user.id);
  return json(await loadWorkshop(db, job));
});
