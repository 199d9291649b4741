import { getDb } from "@/db/client";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, route } from "@/lib/http/route";
import { readOutbox } from "@/lib/mail/outbox";

export const GET = route(async () => {
  await requireApiPermission("manage-mail");
  return json(await readOutbox(getDb()));
});
