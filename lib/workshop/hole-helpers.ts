import Decimal from "decimal.js";
import {
  drillDepthForMass,
  moveCorrection,
  parseDrillSize,
  plugNetMass,
  splitCorrection,
  type DrillDepth,
  type DrillSize,
  type MovedCorrection,
  type PlugNetMass,
  type SplitCorrection,
} from "@/lib/balance";
import type { HoleRequest } from "@/lib/validation/balance";

export type DrillAnswer = DrillDepth & {
  /** The drill size as read: mm and inches, and as the machinist wrote it. */
  drill: DrillSize;
  /** Echo of the depth of metal available, mm, when given. */
  availableDepth?: string;
  /** Tip depth at most the depth available; null when no depth was given. */
  fits: boolean | null;
};
export type PlugAnswer = PlugNetMass & { drill: DrillSize };
export type HoleAnswer = DrillAnswer | PlugAnswer | MovedCorrection | SplitCorrection;

/**
 * The corrections helpers behind POST /api/balance/hole: a drill size (as written) read to mm,
 * then the balance engine's drill depth, plug net mass, moved or split correction.
 */
export function workOutHole(body: HoleRequest): HoleAnswer {
  switch (body.kind) {
    case "drill": {
      const drill = parseDrillSize(body.diameter, "diameter");
      const depth = drillDepthForMass({
        mass: body.mass,
        diameter: drill.diameterMm,
        density: body.density,
        ...(body.pointAngle ? { pointAngle: body.pointAngle } : {}),
      });
      if (body.availableDepth === undefined) return { ...depth, drill, fits: null };
      const fits = new Decimal(depth.tipDepth).lte(body.availableDepth);
      return { ...depth, drill, availableDepth: body.availableDepth, fits };
    }
    case "plug": {
      const drill = parseDrillSize(body.diameter, "diameter");
      return {
        ...plugNetMass({
          diameter: drill.diameterMm,
          length: body.length,
          plugDensity: body.plugDensity,
          hostDensity: body.hostDensity,
          ...(body.pointAngle ? { pointAngle: body.pointAngle } : {}),
        }),
        drill,
      };
    }
    case "move":
      return moveCorrection(body);
    case "split":
      return splitCorrection(body);
  }
}
