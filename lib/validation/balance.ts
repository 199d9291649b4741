import { z } from "zod";
import { BALANCE_GRADES, isBalanceInputError, parseDrillSize } from "@/lib/balance";
import { decimalString, percentString, positiveDecimal } from "./decimal";

const weight = z.union([decimalString, z.array(decimalString).min(1).max(10)]);

/** The body of POST /api/balance: computeBalance's input, checked at the edge. */
export const balanceRequestSchema = z
  .object({
    unit: z.enum(["g", "oz"]).optional(),
    tolerance: positiveDecimal.optional(),
    resolution: positiveDecimal.optional(),
    layout: z.union([
      z.object({ preset: z.string().min(1).max(40) }).strict(),
      z.object({ rodsPerPin: z.number().int().min(1).max(4), bobweight: z.boolean() }).strict(),
    ]),
    balanceFactor: percentString.optional(),
    oilAllowance: decimalString.optional(),
    targets: z
      .object({
        piston: positiveDecimal,
        wristPin: positiveDecimal,
        retainers: positiveDecimal,
        rings: positiveDecimal,
        smallEnd: positiveDecimal,
        bigEnd: positiveDecimal,
      })
      .partial()
      .strict()
      .optional(),
    cylinders: z
      .array(
        z
          .object({
            number: z.number().int().min(1).max(16),
            crankpin: z.number().int().min(1).max(16).optional(),
            piston: weight,
            wristPin: weight,
            retainers: weight.optional(),
            rings: weight.optional(),
            smallEnd: weight,
            bigEnd: weight,
            bearing: weight.optional(),
            rodTotal: weight.optional(),
          })
          .strict(),
      )
      .min(1, "Enter at least one cylinder.")
      .max(16),
  })
  .strict();

const grade = z
  .string()
  .trim()
  .transform((g) => g.replace(/^G\s*/i, ""))
  .pipe(z.enum(BALANCE_GRADES, { message: "Choose an ISO 21940-11 grade, G 0.4 to G 4000." }));

// The angle is checked here so its message names the plane sent ("readings.A.angle").
const plane = z
  .object({
    mass: decimalString,
    radius: positiveDecimal,
    angle: decimalString.refine((v) => Number(v) <= 360, "An angle from 0 to 360°.").optional(),
  })
  .strict();

/** POST /api/balance/crank: permissible residual per plane, and optionally a check of readings. */
export const crankRequestSchema = z
  .object({
    grade,
    rotorMassKg: positiveDecimal,
    rpm: positiveDecimal,
    planes: z
      .object({ distanceA: positiveDecimal, distanceB: positiveDecimal })
      .strict()
      .optional(),
    correctionRadius: positiveDecimal.optional(),
    readings: z.object({ A: plane, B: plane }).strict().optional(),
  })
  .strict();

/**
 * A drill size as a machinist writes it: "8.5" or "8.5 mm", "3/8", "1-1/4\"", "0.375 in", "#21",
 * "F". A bare number is millimetres, as before. The engine's reader gives the message.
 */
export const drillSizeText = z
  .string({ message: 'Enter the drill size, like 8.5 mm or 3/8".' })
  .trim()
  .min(1, 'Enter the drill size, like 8.5 mm or 3/8".')
  .max(40, "That drill size is too long.")
  .superRefine((value, ctx) => {
    try {
      parseDrillSize(value);
    } catch (error) {
      if (!isBalanceInputError(error)) throw error;
      ctx.addIssue({ code: "custom", message: error.message });
    }
  });

/** An optional box left empty is "not given", from a form or an API caller alike. */
const blankToUndefined = (v: unknown) => (v === "" || v === null ? undefined : v);

/** Included point angle of a twist drill, degrees: 118 for a standard jobber drill. */
const pointAngle = z
  .preprocess(
    blankToUndefined,
    positiveDecimal
      .refine((v) => Number(v) < 180, "A point angle below 180° (118° for a standard twist drill).")
      .optional(),
  )
  .optional();

/** The job's units a helper's figures are typed in: grams unless "oz", mm unless "in". */
const helperMassUnit = z.enum(["g", "oz"], { message: "Weights in: grams or ounces." }).optional();
const helperLengthUnit = z.enum(["mm", "in"], { message: "Lengths in: mm or inches." }).optional();

/** Drill depth for a mass (the drill helper). */
export const drillHoleSchema = z
  .object({
    kind: z.literal("drill"),
    massUnit: helperMassUnit,
    lengthUnit: helperLengthUnit,
    /** Mass to take out, in massUnit (g). */
    mass: positiveDecimal,
    /** Drill size (see drillSizeText); a bare number is mm. */
    diameter: drillSizeText,
    density: positiveDecimal,
    pointAngle,
    /** Depth of metal there is to drill into, in lengthUnit (mm): the answer says whether the hole fits. */
    availableDepth: z.preprocess(blankToUndefined, positiveDecimal.optional()).optional(),
  })
  .strict();

/** Net mass of a heavy-metal plug (the heavy-metal helper). */
export const plugHoleSchema = z
  .object({
    kind: z.literal("plug"),
    lengthUnit: helperLengthUnit,
    /** Plug and hole size (see drillSizeText); a bare number is mm. */
    diameter: drillSizeText,
    /** Plug length, in lengthUnit (mm). */
    length: positiveDecimal,
    plugDensity: positiveDecimal,
    hostDensity: positiveDecimal,
    /** Point angle of the drill that made the hole: counts the empty cone under a flat plug. */
    pointAngle,
  })
  .strict();

/** A correction moved to another radius. */
export const moveHoleSchema = z
  .object({
    kind: z.literal("move"),
    massUnit: helperMassUnit,
    lengthUnit: helperLengthUnit,
    /** In massUnit (g); the radii in lengthUnit (mm). */
    mass: positiveDecimal,
    fromRadius: positiveDecimal,
    toRadius: positiveDecimal,
  })
  .strict();

/** A correction split over two holes at ±θ. */
export const splitHoleSchema = z
  .object({
    kind: z.literal("split"),
    massUnit: helperMassUnit,
    /** In massUnit (g). */
    mass: positiveDecimal,
    halfAngleDeg: decimalString.refine(
      (v) => Number(v) < 90,
      "Each hole less than 90° from the wanted angle.",
    ),
  })
  .strict();

/** POST /api/balance/hole: the hole and correction helpers, one per "kind". */
export const holeRequestSchema = z.discriminatedUnion("kind", [
  drillHoleSchema,
  plugHoleSchema,
  moveHoleSchema,
  splitHoleSchema,
]);
export type HoleRequest = z.infer<typeof holeRequestSchema>;
