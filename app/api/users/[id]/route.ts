import { getDb } from "@/db/client";
import { findUserById } from "@/db/users";
import { requireApiPermission } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/errors";
import { json, parseId, parseJson, route } from "@/lib/http/route";
import { changeUser } from "@/lib/users/manage";
import { userChangesSchema } from "@/lib/validation/users";

type Params = { id: string };

export const GET = route<Params>(async (_req, { params }) => {
  await requireApiPermission("manage-users");
  const user = await findUserById(getDb(), parseId((await params).id));
  if (!user) throw new HttpError(404, "not_found", "No such user.");
  return json({ user });
});

export const PATCH = route<Params>(async (req, { params }) => {
  const actor = await requireApiPermission("manage-users");
  const id = parseId((await params).id);
  const changes = await parseJson(req, userChangesSchema);
  return json({ user: await changeUser(getDb(), id, changes, actor) });
});
