import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { inviteCustomer } from "@/lib/mail/invites";
import { newInviteSchema } from "@/lib/validation/invites";

export const POST = route(async (req) => {
  const actor = await requireApiPermission("manage-customers");
  const input = await parseJson(req, newInviteSchema);
  return json(await inviteCustomer(getDb(), input, actor), 201);
});
