import { Dec } from "./decimal";
import { parseChoice, parseQuantity } from "./parse";

/** Mass units the engine converts between. */
export type MassUnit = "g" | "oz" | "grain";
/** Length units the engine converts between. */
export type LengthUnit = "mm" | "in";

export const MASS_UNITS: readonly MassUnit[] = ["g", "oz", "grain"];
export const LENGTH_UNITS: readonly LengthUnit[] = ["mm", "in"];

/** Grams in one avoirdupois ounce, exact: 1 lb = 453.59237 g (1959 agreement), 1 oz = 1/16 lb. NIST HB44 App. C. */
export const GRAMS_PER_OUNCE = "28.349523125";
/** Grams in one grain, exact: 1 grain = 1/7000 lb. NIST HB44 App. C. */
export const GRAMS_PER_GRAIN = "0.06479891";
/** Millimetres in one inch, exact (1959 international yard and pound agreement). NIST SP 811 App. B.8. */
export const MILLIMETRES_PER_INCH = "25.4";

/**
 * How close a converted value must be to the exact one, relative: one part in 10³⁰. Far below
 * any scale; it lets the result be the shortest decimal in that window, which is what makes
 * a conversion and its reverse return the original string.
 */
export const CONVERSION_RELATIVE_TOLERANCE = "1e-30";

const GRAMS: Record<MassUnit, Dec> = {
  g: new Dec(1),
  oz: new Dec(GRAMS_PER_OUNCE),
  grain: new Dec(GRAMS_PER_GRAIN),
};
const MILLIMETRES: Record<LengthUnit, Dec> = { mm: new Dec(1), in: new Dec(MILLIMETRES_PER_INCH) };
const TOLERANCE = new Dec(CONVERSION_RELATIVE_TOLERANCE);
// At 32 significant digits the rounding error (≤ 5·10⁻³² relative) is always inside TOLERANCE.
const MAX_DIGITS = 32;

/**
 * Converts `value` (in the unit `perFrom` base units) to the unit worth `perTo` base units.
 * Returns the shortest decimal y with |x·perFrom − y·perTo| ≤ 10⁻³⁰ · min(x·perFrom, y·perTo).
 * Both sides of that test are exact products, and the test reads the same in the reverse
 * direction, so converting y back finds x again (for any x of up to 28 significant digits).
 */
function convertByFactors(x: Dec, perFrom: Dec, perTo: Dec): Dec {
  if (x.isZero() || perFrom.eq(perTo)) return x;
  const base = x.times(perFrom);
  const exact = base.div(perTo);
  for (let digits = 1; digits <= MAX_DIGITS; digits += 1) {
    const candidate = exact.toSignificantDigits(digits);
    const back = candidate.times(perTo);
    if (
      base
        .minus(back)
        .abs()
        .lte(TOLERANCE.times(Dec.min(base, back)))
    )
      return candidate;
  }
  return exact.toSignificantDigits(MAX_DIGITS);
}

/**
 * Converts a mass between grams, avoirdupois ounces and grains.
 *
 * Exact factors (NIST Handbook 44 App. C): 1 oz = 28.349523125 g, 1 grain = 0.06479891 g,
 * 1 oz = 437.5 grain. Multiplying by a factor is exact; where dividing does not terminate the
 * result is the shortest decimal within one part in 10³⁰ of the exact value, so
 * g → oz → g gives back the same string.
 *
 * @param value - a non-negative decimal string in `from`
 * @param from - unit of `value`
 * @param to - unit wanted
 * @returns a decimal string in `to`
 * @throws {BalanceInputError} `field: "value"` when the value is not a non-negative decimal
 *   string; `field: "from" | "to"` with `code: "unknown-unit"` for an unknown unit
 *
 * @example
 * convertMass("1", "oz", "g"); // "28.349523125"
 * convertMass("28.349523125", "g", "oz"); // "1"
 * convertMass("1", "oz", "grain"); // "437.5"
 */
export function convertMass(value: string, from: MassUnit, to: MassUnit): string {
  const x = parseQuantity(value, "value", "non-negative");
  const perFrom = GRAMS[parseChoice(from, "from", MASS_UNITS)];
  const perTo = GRAMS[parseChoice(to, "to", MASS_UNITS)];
  return convertByFactors(x, perFrom, perTo).toString();
}

/**
 * Converts a length between millimetres and inches (1 in = 25.4 mm exactly, NIST SP 811
 * App. B.8). Inches to millimetres is exact; millimetres to inches is the shortest decimal
 * within one part in 10³⁰, so mm → in → mm gives back the same string.
 *
 * @param value - a non-negative decimal string in `from`
 * @param from - unit of `value`
 * @param to - unit wanted
 * @returns a decimal string in `to`
 * @throws {BalanceInputError} `field: "value"` for a bad value; `"from" | "to"` for an unknown unit
 *
 * @example
 * convertLength("3.5", "in", "mm"); // "88.9"
 * convertLength("88.9", "mm", "in"); // "3.5"
 */
export function convertLength(value: string, from: LengthUnit, to: LengthUnit): string {
  const x = parseQuantity(value, "value", "non-negative");
  const perFrom = MILLIMETRES[parseChoice(from, "from", LENGTH_UNITS)];
  const perTo = MILLIMETRES[parseChoice(to, "to", LENGTH_UNITS)];
  return convertByFactors(x, perFrom, perTo).toString();
}
