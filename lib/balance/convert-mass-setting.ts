import { Dec } from "./decimal";
import { parseQuantity } from "./parse";
import { convertMass, type MassUnit } from "./units";

/** Significant figures a converted tolerance or allowance keeps: a shop figure, not a reading. */
export const SETTING_SIGNIFICANT_FIGURES = 2;

/** Scale divisions, from the finest within a decade up: 1, 2 and 5 × 10^k. */
const DIVISIONS = [5, 2, 1] as const;

/**
 * Converts a job's mass setting when the job changes its unit (grams ↔ ounces).
 *
 * - A scale resolution (`as: "resolution"`) becomes the coarsest scale division (1, 2 or
 *   5 × 10^k, the only divisions a weighing instrument has; NIST Handbook 44, OIML R 76, from
 *   memory) that is not coarser than the exact conversion, so the new figure never claims less
 *   than the scale can tell apart: 0.1 g = 0.0035274 oz → 0.002 oz.
 * - A tolerance or an allowance (`as: "amount"`) is converted exactly and rounded to
 *   {@link SETTING_SIGNIFICANT_FIGURES} significant figures, halves away from zero:
 *   0.5 g = 0.017637 oz → 0.018 oz. Zero stays "0".
 *
 * Exact factor: 1 oz = 28.349523125 g (NIST SP 811 App. B).
 *
 * @param value - the setting, a non-negative decimal string in `from` (a resolution: positive)
 * @param from - the unit it is in
 * @param to - the unit wanted
 * @param as - "resolution" or "amount"
 * @returns a plain decimal string in `to`
 * @throws {BalanceInputError} `field: "value"` when it is not a decimal string of the right sign;
 *   `field: "from" | "to"` for an unknown unit
 *
 * @example
 * convertMassSetting("0.1", "g", "oz", "resolution"); // "0.002"
 * convertMassSetting("0.5", "g", "oz", "amount"); // "0.018"
 * convertMassSetting("0.002", "oz", "g", "resolution"); // "0.05"
 * convertMassSetting("4", "g", "oz", "amount"); // "0.14"
 */
export function convertMassSetting(
  value: string,
  from: MassUnit,
  to: MassUnit,
  as: "resolution" | "amount",
): string {
  parseQuantity(value, "value", as === "resolution" ? "positive" : "non-negative");
  const exact = new Dec(convertMass(value, from, to));
  if (from === to) return exact.toString();
  if (as === "amount") {
    if (exact.isZero()) return "0";
    return exact.toSignificantDigits(SETTING_SIGNIFICANT_FIGURES, Dec.ROUND_HALF_UP).toString();
  }
  const decade = new Dec(10).pow(exact.e);
  for (const d of DIVISIONS) {
    const step = decade.times(d);
    if (step.lte(exact)) return step.toString();
  }
  return decade.toString();
}
