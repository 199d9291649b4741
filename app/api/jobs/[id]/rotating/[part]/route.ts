import { getDb } from "@/db/client";
import { saveRotatingRecord } from "@/lib/workshop/save-rotating-record";
import { requireApiPermission } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/errors";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { rotatingPartField, rotatingWriteSchema } from "@/lib/validation/workshop";

type Params = { id: string; part: string };

/** Records the crank, flywheel, clutch cover or damper on the balancer. */
export const PUT = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("weigh");
  const { id, part: rawPart } = await params;
  const part = rotatingPartField.safeParse(rawPart);
  if (!part.success) throw new HttpError(404, "not_found", "No such rotating part.");
  const db = getDb();
  const job = await findJobForUser(db, parseId(id), user);
  const { data, version } = await parseJson(req, rotatingWriteSchema);
  return json({
    record: await saveRotatingRecord(
      db,
      { jobId: job.id, part: part.data, data, baseVersion: version },
      user.id,
    ),
  });
});
