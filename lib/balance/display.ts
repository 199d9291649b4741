import { Dec } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseQuantity } from "./parse";
import { convertLength, type LengthUnit } from "./units";

// The one display rule. Every figure that reaches a person (screen, CSV, PDF, message) goes
// through one of these; every calculation works on the unrounded strings.
//
// Masses: a weighed mass at the scale resolution, a computed mass (mean, target, bobweight,
// difference, sum) with one more decimal. Unbalance and small corrections: at least two
// significant figures. Lengths: at the precision and in the unit they were entered.

/** Decimals a computed mass carries beyond the scale resolution's own. */
export const DERIVED_MASS_EXTRA_DECIMALS = 1;

/** Significant figures an unbalance or a small correction mass keeps at least. */
export const UNBALANCE_SIGNIFICANT_FIGURES = 2;

/**
 * Most decimals an entered length is shown with when no resolution is given: 0.0001 in
 * (2.5 µm) is finer than any shop rule or micrometer reading of a bore or stroke.
 */
export const MAX_LENGTH_DECIMALS = 4;

/** Removes the sign from a rounded zero ("-0.0" → "0.0"). */
function unsignZero(fixed: string): string {
  return /^-0(\.0*)?$/.test(fixed) ? fixed.slice(1) : fixed;
}

/** Rounds half away from zero (as a scale display does) to `places` decimals. */
function toPlaces(x: Dec, places: number): string {
  return unsignZero(x.toDecimalPlaces(places, Dec.ROUND_HALF_UP).toFixed(places));
}

/**
 * True when a step is 1, 2 or 5 × 10^k, the only scale divisions a weighing instrument may
 * have (NIST Handbook 44 §2.20 scales code, and OIML R 76-1 §3.4.2: "1 × 10^k, 2 × 10^k or
 * 5 × 10^k"; clause numbers from memory).
 */
export function isScaleDivision(step: string): boolean {
  const d = parseQuantity(step, "resolution", "positive");
  if (d.sd(false) !== 1) return false;
  const leading = d.div(new Dec(10).pow(d.e)).toNumber();
  return leading === 1 || leading === 2 || leading === 5;
}

/**
 * Decimals a mass is shown with at a given scale resolution: the resolution's own decimals for
 * a 1/2/5 × 10^k division ("0.05" → 2, "1" → 0), otherwise the decimal place of its leading
 * digit ("0.003527" → 3, "0.3" → 1, "2.5" → 0).
 *
 * @param resolution - the scale resolution, a positive decimal string
 * @returns a whole number of decimals, 0 or more
 * @throws {BalanceInputError} `field: "resolution"` when it is not a positive decimal string
 *
 * @example
 * massDecimals("0.05"); // 2
 * massDecimals("0.003527"); // 3
 */
export function massDecimals(resolution: string): number {
  const step = parseQuantity(resolution, "resolution", "positive");
  if (isScaleDivision(resolution)) return step.decimalPlaces();
  return Math.max(0, -step.e);
}

/**
 * A weighed mass for people to read, at the scale resolution, halves away from zero (as a
 * scale display does).
 *
 * A resolution of 1, 2 or 5 × 10^k (the scale divisions NIST Handbook 44 and OIML R 76 allow,
 * from memory) rounds to a multiple of it. Any other step (an ounce figure converted from
 * grams, "0.003527") rounds to the decimal place of its leading digit, so a figure never shows
 * more digits than the scale can tell apart.
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
 * formatMass("10.95", "0.003527"); // "10.950"
 */
export function formatMass(value: string, resolution: string): string {
  const x = parseQuantity(value, "value", "signed");
  const step = parseQuantity(resolution, "resolution", "positive");
  if (!isScaleDivision(resolution)) return toPlaces(x, massDecimals(resolution));
  const rounded = x.div(step).toDecimalPlaces(0, Dec.ROUND_HALF_UP).times(step);
  return unsignZero(rounded.toFixed(step.decimalPlaces()));
}

/**
 * A computed mass for people to read — a mean of readings, a target, a bobweight, a
 * difference, a sum, a mass to take off — with one decimal more than the scale shows
 * (halves away from zero). One more digit says the figure was worked out, not weighed, and
 * keeps a mean of 0.1 g readings from looking like a reading.
 *
 * @param value - a decimal string in any mass unit, any sign
 * @param resolution - the scale resolution in the same unit
 * @returns the rounded value
 * @throws {BalanceInputError} `field: "value"` or `field: "resolution"` as {@link formatMass}
 *
 * @example
 * formatDerivedMass("305.833333333333333333333333333", "0.1"); // "305.83"
 * formatDerivedMass("0.166666666666666666666666667", "0.1"); // "0.17"
 * formatDerivedMass("10.95", "0.003527"); // "10.9500"
 */
