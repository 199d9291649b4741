import { BalanceInputError } from "./errors";
import { Dec, MAX_INPUT_SIGNIFICANT_DIGITS } from "./decimal";

// Input checks shared by every calculation. Quantities arrive as plain decimal strings;
// anything else is refused with the path of the offending field.

const UNSIGNED_DECIMAL = /^\d+(\.\d+)?$/;
const NEGATIVE_DECIMAL = /^-\d+(\.\d+)?$/;
const NON_FINITE = /^[+-]?(nan|infinity|inf)$/i;
// Long enough for any honest quantity; stops pathological strings before the regex and Decimal.
const MAX_INPUT_LENGTH = 100;

/** What a quantity may be: above zero, zero or above, or any sign (display helpers only). */
export type Sign = "positive" | "non-negative" | "signed";

/** Parses one decimal-string quantity, or throws a {@link BalanceInputError} naming `field`. */
export function parseQuantity(value: unknown, field: string, sign: Sign = "positive"): Dec {
  if (value === undefined || value === null || value === "") {
    throw new BalanceInputError(field, "required", `${field} is required`);
  }
  if (typeof value === "number") {
    throw new BalanceInputError(
      field,
      "not-a-string",
      `${field} must be a decimal string such as "512.4", not the number ${String(value)}`,
    );
  }
  if (typeof value !== "string") {
    throw new BalanceInputError(
      field,
      "not-a-string",
      `${field} must be a decimal string such as "512.4"`,
    );
  }
  if (value.length > MAX_INPUT_LENGTH) {
    throw new BalanceInputError(
      field,
      "too-precise",
      `${field} is too long to be a measured quantity`,
    );
  }
  if (NON_FINITE.test(value)) {
    throw new BalanceInputError(
      field,
      "not-finite",
      `${field} must be a finite number, not "${value}"`,
    );
  }
  const negative = NEGATIVE_DECIMAL.test(value);
  if (!negative && !UNSIGNED_DECIMAL.test(value)) {
    throw new BalanceInputError(
      field,
      "not-a-decimal",
      `${field} must be a plain decimal such as "512.4" (digits, one optional decimal point), not "${value}"`,
    );
  }
  const parsed = new Dec(value);
  if (negative && sign !== "signed" && !parsed.isZero()) {
    throw new BalanceInputError(field, "negative", `${field} cannot be negative (got "${value}")`);
  }
  if (sign === "positive" && parsed.isZero()) {
    throw new BalanceInputError(field, "not-positive", `${field} must be above zero`);
  }
  if (parsed.sd() > MAX_INPUT_SIGNIFICANT_DIGITS) {
    throw new BalanceInputError(
      field,
      "too-precise",
      `${field} has more than ${MAX_INPUT_SIGNIFICANT_DIGITS} significant digits`,
    );
  }
  return parsed.isZero() ? new Dec(0) : parsed;
}

/** Parses an optional quantity: `undefined` stays `undefined`. */
export function parseOptionalQuantity(
  value: unknown,
  field: string,
  sign: Sign = "positive",
): Dec | undefined {
  return value === undefined ? undefined : parseQuantity(value, field, sign);
}

/** A weight given once, or as repeated readings of the same part. */
export interface ParsedWeight {
  /** The single reading, or the mean of the readings. */
  value: Dec;
  /** Present when readings were given as a list. */
  readings?: Dec[];
  /** Heaviest minus lightest reading; present with `readings`. */
  spread?: Dec;
}

/** Parses a weight that is a decimal string or a non-empty list of repeated readings. */
export function parseWeight(value: unknown, field: string): ParsedWeight {
  if (!Array.isArray(value)) return { value: parseQuantity(value, field) };
  if (value.length === 0) {
    throw new BalanceInputError(field, "empty", `${field} has an empty list of readings`);
  }
  const readings = value.map((reading: unknown, index) =>
    parseQuantity(reading, `${field}.${index}`),
  );
  let sum = new Dec(0);
  let low = readings[0] as Dec;
  let high = low;
  for (const reading of readings) {
    sum = sum.plus(reading);
    if (reading.lt(low)) low = reading;
    if (reading.gt(high)) high = reading;
  }
  return { value: sum.div(readings.length), readings, spread: high.minus(low) };
}

/** Checks for a whole number in [min, max]. */
export function parseInteger(
  value: unknown,
  field: string,
  min: number,
  max = Number.MAX_SAFE_INTEGER,
): number {
  if (value === undefined || value === null) {
    throw new BalanceInputError(field, "required", `${field} is required`);
  }
  if (typeof value !== "number" || !Number.isInteger(value)) {
    throw new BalanceInputError(field, "not-an-integer", `${field} must be a whole number`);
  }
  if (value < min || value > max) {
    const range = max === Number.MAX_SAFE_INTEGER ? `${min} or more` : `from ${min} to ${max}`;
    throw new BalanceInputError(field, "out-of-range", `${field} must be ${range} (got ${value})`);
  }
  return value;
}

/** Checks that a value is a plain object, to read fields from. */
export function requireRecord(value: unknown, field: string): Record<string, unknown> {
  if (typeof value !== "object" || value === null || Array.isArray(value)) {
    throw new BalanceInputError(field, "required", `${field} must be an object`);
  }
  return value as Record<string, unknown>;
}

/** Checks that a value is one of a fixed list of strings. */
export function parseChoice<T extends string>(
  value: unknown,
  field: string,
  choices: readonly T[],
): T {
  if (typeof value === "string" && (choices as readonly string[]).includes(value))
    return value as T;
  throw new BalanceInputError(
    field,
    "unknown-unit",
    `${field} must be one of ${choices.map((c) => `"${c}"`).join(", ")} (got ${JSON.stringify(value)})`,
  );
}

/** Checks that a quantity is at most `max`. */
export function requireAtMost(value: Dec, max: Dec, field: string, what: string): Dec {
  if (value.gt(max)) {
    throw new BalanceInputError(
      field,
      "out-of-range",
      `${field} must be ${what} (got ${value.toString()})`,
    );
  }
  return value;
}
