import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { holeRequestSchema } from "@/lib/validation/balance";
import { workOutHole } from "@/lib/workshop/hole-helpers";

/**
 * Drill depth for a mass, a heavy-metal plug's net mass, a correction moved or split. Drill
 * sizes come as written ("8.5", "3/8", "#21", "F"); a bare number is mm.
 */
export const POST = route(async (req) => {
  await requireApiPermission("use-calculators");
  return json(workOutHole(await parseJson(req, holeRequestSchema)));
});
