import { z } from "zod";
import type { JobMassUnit } from "@/lib/scale/to-job-unit";
import { readWedgeReadings } from "@/lib/scale/wedge";
import { decimalString } from "./decimal";

// Its own small module: the weigh-in grid loads it in the browser, without the rest of the schemas.
/**
 * One weigh-in cell as typed: one reading, or repeated readings separated by spaces, "/" or ";".
 * Each reading is the same `decimalString` the API checks.
 */
export const readingsTextSchema = readingsRule((text) => text.split(/[\s/;]+/).filter(Boolean));

/**
 * The weigh-in cell's rule for a job in `unit`: as {@link readingsTextSchema}, and also what a
 * keyboard-wedge scale types ("+ 498.6 g", "  17.5 oz"): sign and unit dropped, another mass
 * unit converted to the job's (lib/scale/wedge.ts), a unit that is not a mass refused.
 */
export function readingsTextSchemaFor(unit: JobMassUnit) {
  return readingsRule((text, ctx) => {
    const wedge = readWedgeReadings(text, unit);
    if (wedge === null) return text.split(/[\s/;]+/).filter(Boolean);
    if (!wedge.ok) {
      ctx.addIssue({ code: "custom", message: wedge.message });
      return z.NEVER;
    }
    return wedge.readings;
  });
}

function readingsRule(split: (text: string, ctx: z.RefinementCtx) => string[]) {
  return z
    .string()
    .max(120, "Too many readings.")
    .transform(split)
    .refine((readings) => readings.every((r) => decimalString.safeParse(r).success), {
      message: "Enter a number, like 512.4; separate repeated readings with spaces.",
    })
    .refine((readings) => readings.length <= 10, { message: "At most 10 readings of one part." })
    .refine((readings) => !readings.some(isZeroReading), {
      message: "A weight of zero is not a reading: weigh the part again.",
    });
}

/** "0", "0.0", "000.00": a reading of nothing, refused at the grid and the API. */
export function isZeroReading(reading: string): boolean {
  return /^0+(\.0+)?$/.test(reading.trim());
}
