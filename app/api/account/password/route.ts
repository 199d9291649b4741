import { getDb } from "@/db/client";
import { changeOwnPassword } from "@/lib/auth/change-password";
import { requireApiPermission } from "@/lib/auth/guard";
import { changePasswordSchema } from "@/lib/auth/password-schema";
import { reissueSessionCookie } from "@/lib/auth/reissue-session";
import { json, parseJson, route } from "@/lib/http/route";

// Changes the signed-in person's password; their other sessions end, this one carries on.
export const POST = route(async (req) => {
  const user = await requireApiPermission("change-own-password");
  const input = await parseJson(req, changePasswordSchema);
  const version = await changeOwnPassword(getDb(), user, input);
  const keptSignedIn = await reissueSessionCookie(version);
  return json({ changed: true, keptSignedIn });
});
