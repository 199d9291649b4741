import { out } from "./decimal";
import { parseQuantity } from "./parse";

export interface MoveCorrectionInput {
  /** Correction mass at `fromRadius`, g. */
  mass: string;
  /** Radius the mass was worked out for, mm. */
  fromRadius: string;
  /** Radius the correction will be made at, mm. */
  toRadius: string;
}

export interface MovedCorrection {
  /** Mass at `toRadius`, g: m₂ = m₁·r₁/r₂. */
  mass: string;
  /** The unbalance both represent, m₁·r₁, g·mm. */
  unbalance: string;
}

/**
 * Moves a correction to another radius. Unbalance is mass × radius, so m₁ at r₁ equals
 * m₂ = m₁·r₁/r₂ at r₂ (geometry).
 *
 * @param input - mass (g), radius it applies at and radius wanted (mm)
 * @returns the mass at the new radius (g) and the unbalance (g·mm)
 * @throws {BalanceInputError} `mass`, `fromRadius`, `toRadius` when not positive decimal strings
 *
 * @example
 * moveCorrection({ mass: "12", fromRadius: "50", toRadius: "75" }); // { mass: "8", unbalance: "600" }
 */
export function moveCorrection(input: MoveCorrectionInput): MovedCorrection {
  const mass = parseQuantity(input.mass, "mass");
  const from = parseQuantity(input.fromRadius, "fromRadius");
  const to = parseQuantity(input.toRadius, "toRadius");
  const unbalance = mass.times(from);
  return { mass: out(unbalance.div(to)), unbalance: out(unbalance) };
}
