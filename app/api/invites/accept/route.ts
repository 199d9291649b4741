import { getDb } from "@/db/client";
import { json, parseJson, route } from "@/lib/http/route";
import { acceptInvite } from "@/lib/mail/invites";
import { acceptInviteSchema } from "@/lib/validation/invites";

// No session: the one-time token in the body is the proof.
export const POST = route(async (req) => {
  const input = await parseJson(req, acceptInviteSchema);
  const user = await acceptInvite(getDb(), input);
  return json({ user: { id: user.id, email: user.email, name: user.name, role: user.role } });
});
