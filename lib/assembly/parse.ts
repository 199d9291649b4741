import { Dec, MAX_INPUT_SIGNIFICANT_DIGITS } from "./decimal";
import { AssemblyInputError } from "./errors";

// Input checks shared by every build computation. Quantities arrive as plain decimal strings;
// anything else is refused with the path of the field and the builder's name for it.

const PLAIN_DECIMAL = /^-?\d+(\.\d+)?$/;
const NON_FINITE = /^[+-]?(nan|infinity|inf)$/i;
// Long enough for any honest quantity; stops pathological strings before the regex and Decimal.
const MAX_INPUT_LENGTH = 100;

/** What a quantity may be: above zero, zero or above, or either sign. */
export type Sign = "positive" | "non-negative" | "signed";

/** A field's path in the input and its name in the builder's words, for messages. */
export interface FieldName {
  field: string;
  label: string;
}

/** Parses one decimal-string quantity, or throws an {@link AssemblyInputError} naming it. */
export function parseQuantity(value: unknown, name: FieldName, sign: Sign): Dec {
  const { field, label } = name;
  if (value === undefined || value === null || value === "") {
    throw new AssemblyInputError(field, "required", `${label} is required`);
  }
  if (typeof value !== "string") {
    const what = typeof value === "number" ? `, not the number ${String(value)}` : "";
    throw new AssemblyInputError(
      field,
      "not-a-string",
      `${label} must be a decimal string such as "4.030"${what}`,
    );
  }
  if (value.length > MAX_INPUT_LENGTH) {
    throw new AssemblyInputError(field, "too-precise", `${label} is too long to be a measurement`);
  }
  if (NON_FINITE.test(value)) {
    throw new AssemblyInputError(field, "not-finite", `${label} must be a finite number`);
  }
  if (!PLAIN_DECIMAL.test(value)) {
    throw new AssemblyInputError(
      field,
      "not-a-decimal",
      `${label} must be a plain decimal such as "4.030" (digits, one optional decimal point), not "${value}"`,
    );
  }
  const parsed = new Dec(value);
  if (parsed.sd() > MAX_INPUT_SIGNIFICANT_DIGITS) {
    throw new AssemblyInputError(
      field,
      "too-precise",
      `${label} has more than ${MAX_INPUT_SIGNIFICANT_DIGITS} significant digits`,
    );
  }
  if (sign !== "signed" && parsed.isNegative() && !parsed.isZero()) {
    throw new AssemblyInputError(field, "negative", `${label} cannot be negative (got ${value})`);
  }
  if (sign === "positive" && parsed.isZero()) {
    throw new AssemblyInputError(field, "not-positive", `${label} must be above zero`);
  }
  return parsed.isZero() ? new Dec(0) : parsed;
}

/** Parses an optional quantity: `undefined` (or an absent key) stays `undefined`. */
export function parseOptionalQuantity(
  value: unknown,
  name: FieldName,
  sign: Sign,
): Dec | undefined {
  return value === undefined ? undefined : parseQuantity(value, name, sign);
}

/** Refuses a value outside (min, max) — both bounds open — naming the field and the range. */
export function requireBetween(value: Dec, name: FieldName, min: Dec, max: Dec, what: string): Dec {
  if (value.lte(min) || value.gte(max)) {
    throw new AssemblyInputError(
      name.field,
      "out-of-range",
      `${name.label} must be ${what} (got ${value.toString()})`,
    );
  }
  return value;
}

/** Checks that the input is a plain object, to read fields from. */
export function requireRecord(value: unknown, field = "input"): Record<string, unknown> {
  if (typeof value !== "object" || value === null || Array.isArray(value)) {
    throw new AssemblyInputError(field, "required", `The ${field} must be an object`);
  }
  return value as Record<string, unknown>;
}

/**
 * Checks that a value is one of a fixed list of strings. An absent value gives `fallback`,
 * or is refused as `required` when there is none.
 */
export function parseChoice<T extends string>(
  value: unknown,
  name: FieldName,
  choices: readonly T[],
  fallback?: T,
): T {
  if (value === undefined && fallback !== undefined) return fallback;
  if (value === undefined) {
    throw new AssemblyInputError(name.field, "required", `${name.label} is required`);
  }
  if (typeof value === "string" && (choices as readonly string[]).includes(value)) {
    return value as T;
  }
  throw new AssemblyInputError(
    name.field,
    "unknown-unit",
    `${name.label} must be one of ${choices.map((c) => `"${c}"`).join(", ")} (got ${JSON.stringify(value)})`,
  );
}

/** Refuses a value above `max` (inclusive bound), naming the field and what it must be. */
export function requireAtMost(value: Dec, name: FieldName, max: Dec, what: string): Dec {
  if (value.gt(max)) {
    throw new AssemblyInputError(
      name.field,
      "out-of-range",
      `${name.label} must be ${what} (got ${value.toString()})`,
    );
  }
  return value;
}

/** Parses a signed angle in degrees strictly between `min` and `max`. */
export function parseAngle(value: unknown, name: FieldName, min: number, max: number): Dec {
  return requireBetween(
    parseQuantity(value, name, "signed"),
    name,
    new Dec(min),
    new Dec(max),
    `crank degrees between ${min} and ${max}`,
  );
}
