import { PI, out } from "./decimal";
import { parseQuantity } from "./parse";

/** Cubic millimetres in one cubic centimetre. */
const MM3_PER_CM3 = 1000;

export interface PlugNetMassInput {
  /** Plug (and hole) diameter, mm. */
  diameter: string;
  /** Plug length, mm. */
  length: string;
  /** Density of the plug, g/cm³, e.g. heavy metal per ASTM B777. */
  plugDensity: string;
  /** Density of the part drilled for it, g/cm³. */
  hostDensity: string;
}

export interface PlugNetMass {
  /** Plug volume πr²L, mm³. */
  volume: string;
  /** Mass of the plug itself, g. */
  plugMass: string;
  /** Mass of the metal drilled out for it, g. */
  removedMass: string;
  /** Mass the plug adds to the part, (ρ_plug − ρ_host)·V, g; negative for a plug lighter than the part. */
  netMass: string;
}

/**
 * Mass a cylindrical plug adds when fitted into a hole drilled for it (DOMAIN §4): the hole
 * removes ρ_host·V, the plug brings ρ_plug·V, so the net gain is (ρ_plug − ρ_host)·V, not
 * ρ_plug·V. V = π(D/2)²L, with 1 cm³ = 1000 mm³.
 *
 * @param input - diameter and length (mm), plug and host densities (g/cm³)
 * @returns volume (mm³), plug mass, removed mass and net mass (g)
 * @throws {BalanceInputError} `diameter`, `length`, `plugDensity`, `hostDensity` when not
 *   positive decimal strings
 *
 * @example
 * // A 12.7 mm × 25 mm plug of ASTM B777 class 3 (18.0) in a steel crank (7.85):
 * plugNetMass({ diameter: "12.7", length: "25", plugDensity: "18.0", hostDensity: "7.85" }).netMass;
 * // "32.1..."  g  ((18.0 − 7.85) × 3166.9 mm³ / 1000)
 */
export function plugNetMass(input: PlugNetMassInput): PlugNetMass {
  const diameter = parseQuantity(input.diameter, "diameter");
  const length = parseQuantity(input.length, "length");
  const plug = parseQuantity(input.plugDensity, "plugDensity");
  const host = parseQuantity(input.hostDensity, "hostDensity");
  const volume = PI.times(diameter.div(2).pow(2)).times(length);
  const cm3 = volume.div(MM3_PER_CM3);
  return {
    volume: out(volume),
    plugMass: out(plug.times(cm3)),
    removedMass: out(host.times(cm3)),
    netMass: out(plug.minus(host).times(cm3)),
  };
}
