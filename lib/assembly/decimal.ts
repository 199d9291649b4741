import Decimal from "decimal.js";

/** Significant digits every intermediate result carries. */
export const INTERNAL_PRECISION = 60;

/**
 * Significant digits of every result string. Sums, differences and halves of the inputs come
 * out exact; only non-terminating results (π, square roots, trigonometry, quotients) are
 * rounded here. People see figures through the display rule, never these strings raw.
 */
export const RESULT_SIGNIFICANT_DIGITS = 30;

/** The most significant digits an input quantity may carry. */
export const MAX_INPUT_SIGNIFICANT_DIGITS = 40;

/**
 * The module's own Decimal constructor, so the application's global decimal.js settings are
 * neither used nor changed. Strings never use exponent notation.
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

/** Millimetres in one inch, exact by definition (NIST SP 811, appendix B). */
export const MILLIMETRES_PER_INCH: Dec = new Dec("25.4");

/** A result as a plain decimal string (see {@link RESULT_SIGNIFICANT_DIGITS}). */
export function out(value: Dec): string {
  return value.isZero() ? "0" : value.toSignificantDigits(RESULT_SIGNIFICANT_DIGITS).toString();
}

/** Degrees to radians. */
export function radians(degrees: Dec): Dec {
  return degrees.times(PI).div(180);
}

/** Area of a circle of diameter `d`: π/4 · d². */
export function circleArea(diameter: Dec): Dec {
  return PI.div(4).times(diameter.pow(2));
}
