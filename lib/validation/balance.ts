import { z } from "zod";
import { BALANCE_GRADES } from "@/lib/balance";
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

/** POST /api/balance/hole: the hole and correction helpers, one per "kind". */
export const holeRequestSchema = z.discriminatedUnion("kind", [
  z
    .object({
      kind: z.literal("drill"),
      mass: positiveDecimal,
      diameter: positiveDecimal,
      density: positiveDecimal,
      pointAngle: positiveDecimal.optional(),
    })
    .strict(),
  z
    .object({
      kind: z.literal("plug"),
      diameter: positiveDecimal,
      length: positiveDecimal,
      plugDensity: positiveDecimal,
      hostDensity: positiveDecimal,
    })
    .strict(),
  z
    .object({
      kind: z.literal("move"),
      mass: positiveDecimal,
      fromRadius: positiveDecimal,
      toRadius: positiveDecimal,
    })
    .strict(),
  z
    .object({ kind: z.literal("split"), mass: positiveDecimal, halfAngleDeg: decimalString })
    .strict(),
]);
