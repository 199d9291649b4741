import { getDb } from "@/db/client";
import { spendRateLimit } from "@/lib/auth/rate-limit";
import { verifyCardCode } from "@/lib/cards/verify";
import { json, route } from "@/lib/http/route";

/**
 * Public: the key figures of the card with this code, current or superseded; 404 otherwise.
 * Rate-limited per address (lib/auth/rate-limit.ts).
 */
export const GET = route<{ code: string }>(async (req, { params }) => {
  await spendRateLimit("verify", req.headers);
  return json({ card: await verifyCardCode(getDb(), (await params).code) });
});
