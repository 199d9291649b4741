import { type Dec, MILLIMETRES_PER_INCH } from "./decimal";
import { parseChoice } from "./parse";

/** The length units the volume computations accept; volumes are always cm³ (cc). */
export const LENGTH_UNITS = ["mm", "in"] as const;
export type AssemblyLengthUnit = (typeof LENGTH_UNITS)[number];

/** @internal Parses `lengthUnit` (default mm). */
export function parseLengthUnit(value: unknown): AssemblyLengthUnit {
  return parseChoice(value, { field: "lengthUnit", label: "Length unit" }, LENGTH_UNITS, "mm");
}

/** @internal A length in `unit` as millimetres (1 in = 25.4 mm exactly). */
export function toMillimetres(value: Dec, unit: AssemblyLengthUnit): Dec {
  return unit === "in" ? value.times(MILLIMETRES_PER_INCH) : value;
}

/** @internal Millimetres back to `unit`. */
export function fromMillimetres(value: Dec, unit: AssemblyLengthUnit): Dec {
  return unit === "in" ? value.div(MILLIMETRES_PER_INCH) : value;
}
