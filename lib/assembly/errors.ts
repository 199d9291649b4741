/**
 * Why an input to an engine build computation was refused. Stable strings: the web edge maps
 * them to a 422 answer and a form maps `field` back to the box that needs correcting.
 */
export type AssemblyErrorCode =
  | "required" // the value is missing
  | "not-a-string" // a quantity arrived as a number or another type instead of a decimal string
  | "not-a-decimal" // the string is not a plain decimal such as "4.030" or "-12.5"
  | "not-finite" // "NaN", "Infinity" and the like
  | "negative" // a quantity below zero where only zero or more makes sense
  | "not-positive" // zero or below where only a positive quantity makes sense
  | "too-precise" // more significant digits than the module carries
  | "out-of-range" // outside the range the field allows (an angle past 180°, a factor of 4.5…)
  | "out-of-order" // two readings in the wrong order (a closing-side reading before the opening side)
  | "same-reading" // two readings that must differ are equal (both piston-stop readings alike)
  | "empty" // an empty list of readings
  | "uneven-readings" // positions with different numbers of readings, so no end-to-end comparison
  | "unknown-unit"; // a unit outside the list the function accepts

/**
 * The one error `lib/assembly` throws for bad input. `field` is a dotted path into the input
 * (`"solidHeight"`, `"journal.1.0"` for the first reading at the second position), and the
 * message names the quantity the way a builder says it.
 *
 * @example
 * try {
 *   ringEndGap({ bore: "4.030", factor: "4.5" });
 * } catch (error) {
 *   if (error instanceof AssemblyInputError) console.log(error.field, error.code); // "factor" "out-of-range"
 * }
 */
export class AssemblyInputError extends Error {
  override readonly name = "AssemblyInputError";

  constructor(
    /** Dotted path of the offending input, e.g. `"installedHeight"`. */
    readonly field: string,
    /** Machine-readable reason. */
    readonly code: AssemblyErrorCode,
    message: string,
  ) {
    super(message);
  }
}

/**
 * Type guard for {@link AssemblyInputError}, for callers that receive `unknown` from a catch.
 *
 * @example
 * isAssemblyInputError(new AssemblyInputError("bore", "not-positive", "Bore must be above zero")); // true
 */
export function isAssemblyInputError(error: unknown): error is AssemblyInputError {
  return error instanceof AssemblyInputError;
}
