import { Dec, PI, out, radians } from "./decimal";
import { parseQuantity } from "./parse";
import { BalanceInputError } from "./errors";

/** Point angle of a standard twist drill, degrees (common practice; geometry). */
export const DEFAULT_POINT_ANGLE_DEG = "118";
/** Cubic millimetres in one cubic centimetre. */
const MM3_PER_CM3 = 1000;

export interface DrillDepthInput {
  /** Mass to remove, g. */
  mass: string;
  /** Drill diameter, mm. */
  diameter: string;
  /** Density of the part's material, g/cm³ (see `MATERIAL_DENSITIES`). */
  density: string;
  /** Included point angle, degrees, above 0 and below 180; default 118. */
  pointAngle?: string;
}

export interface DrillDepth {
  /** Volume of metal to remove, mm³. */
  volume: string;
  /** Depth at the drill tip, mm: how far to feed from first full contact of the tip. */
  tipDepth: string;
  /** Depth drilled at full diameter, mm (tipDepth − coneLength; 0 in the shallow case). */
  fullDiameterDepth: string;
  /** Length of the drill point h = (D/2)·cot(angle/2), mm. */
  coneLength: string;
  /** True when the mass is taken by the point alone (a partial cone). */
  shallow: boolean;
  /** Echo of the point angle used, degrees. */
  pointAngle: string;
}

/**
 * Depth to drill to remove a mass (geometry). V = m/ρ. The point is a cone of
 * length h = (D/2)·cot(α) with α half the point angle. When V is more than the whole cone,
 * V = πr²(T − 2h/3), so T = V/(πr²) + 2h/3. Otherwise only part of the cone is cut:
 * V = (1/3)·π·(T·tan α)²·T, so T = ∛(3V / (π tan²α)).
 *
 * @param input - mass (g), drill diameter (mm), density (g/cm³), optional point angle (degrees)
 * @returns tip depth, full-diameter depth and cone length (mm), volume (mm³), shallow or not
 * @throws {BalanceInputError} `mass`, `diameter`, `density`, `pointAngle` when not positive
 *   decimal strings; `pointAngle` (code `out-of-range`) at 180° or more
 *
 * @example
 * // 5 g of steel (7.85 g/cm³) with a 10 mm drill, 118° point:
 * const d = drillDepthForMass({ mass: "5", diameter: "10", density: "7.85" });
 * d.volume; // "636.942675159235668789808917197"  mm³
 * d.coneLength; // "3.00430..."  mm (0.3004 × D)
 * d.tipDepth; // "10.1126..."  mm (636.94 / 78.54 + 2 × 3.0043 / 3)
 * d.shallow; // false
 */
export function drillDepthForMass(input: DrillDepthInput): DrillDepth {
  const mass = parseQuantity(input.mass, "mass");
  const diameter = parseQuantity(input.diameter, "diameter");
  const density = parseQuantity(input.density, "density");
  const angle = parseQuantity(input.pointAngle ?? DEFAULT_POINT_ANGLE_DEG, "pointAngle");
  if (angle.gte(180)) {
    throw new BalanceInputError(
      "pointAngle",
      "out-of-range",
      "pointAngle must be below 180 degrees",
    );
  }

  const volume = mass.div(density).times(MM3_PER_CM3);
  const r = diameter.div(2);
  const tanHalf = Dec.tan(radians(angle.div(2)));
  const cone = r.div(tanHalf);
  const area = PI.times(r.pow(2));
  const coneVolume = area.times(cone).div(3);

  const shallow = volume.lte(coneVolume);
  const tip = shallow
    ? Dec.cbrt(volume.times(3).div(PI.times(tanHalf.pow(2))))
    : volume.div(area).plus(cone.times(2).div(3));
  return {
    volume: out(volume),
    tipDepth: out(tip),
    fullDiameterDepth: shallow ? "0" : out(tip.minus(cone)),
    coneLength: out(cone),
    shallow,
    pointAngle: out(angle),
  };
}
