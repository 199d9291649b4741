import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { weightsImportSchema } from "@/lib/validation/workshop";
import { importWeightsCsv } from "@/lib/workshop/import-weights";

/** Preview a CSV of weights ({ confirm: false }), then write its clean rows ({ confirm: true }). */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiPermission("weigh");
  const db = getDb();
  const job = await findJobForUser(db, parseId((await params).id), user);
  return json(await importWeightsCsv(db, job, await parseJson(req, weightsImportSchema), user.id));
});
