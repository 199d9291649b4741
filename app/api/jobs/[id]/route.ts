import { getDb } from "@/db/client";
import { updateJob } from "@/db/jobs";
import { ALL_ROLES, requireApiUser } from "@/lib/auth/guard";
import { findJobForUser } from "@/lib/jobs/access";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { COUNTER_SPEC_FIELDS, jobChangesSchema } from "@/lib/validation/jobs";
import { specMismatch } from "@/lib/validation/workshop";
import { HttpError } from "@/lib/http/errors";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiUser(ALL_ROLES);
  return json({ job: await findJobForUser(getDb(), parseId((await params).id), user) });
});

export const PATCH = route<Params>(async (req, { params }) => {
  const actor = await requireApiUser(["owner", "counter", "machinist"]);
  const id = parseId((await params).id);
  const job = await findJobForUser(getDb(), id, actor);
  const { version, ...changes } = await parseJson(req, jobChangesSchema);
  const machinistOnly = Object.keys(changes.spec ?? {}).filter(
    (k) => !(COUNTER_SPEC_FIELDS as readonly string[]).includes(k),
  );
  if (actor.role === "counter" && machinistOnly.length > 0) {
    throw new HttpError(
      403,
      "forbidden",
      "Balancing settings are the machinist's.",
      Object.fromEntries(machinistOnly.map((k) => [`spec.${k}`, "The machinist sets this."])),
    );
  }
  const mismatch = specMismatch({ ...job.spec, ...changes.spec });
  if (mismatch) throw new HttpError(422, "invalid_input", Object.values(mismatch)[0]!, mismatch);
  return json({ job: await updateJob(getDb(), id, version, changes, actor.id) });
});
