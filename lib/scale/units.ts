import Decimal from "decimal.js";

/** Decimal arithmetic for scale readings: 40 significant digits, never floats. */
export const ScaleDecimal = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_UP });

/** A mass unit a scale may print after its reading. */
export type ScaleMassUnit = "g" | "kg" | "mg" | "oz" | "ozt" | "lb" | "ct" | "gn" | "dwt";

/**
 * Grams in one of each unit. Every factor is exact by definition (NIST SP 811 App. B.8 and
 * NIST Handbook 44 App. C): avoirdupois ounce 28.349523125 g, troy ounce 31.1034768 g,
 * pound 453.59237 g, metric carat 0.2 g, grain 0.06479891 g, pennyweight 24 grains.
 */
export const GRAMS_PER_UNIT: Readonly<Record<ScaleMassUnit, string>> = {
  g: "1",
  kg: "1000",
  mg: "0.001",
  oz: "28.349523125",
  ozt: "31.1034768",
  lb: "453.59237",
  ct: "0.2",
  gn: "0.06479891",
  dwt: "1.55517384",
};

/** How scales spell each unit (compared without regard to case). */
const UNIT_SPELLINGS: Readonly<Record<string, ScaleMassUnit>> = {
  g: "g",
  gr: "gn",
  gn: "gn",
  grain: "gn",
  kg: "kg",
  mg: "mg",
  oz: "oz",
  ozt: "ozt",
  "oz t": "ozt",
  lb: "lb",
  lbs: "lb",
  ct: "ct",
  dwt: "dwt",
};

/**
 * The unit a scale printed, or `null` when it is not a mass (pieces, percent, newtons…).
 *
 * "gr" is the grain here: a scale prints grams as "g".
 *
 * @example
 * readScaleUnit("G"); // "g"
 * readScaleUnit("GN"); // "gn"
 * readScaleUnit("pcs"); // null
 */
export function readScaleUnit(token: string): ScaleMassUnit | null {
  return UNIT_SPELLINGS[token.trim().toLowerCase()] ?? null;
}

/**
 * Converts a mass between scale units with the exact factors of {@link GRAMS_PER_UNIT}.
 * Into grams (or any unit whose factor divides exactly) the result is exact; otherwise it
 * carries 40 significant digits.
 *
 * @param value - a decimal string, e.g. "17.5"
 * @returns a decimal string in `to`
 * @throws {Error} when `value` is not a number
 * @example
 * convertScaleMass("17.5", "oz", "g"); // "496.1166546875"  (17.5 × 28.349523125)
 * convertScaleMass("5", "ct", "g"); // "1"
 */
export function convertScaleMass(value: string, from: ScaleMassUnit, to: ScaleMassUnit): string {
  const x = new ScaleDecimal(value);
  if (from === to) return x.toString();
  return x.times(GRAMS_PER_UNIT[from]).dividedBy(GRAMS_PER_UNIT[to]).toString();
}
