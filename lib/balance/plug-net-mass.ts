import { Dec, PI, out, radians } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseOptionalQuantity, parseQuantity } from "./parse";

/** Cubic millimetres in one cubic centimetre. */
const MM3_PER_CM3 = 1000;

export interface PlugNetMassInput {
  /** Plug (and hole) diameter, mm. */
  diameter: string;
  /** Plug length, mm: the hole's depth at full diameter. */
  length: string;
  /** Density of the plug, g/cm³, e.g. heavy metal per ASTM B777. */
  plugDensity: string;
  /** Density of the part drilled for it, g/cm³. */
  hostDensity: string;
  /**
   * Included point angle of the drill that made the hole, degrees (118 for a standard twist
   * drill). When given, the cone the point leaves below a flat-ended plug is counted as empty.
   * Leave it out for a flat-bottomed hole (or to keep the figure without the point).
   */
  pointAngle?: string;
}

export interface PlugNetMass {
  /** Plug volume πr²L, mm³. */
  volume: string;
  /** Mass of the plug itself, g. */
  plugMass: string;
  /** Mass of the metal drilled out for it, g (the point's cone included when `pointAngle` is given). */
  removedMass: string;
  /**
   * Mass the plug adds to the part, g: (ρ_plug − ρ_host)·V, less ρ_host·V_cone when the point
   * is counted; negative for a plug lighter than the part.
   */
  netMass: string;
  /** Empty cone under the plug, mm³: π r² h / 3 with h = r·cot(angle/2); with `pointAngle` only. */
  pointVoidVolume?: string;
  /** Metal that cone held, ρ_host·V_cone, g; with `pointAngle` only. */
  pointVoidMass?: string;
  /** Echo of the point angle, degrees; with `pointAngle` only. */
  pointAngle?: string;
}

/**
 * Mass a cylindrical plug adds when fitted into a hole drilled for it (geometry): the hole
 * removes ρ_host·V, the plug brings ρ_plug·V, so the net gain is (ρ_plug − ρ_host)·V, not
 * ρ_plug·V. V = π(D/2)²L, with 1 cm³ = 1000 mm³.
 *
 * A twist drill leaves a cone below the full-diameter depth, of length h = (D/2)·cot(α/2) for
 * a point angle α (geometry). A flat-ended plug does not fill it, so that metal is lost with
 * nothing in its place: net = (ρ_plug − ρ_host)·V − ρ_host·π r² h / 3. Give `pointAngle` to
 * count it; without it the result is the flat-bottomed figure above.
 *
 * @param input - diameter and length (mm), plug and host densities (g/cm³), optional point
 *   angle (degrees)
 * @returns volume (mm³), plug mass, removed mass and net mass (g); with a point angle also the
 *   empty cone's volume (mm³) and mass (g)
 * @throws {BalanceInputError} `diameter`, `length`, `plugDensity`, `hostDensity`, `pointAngle`
 *   when not positive decimal strings; `pointAngle` (code `out-of-range`) at 180° or more
 *
 * @example
 * // A 12.7 mm × 25 mm plug of ASTM B777 class 3 (18.0) in a steel crank (7.85):
 * plugNetMass({ diameter: "12.7", length: "25", plugDensity: "18.0", hostDensity: "7.85" }).netMass;
 * // "32.1..."  g  ((18.0 − 7.85) × 3166.9 mm³ / 1000)
 * // The same plug in a hole drilled with a 118° point: the cone of 161.1 mm³ is empty,
 * // 7.85 × 0.1611 = 1.26 g less.
 * plugNetMass({ diameter: "12.7", length: "25", plugDensity: "18.0", hostDensity: "7.85", pointAngle: "118" }).netMass;
 * // "30.87..."  g
 */
export function plugNetMass(input: PlugNetMassInput): PlugNetMass {
  const diameter = parseQuantity(input.diameter, "diameter");
  const length = parseQuantity(input.length, "length");
  const plug = parseQuantity(input.plugDensity, "plugDensity");
  const host = parseQuantity(input.hostDensity, "hostDensity");
  const angle = parseOptionalQuantity(input.pointAngle, "pointAngle");
  if (angle?.gte(180)) {
    throw new BalanceInputError(
      "pointAngle",
      "out-of-range",
      "pointAngle must be below 180 degrees",
    );
  }
  const r = diameter.div(2);
  const area = PI.times(r.pow(2));
  const volume = area.times(length);
  const cm3 = volume.div(MM3_PER_CM3);
  const flat = plug.minus(host).times(cm3);
  if (angle === undefined) {
    return {
      volume: out(volume),
      plugMass: out(plug.times(cm3)),
      removedMass: out(host.times(cm3)),
      netMass: out(flat),
    };
  }
  const coneLength = r.div(Dec.tan(radians(angle.div(2))));
  const cone = area.times(coneLength).div(3);
  const coneMass = host.times(cone).div(MM3_PER_CM3);
  return {
    volume: out(volume),
    plugMass: out(plug.times(cm3)),
    removedMass: out(host.times(cm3).plus(coneMass)),
    netMass: out(flat.minus(coneMass)),
    pointVoidVolume: out(cone),
    pointVoidMass: out(coneMass),
    pointAngle: out(angle),
  };
}
