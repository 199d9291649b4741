import { computeBalance } from "@/lib/balance";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { balanceRequestSchema } from "@/lib/validation/balance";

/** Runs the balance engine on a set of weights: matching, removal and bobweights. */
export const POST = route(async (req) => {
  await requireApiPermission("use-calculators");
  return json(computeBalance(await parseJson(req, balanceRequestSchema)));
});
