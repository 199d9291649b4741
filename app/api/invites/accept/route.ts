import { getDb } from "@/db/client";
import { spendRateLimit } from "@/lib/auth/rate-limit";
import { json, parseJson, route } from "@/lib/http/route";
import { acceptInvite } from "@/lib/mail/invites";
import { acceptInviteSchema } from "@/lib/validation/invites";

// No session: the one-time token in the body is the proof. Rate-limited per address.
export const POST = route(async (req) => {
  await spendRateLimit("invite", req.headers);
  const input = await parseJson(req, acceptInviteSchema);
  const user = await acceptInvite(getDb(), input);
  return json({ user: { id: user.id, email: user.email, name: user.name, role: user.role } });
});
