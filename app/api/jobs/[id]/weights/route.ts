import { getDb } from "@/db/client";
import { savePartWeight } from "@/db/weights";
import { requireApiUser } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/errors";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { weightWriteSchema } from "@/lib/validation/workshop";
import { loadWorkshop } from "@/lib/workshop/load";

/** Saves one part's readings (machinist or owner); answers the saved weight and the new plan. */
export const PUT = route<{ id: string }>(async (req, { params }) => {
  const user = await requireApiUser(["machinist", "owner"]);
  const db = getDb();
  const job = await findJobForUser(db, parseId((await params).id), user);
  const { version, ...write } = await parseJson(req, weightWriteSchema);
  if (write.cylinder > (job.spec.cylinders ?? 0)) {
    throw new HttpError(422, "invalid_input", "This engine has no such cylinder.", {
      cylinder: "This engine has no such cylinder.",
    });
  }
  const weight = await savePartWeight(
    db,
    { ...write, jobId: job.id, baseVersion: version },
    user.id,
  );
  return json({ weight, plan: (await loadWorkshop(db, job)).plan });
});
