import Decimal from "decimal.js";
import {
  convertLength,
  convertMass,
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
  /** The depth of metal available, mm (converted from inches when typed so), when given. */
  availableDepth?: string;
  /** Tip depth at most the depth available; null when no depth was given. */
  fits: boolean | null;
};
export type PlugAnswer = PlugNetMass & { drill: DrillSize };
export type HoleAnswer = DrillAnswer | PlugAnswer | MovedCorrection | SplitCorrection;

/** A mass typed in the job's unit, in grams (1 oz = 28.349523125 g exactly, NIST SP 811). */
const grams = (mass: string, unit: "g" | "oz" | undefined) =>
  unit === "oz" ? convertMass(mass, "oz", "g") : mass;
/** A length typed in the job's unit, in mm (1 in = 25.4 mm exactly, NIST SP 811). */
const millimetres = (length: string, unit: "mm" | "in" | undefined) =>
  unit === "in" ? convertLength(length, "in", "mm") : length;

/**
 * The corrections helpers behind POST /api/balance/hole: a drill size (as written) read to mm,
 * masses typed in ounces and lengths in inches converted exactly from the figures as typed,
 * then the balance engine's drill depth, plug net mass, moved or split correction. Answers
 * are in the engine's units: grams, mm, g·mm.
 */
export function workOutHole(body: HoleRequest): HoleAnswer {
  switch (body.kind) {
    case "drill": {
      const drill = parseDrillSize(body.diameter, "diameter");
      const depth = drillDepthForMass({
        mass: grams(body.mass, body.massUnit),
        diameter: drill.diameterMm,
        density: body.density,
        ...(body.pointAngle ? { pointAngle: body.pointAngle } : {}),
      });
      if (body.availableDepth === undefined) return { ...depth, drill, fits: null };
      const available = millimetres(body.availableDepth, body.lengthUnit);
      const fits = new Decimal(depth.tipDepth).lte(available);
      return { ...depth, drill, availableDepth: available, fits };
    }
    case "plug": {
      const drill = parseDrillSize(body.diameter, "diameter");
      return {
        ...plugNetMass({
          diameter: drill.diameterMm,
          length: millimetres(body.length, body.lengthUnit),
          plugDensity: body.plugDensity,
          hostDensity: body.hostDensity,
          ...(body.pointAngle ? { pointAngle: body.pointAngle } : {}),
        }),
        drill,
      };
    }
    case "move":
      return moveCorrection({
        mass: grams(body.mass, body.massUnit),
        fromRadius: millimetres(body.fromRadius, body.lengthUnit),
        toRadius: millimetres(body.toRadius, body.lengthUnit),
      });
    case "split":
      return splitCorrection({
        mass: grams(body.mass, body.massUnit),
        halfAngleDeg: body.halfAngleDeg,
      });
  }
}
