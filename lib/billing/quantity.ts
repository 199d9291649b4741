import type { PriceUnit } from "@/db/billing-schema";

/**
 * How many of a price-list entry a new line starts at: the job's cylinder count for an entry
 * charged per cylinder (a piston, a rod, a cylinder's assembly matched), 1 for anything else or
 * when the job's cylinder count is not known yet. The counter can change it on the line.
 *
 * @example
 * startingQuantity("per-cylinder", 8); // "8" (a V8: eight pistons to match)
 * startingQuantity("each", 8);         // "1" (one flywheel)
 * startingQuantity("per-cylinder", null); // "1" (cylinders not entered yet)
 */
export function startingQuantity(unit: PriceUnit, cylinders: number | null | undefined): string {
  if (unit === "per-cylinder" && cylinders !== null && cylinders !== undefined && cylinders >= 1) {
    return String(Math.trunc(cylinders));
  }
  return "1";
}
