import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { saveSection } from "@/lib/build-record/record";
import { BUILD_SECTIONS, sectionWriteSchema } from "@/lib/build-record/schemas";
import { HttpError } from "@/lib/http/errors";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";

type Params = { id: string; section: string };

/** Saves one section of the build record (with the version read; 0 when never saved). */
export const PUT = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("edit-build-record");
  const { id, section: raw } = await params;
  const section = BUILD_SECTIONS.find((s) => s === raw);
  if (!section) throw new HttpError(404, "not_found", "No such part of the build record.");
  const job = await findJobForUser(getDb(), parseId(id), user);
  const write = await parseJson(req, sectionWriteSchema(section));
  return json({ record: await saveSection(getDb(), job, section, write, user) });
});
