import { getDb } from "@/db/client";
import { ALL_ROLES, requireApiUser } from "@/lib/auth/guard";
import { parseId, route } from "@/lib/http/route";
import { findUploadForUser } from "@/lib/uploads/access";
import { uploadFileResponse } from "@/lib/uploads/serve";

type Params = { id: string };

export const GET = route<Params>(async (req, { params }) => {
  const user = await requireApiUser(ALL_ROLES);
  const upload = await findUploadForUser(getDb(), parseId((await params).id), user);
  return uploadFileResponse(upload, {
    variant: "thumbnail",
    ifNoneMatch: req.headers.get("if-none-match"),
  });
});