export function formatDerivedMass(value: string, resolution: string): string {
  const x = parseQuantity(value, "value", "signed");
  return toPlaces(x, massDecimals(resolution) + DERIVED_MASS_EXTRA_DECIMALS);
}

/**
 * An unbalance (g·mm, g·in, oz·in) or a small correction mass for people to read: at least
 * two significant figures, so a fine grade's allowance never reads "0.00", and no more
 * decimals than that (whole numbers from 10 up keep their whole digits). Halves away from zero.
 *
 * @param value - a decimal string, any sign
 * @returns the rounded value; zero is "0"
 * @throws {BalanceInputError} `field: "value"` when it is not a decimal string
 *
 * @example
 * formatUnbalance("1909.86"); // "1910"
 * formatUnbalance("3.456"); // "3.5"
 * formatUnbalance("0.0123"); // "0.012"
 * formatUnbalance("0.0049"); // "0.0049"
 */
export function formatUnbalance(value: string): string {
  const x = parseQuantity(value, "value", "signed");
  if (x.isZero()) return "0";
  // Decimals that leave two significant figures for this magnitude (none from 10 up).
  let places = Math.max(0, UNBALANCE_SIGNIFICANT_FIGURES - 1 - x.e);
  // 0.0996 to 2 figures is 0.10: rounding up a decade must not lose the second figure.
  const rounded = x.toDecimalPlaces(places, Dec.ROUND_HALF_UP);
  if (rounded.e > x.e && places > 0) places -= 1;
  return toPlaces(x, places);
}

/**
 * The resolution an entered length was typed to: "3.250" → "0.001", "92" → "1". Keep it with
 * the length to show it again as entered after any conversion.
 *
 * @param entered - the length as the machinist typed it, a decimal string
 * @returns 10^−(its decimals) as a decimal string
 * @throws {BalanceInputError} `field: "length"` when it is not a non-negative decimal string
 *
 * @example
 * lengthResolutionOf("3.250"); // "0.001"
 * lengthResolutionOf("86"); // "1"
 */
export function lengthResolutionOf(entered: string): string {
  parseQuantity(entered, "length", "non-negative");
  const dot = entered.indexOf(".");
  const places = dot < 0 ? 0 : entered.length - dot - 1;
  return places === 0 ? "1" : `0.${"0".repeat(places - 1)}1`;
}

/**
 * A length for people to read, at the precision it was entered.
 *
 * With a resolution (the entered one, see {@link lengthResolutionOf}, or a drawing's
 * tolerance step) it is rounded to that many decimals; without one, an entered figure is shown
 * with its own decimals, and a computed one with at most {@link MAX_LENGTH_DECIMALS}.
 * Trailing zeros the machinist typed ("3.250") are kept. Halves away from zero.
 *
 * @param value - a length as a decimal string, in the unit it is shown in
 * @param resolution - optional: the step it was entered to, e.g. "0.001"
 * @returns the rounded length
 * @throws {BalanceInputError} `field: "value"` when it is not a decimal string;
 *   `field: "resolution"` when the resolution is not a positive decimal string
 *
 * @example
 * formatLength("3.250"); // "3.250"
 * formatLength("82.55000000001"); // "82.5500"
 * formatLength("82.55", "0.1"); // "82.6"
 */
export function formatLength(value: string, resolution?: string): string {
  const x = parseQuantity(value, "value", "signed");
  if (resolution !== undefined) return toPlaces(x, massDecimals(resolution));
  const dot = value.indexOf(".");
  const places = dot < 0 ? 0 : value.length - dot - 1;
  return toPlaces(x, Math.min(places, MAX_LENGTH_DECIMALS));
}

/**
 * A length held in millimetres shown in the unit it was entered in, at the precision it was
 * entered: a bore typed as "4.030" in is kept as 102.362 mm for the engine and shown again as
 * "4.030 in". The unit symbol is appended.
 *
 * @param valueMm - the length in millimetres, a decimal string
 * @param unit - the unit it was entered in: "mm" or "in"
 * @param resolution - optional: the step it was entered to in that unit, e.g. "0.001"
 * @returns e.g. "4.030 in" or "92.00 mm"
 * @throws {BalanceInputError} `field: "value"` when the length is not a decimal string;
 *   `field: "unit"` when the unit is neither "mm" nor "in"
 *
 * @example
 * formatLengthIn("102.362", "in", "0.001"); // "4.030 in"
 * formatLengthIn("86", "mm"); // "86 mm"
 */
export function formatLengthIn(valueMm: string, unit: LengthUnit, resolution?: string): string {
  if (unit !== "mm" && unit !== "in") {
    throw new BalanceInputError("unit", "unknown-unit", `unit must be "mm" or "in"`);
  }
  parseQuantity(valueMm, "value", "non-negative");
  const shown = unit === "mm" ? valueMm : convertLength(valueMm, "mm", "in");
  return `${formatLength(shown, resolution)} ${unit}`;
}
