import { drillDepthForMass, moveCorrection, plugNetMass, splitCorrection } from "@/lib/balance";
import { ALL_ROLES, requireApiUser } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { holeRequestSchema } from "@/lib/validation/balance";

/** Drill depth for a mass, a heavy-metal plug's net mass, a correction moved or split. */
export const POST = route(async (req) => {
  await requireApiUser(ALL_ROLES);
  const body = await parseJson(req, holeRequestSchema);
  switch (body.kind) {
    case "drill":
      return json(drillDepthForMass(body));
    case "plug":
      return json(plugNetMass(body));
    case "move":
      return json(moveCorrection(body));
    case "split":
      return json(splitCorrection(body));
  }
});
