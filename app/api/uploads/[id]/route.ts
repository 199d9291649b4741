import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseId, route } from "@/lib/http/route";
import { findUploadForUser } from "@/lib/uploads/access";
import { removeJobUpload } from "@/lib/uploads/save";
import { uploadFileResponse } from "@/lib/uploads/serve";
import { uploadReadQuerySchema } from "@/lib/validation/uploads";

type Params = { id: string };

export const GET = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("read-upload");
  const id = parseId((await params).id);
  const { download } = uploadReadQuerySchema.parse(
    Object.fromEntries(new URL(req.url).searchParams),
  );
  const upload = await findUploadForUser(getDb(), id, user);
  return uploadFileResponse(upload, {
    variant: "original",
    download,
    ifNoneMatch: req.headers.get("if-none-match"),
  });
});

export const DELETE = route<Params>(async (_req, { params }) => {
  const actor = await requireApiPermission("manage-uploads");
  const id = parseId((await params).id);
  return json({ upload: await removeJobUpload(getDb(), id, actor) });
});
