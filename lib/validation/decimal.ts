import { z } from "zod";

/** A measured quantity as typed at the bench: plain digits, an optional point, no sign or exponent. */
export const decimalString = z
  .string({ message: "Enter a number, like 512.4." })
  .trim()
  .max(20, "That number is too long.")
  .regex(/^\d{1,9}(\.\d{1,9})?$/, "Enter a number, like 512.4 (digits and one point).");

export const positiveDecimal = decimalString.refine(
  (v) => Number(v) > 0,
  "Must be more than zero.",
);
export const percentString = decimalString.refine((v) => Number(v) <= 100, "Between 0 and 100 %.");
