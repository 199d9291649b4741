import { z } from "zod";
import { measure, RING_POSITIONS, RING_USES } from "./schemas";

// The shop's build settings (owner): the ring gap factor table, the smallest coil-bind margin,
// the clearance-per-inch-of-journal window and the lift at which cams are checked.

const factor = z
  .string({ message: "Factor: a gap per unit of bore like 0.0045." })
  .trim()
  .regex(/^0?\.\d{1,6}$/, "Factor: a gap per unit of bore like 0.0045.")
  .transform((v) => (v.startsWith(".") ? `0${v}` : v))
  .refine((v) => Number(v) > 0 && Number(v) < 0.05, "Factor: above 0 and below 0.05.");

export const ringFactorRowSchema = z
  .object({
    maker: z
      .string({ message: "Ring maker: name the maker (or the ring set)." })
      .trim()
      .min(1, "Ring maker: name the maker (or the ring set).")
      .max(80),
    position: z.enum(RING_POSITIONS, { message: "Ring: top, second or oil rails." }),
    use: z.enum(RING_USES, { message: "Use: street, boost/nitrous or race." }),
    factor,
  })
  .strict();
export type RingFactorRow = z.output<typeof ringFactorRowSchema>;

const ratio = (label: string) =>
  z.preprocess(
    (v) => (v === "" || v === undefined ? null : v),
    z
      .string({ message: `${label}: a ratio like 0.0010 (0.0010 in per inch of journal).` })
      .trim()
      .regex(/^0?\.\d{1,6}$/, `${label}: a ratio like 0.0010 (0.0010 in per inch of journal).`)
      .transform((v) => (v.startsWith(".") ? `0${v}` : v))
      .nullable(),
  );

export const buildSettingsSchema = z
  .object({
    ringFactors: z.array(ringFactorRowSchema).max(200),
    lengthUnit: z.enum(["in", "mm"], { message: "Lengths in: in or mm." }),
    minCoilBindMargin: measure("Smallest coil-bind margin", "0.060"),
    clearancePerInch: z
      .object({
        min: ratio("Clearance per inch of journal, smallest"),
        max: ratio("Clearance per inch of journal, largest"),
      })
      .strict()
      .refine((w) => w.min === null || w.max === null || Number(w.max) >= Number(w.min), {
        path: ["max"],
        message: "Clearance per inch of journal, largest: at least the smallest.",
      }),
    camCheckLift: measure("Lift for cam checks", "0.050"),
  })
  .strict();
export type BuildSettings = z.output<typeof buildSettingsSchema>;

/** Nothing set yet: every figure is the engine maker's or the ring maker's to give. */
export const EMPTY_BUILD_SETTINGS: BuildSettings = {
  ringFactors: [],
  lengthUnit: "in",
  minCoilBindMargin: null,
  clearancePerInch: { min: null, max: null },
  camCheckLift: null,
};

export const buildSettingsWriteSchema = z
  .object({ version: z.number().int().min(0), settings: buildSettingsSchema })
  .strict();
