import { getDb } from "@/db/client";
import { listUsers } from "@/db/users";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { addUser } from "@/lib/users/manage";
import { newUserSchema } from "@/lib/validation/users";

export const GET = route(async () => {
  await requireApiPermission("manage-users");
  return json({ users: await listUsers(getDb()) });
});

export const POST = route(async (req) => {
  const actor = await requireApiPermission("manage-users");
  const input = await parseJson(req, newUserSchema);
  return json({ user: await addUser(getDb(), input, actor) }, 201);
});
