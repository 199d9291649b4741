import { Dec, out, radians } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseQuantity } from "./parse";

export interface SplitCorrectionInput {
  /** Correction mass wanted at one angle, g. */
  mass: string;
  /** Angle of each of the two holes either side of that angle, degrees, 0 ≤ θ < 90. */
  halfAngleDeg: string;
}

export interface SplitCorrection {
  /** Mass in each hole, m / (2 cos θ), g. */
  massEach: string;
  /** Both holes together, g (more than `mass` for θ > 0). */
  totalMass: string;
  halfAngleDeg: string;
}

/**
 * Splits a correction over two holes at ±θ from the wanted angle (geometry): their
 * components across the wanted direction cancel and along it add, so each needs m / (2 cos θ).
 *
 * @param input - the mass (g) and the half angle between the holes (degrees)
 * @returns the mass per hole and for both (g)
 * @throws {BalanceInputError} `mass` when not positive; `halfAngleDeg` negative, not a decimal
 *   string, or (code `out-of-range`) 90° or more, where the holes no longer act along the wanted angle
 *
 * @example
 * splitCorrection({ mass: "10", halfAngleDeg: "60" }); // { massEach: "10", totalMass: "20", halfAngleDeg: "60" }
 */
export function splitCorrection(input: SplitCorrectionInput): SplitCorrection {
  const mass = parseQuantity(input.mass, "mass");
  const theta = parseQuantity(input.halfAngleDeg, "halfAngleDeg", "non-negative");
  if (theta.gte(90)) {
    throw new BalanceInputError(
      "halfAngleDeg",
      "out-of-range",
      "halfAngleDeg must be below 90 degrees",
    );
  }
  // cos 60° is 0.5 only to 60 digits; the 30-digit result strings round that away.
  const each = mass.div(Dec.cos(radians(theta)).times(2));
  return { massEach: out(each), totalMass: out(each.times(2)), halfAngleDeg: out(theta) };
}
