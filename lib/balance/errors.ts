/**
 * Why an input was refused. Stable strings: the web edge maps them to a 422 answer and
 * the forms map `field` back to the input that needs correcting.
 */
export type BalanceErrorCode =
  | "required" // the value is missing
  | "not-a-string" // a quantity arrived as a number or another type instead of a decimal string
  | "not-a-decimal" // the string is not a plain decimal such as "512.4"
  | "not-finite" // "NaN", "Infinity" and the like
  | "negative" // a quantity below zero
  | "not-positive" // zero where only a positive quantity makes sense
  | "too-precise" // more significant digits than the engine carries
  | "out-of-range" // outside the range the field allows (factor 0–100 %, angles, crankpins…)
  | "not-an-integer" // cylinder and crankpin numbers, rods per pin
  | "empty" // an empty set or an empty list of readings
  | "duplicate" // the same cylinder or plane twice
  | "unknown-preset" // no layout preset has this id
  | "unknown-unit" // a unit outside the list the function accepts
  | "unknown-grade" // not one of the ISO 21940-11 balance grades
  | "unknown-kind" // a target for a kind of part the engine does not know
  | "kind-not-weighed" // a target for a kind of part no cylinder has a weight for
  | "incomplete-kind" // some cylinders have a weight for this kind and others do not
  | "layout-mismatch" // the cylinders do not fit the layout
  | "too-many-rods" // more rods on a crankpin than the layout allows
  | "unknown-cylinder" // a group or pairing names a cylinder that is not in the set
  | "unknown-plane" // a reading names a correction plane the allowance does not have
  | "missing-plane" // a correction plane has no reading
  | "conflict"; // two inputs that say the same thing differently (oil allowance per rod and per crankpin)

/**
 * The one error `lib/balance` throws for bad input. `field` is a dotted path into the
 * input, array positions included (`"cylinders.2.piston"`, `"cylinders.0.piston.1"` for the
 * second reading of the first cylinder's piston), so a form can put the message beside the
 * right box.
 *
 * @example
 * try {
 *   computeBalance(input);
 * } catch (error) {
 *   if (error instanceof BalanceInputError) console.log(error.field, error.code); // "cylinders.2.piston" "negative"
 * }
 */
export class BalanceInputError extends Error {
  override readonly name = "BalanceInputError";

  constructor(
    /** Dotted path of the offending input, e.g. `"cylinders.2.piston"`. */
    readonly field: string,
    /** Machine-readable reason. */
    readonly code: BalanceErrorCode,
    message: string,
  ) {
    super(message);
  }
}

/**
 * Type guard for {@link BalanceInputError}, for callers that receive `unknown` from a catch.
 *
 * @example
 * isBalanceInputError(new BalanceInputError("rpm", "not-positive", "rpm must be above zero")); // true
 */
export function isBalanceInputError(error: unknown): error is BalanceInputError {
  return error instanceof BalanceInputError;
}
