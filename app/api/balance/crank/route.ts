import { checkResidual, permissibleUnbalance } from "@/lib/balance";
import { requireApiPermission } from "@/lib/auth/guard";
import { json, parseJson, route } from "@/lib/http/route";
import { crankRequestSchema } from "@/lib/validation/balance";

/** Permissible residual unbalance per plane (ISO 21940-11), and pass/fail for readings if given. */
export const POST = route(async (req) => {
  await requireApiPermission("use-calculators");
  const { readings, ...input } = await parseJson(req, crankRequestSchema);
  const permissible = permissibleUnbalance(input);
  const check = readings
    ? checkResidual({
        permissible,
        readings: (["A", "B"] as const).map((plane) => ({ plane, ...readings[plane] })),
      })
    : null;
  return json({ permissible, check });
});
