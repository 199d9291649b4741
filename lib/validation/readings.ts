import { z } from "zod";
import { decimalString } from "./decimal";

// Its own small module: the weigh-in grid loads it in the browser, without the rest of the schemas.
/**
 * One weigh-in cell as typed: one reading, or repeated readings separated by spaces, "/" or ";".
 * Each reading is the same `decimalString` the API checks.
 */
export const readingsTextSchema = z
  .string()
  .max(120, "Too many readings.")
  .transform((text) => text.split(/[\s/;]+/).filter(Boolean))
  .refine((readings) => readings.every((r) => decimalString.safeParse(r).success), {
    message: "Enter a number, like 512.4; separate repeated readings with spaces.",
  })
  .refine((readings) => readings.length <= 10, { message: "At most 10 readings of one part." })
  .refine((readings) => !readings.some(isZeroReading), {
    message: "A weight of zero is not a reading: weigh the part again.",
  });

/** "0", "0.0", "000.00": a reading of nothing, refused at the grid and the API. */
export function isZeroReading(reading: string): boolean {
  return /^0+(\.0+)?$/.test(reading.trim());
}
