import { getDb } from "@/db/client";
import { requireApiUser } from "@/lib/auth/guard";
import { json, route } from "@/lib/http/route";
import { readOutbox } from "@/lib/mail/outbox";

export const GET = route(async () => {
  await requireApiUser(["owner"]);
  return json(await readOutbox(getDb()));
});
