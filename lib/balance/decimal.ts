import Decimal from "decimal.js";

/**
 * Significant digits every intermediate result carries. Large enough that sums and products
 * of inputs of up to {@link MAX_INPUT_SIGNIFICANT_DIGITS} digits and the unit factors are exact.
 */
export const INTERNAL_PRECISION = 60;

/**
 * Significant digits of every result string. Exact results (sums, differences, a 50 % share)
 * never need that many and come out exact; only non-terminating ones (a mean of three
 * readings, trigonometry, π) are rounded here. People see figures through `formatMass`.
 */
export const RESULT_SIGNIFICANT_DIGITS = 30;

/** The most significant digits an input quantity may carry. */
export const MAX_INPUT_SIGNIFICANT_DIGITS = 40;

/**
 * The engine's own Decimal constructor, so that the application's global decimal.js settings
 * are neither used nor changed. Strings never use exponent notation.
 */
export const Dec = Decimal.clone({
  precision: INTERNAL_PRECISION,
  rounding: Decimal.ROUND_HALF_EVEN,
  toExpNeg: -9e15,
  toExpPos: 9e15,
});

export type Dec = Decimal;

/** π to the internal precision. */
export const PI: Dec = Dec.acos(-1);

export const ZERO: Dec = new Dec(0);
export const ONE_HUNDRED: Dec = new Dec(100);

/** A result value as a plain decimal string (see {@link RESULT_SIGNIFICANT_DIGITS}). */
export function out(value: Dec): string {
  return value.isZero() ? "0" : value.toSignificantDigits(RESULT_SIGNIFICANT_DIGITS).toString();
}

/** Rounds to the result digits, keeping a Decimal, so later sums agree with the printed parts. */
export function settle(value: Dec): Dec {
  return value.toSignificantDigits(RESULT_SIGNIFICANT_DIGITS);
}

/** Degrees to radians. */
export function radians(degrees: Dec): Dec {
  return degrees.times(PI).div(180);
}
