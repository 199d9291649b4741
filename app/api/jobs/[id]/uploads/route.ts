import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, route } from "@/lib/http/route";
import { findJobForUser } from "@/lib/jobs/access";
import { uploadLimitBytes } from "@/lib/uploads/limits";
import { FORM_OVERHEAD_BYTES, readUploadForm } from "@/lib/uploads/read-form";
import { listJobUploads, saveJobUpload } from "@/lib/uploads/save";
import { uploadFormSchema } from "@/lib/validation/uploads";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  const user = await requireApiPermission("read-job");
  const jobId = parseId((await params).id);
  return json({ uploads: await listJobUploads(getDb(), jobId, user) });
});

const UPLOAD = {
  accepts: "multipart",
  maxBytes: () => uploadLimitBytes() + FORM_OVERHEAD_BYTES,
} as const;

/** multipart/form-data: `file`, `category` (arrival-photo | balancer-printout | other), `caption`. */
export const POST = route<Params>(UPLOAD, async (req, { params }) => {
  const actor = await requireApiPermission("manage-uploads");
  const jobId = parseId((await params).id);
  // Here, not in saveJobUpload: a job they may not see is refused before the body is read.
  await findJobForUser(getDb(), jobId, actor);
  const maxBytes = uploadLimitBytes();
  const form = await readUploadForm(req, maxBytes);
  const input = uploadFormSchema.parse(Object.fromEntries(form));
  return json({ upload: await saveJobUpload(getDb(), jobId, input, actor, { maxBytes }) }, 201);
});
