import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { parseId, route } from "@/lib/http/route";
import { findUploadForUser } from "@/lib/uploads/access";
import { uploadFileResponse } from "@/lib/uploads/serve";

type Params = { id: string };

export const GET = route<Params>(async (req, { params }) => {
  const user = await requireApiPermission("read-upload");
  const upload = await findUploadForUser(getDb(), parseId((await params).id), user);
  return uploadFileResponse(upload, {
    variant: "thumbnail",
    ifNoneMatch: req.headers.get("if-none-match"),
  });
});
