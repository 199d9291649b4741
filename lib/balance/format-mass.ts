import { Dec } from "./decimal";
import { parseQuantity } from "./parse";

/**
 * Rounds a mass for people to read: to the nearest multiple of the scale resolution, halves
 * away from zero (as a scale display does), with as many decimals as the resolution has.
 * Use it at the display edge only; every calculation works on the unrounded strings.
 *
 * @param value - a decimal string in any mass unit (a leading "-" is allowed, e.g. a net plug mass)
 * @param resolution - the scale resolution in the same unit, e.g. "0.1" or "0.05"
 * @returns the rounded value, e.g. "511.7"
 * @throws {BalanceInputError} `field: "value"` when the value is not a decimal string;
 *   `field: "resolution"` when the resolution is not a positive decimal string
 *
 * @example
 * formatMass("511.65", "0.1"); // "511.7"
 * formatMass("511.63", "0.05"); // "511.65"
 * formatMass("12.3", "0.2"); // "12.4"
 * formatMass("512", "0.1"); // "512.0"
 */
export function formatMass(value: string, resolution: string): string {
  const x = parseQuantity(value, "value", "signed");
  const step = parseQuantity(resolution, "resolution", "positive");
  const rounded = x.div(step).toDecimalPlaces(0, Dec.ROUND_HALF_UP).times(step);
  const fixed = rounded.toFixed(step.decimalPlaces());
  return /^-0(\.0*)?$/.test(fixed) ? fixed.slice(1) : fixed;
}
