import { getDb } from "@/db/client";
import { verifyCardCode } from "@/lib/cards/verify";
import { json, route } from "@/lib/http/route";

/** Public: the key figures of the card with this code, current or superseded; 404 otherwise. */
export const GET = route<{ code: string }>(async (_req, { params }) => {
  return json({ card: await verifyCardCode(getDb(), (await params).code) });
});
