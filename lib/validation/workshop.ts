import { z } from "zod";
import { BROUGHT_ITEMS } from "@/db/jobs";
import { JOB_STATUSES, PART_KINDS, ROTATING_PARTS } from "@/db/schema";
import { findLayoutPreset, LAYOUT_PRESETS } from "@/lib/balance";
import { decimalString, percentString, positiveDecimal } from "./decimal";

export { readingsTextSchema } from "./readings";

const layoutIds = LAYOUT_PRESETS.map((p) => p.id) as [string, ...string[]];

/** The engine and balancing settings of a job, as the booking and settings forms send them. */
export const jobSpecSchema = z
  .object({
    layout: z.enum(layoutIds, { message: "Choose a layout." }),
    rodsPerPin: z.coerce.number().int().min(1).max(4).nullable().optional(),
    bobweightNeeded: z.boolean().nullable().optional(),
    cylinders: z.coerce
      .number()
      .int("Whole cylinders only.")
      .min(1, "At least one cylinder.")
      .max(16, "At most 16 cylinders."),
    boreMm: positiveDecimal.nullable().optional(),
    strokeMm: positiveDecimal.nullable().optional(),
    rodLengthMm: positiveDecimal.nullable().optional(),
    maxRpm: z.coerce
      .number()
      .int()
      .min(100, "At least 100 rpm.")
      .max(30_000, "At most 30 000 rpm.")
      .nullable()
      .optional(),
    massUnit: z.enum(["g", "oz"]).optional(),
    scaleResolution: positiveDecimal.optional(),
    scaleName: z.string().trim().max(80).nullable().optional(),
    balancerName: z.string().trim().max(80).nullable().optional(),
    tolerance: positiveDecimal.optional(),
    balanceFactor: percentString.nullable().optional(),
    oilAllowance: decimalString.optional(),
    benchOrder: z.enum(["by-kind", "by-cylinder"]).optional(),
    drillDiameterMm: positiveDecimal.nullable().optional(),
    material: z.string().max(200).nullable().optional(),
    items: z
      .array(
        z.object({
          item: z.enum(BROUGHT_ITEMS),
          quantity: z.coerce.number().int().min(0).max(64),
          condition: z.string().trim().max(200).nullable(),
        }),
      )
      .max(BROUGHT_ITEMS.length)
      .optional(),
    condition: z.string().trim().max(2000).nullable().optional(),
    promisedDate: z.iso.date({ message: "Use a date like 2026-12-24." }).nullable().optional(),
    balanceType: z.enum(["internal", "external"]).nullable().optional(),
    pairingGroups: z
      .array(z.array(z.number().int().min(1).max(16)).min(1).max(16))
      .max(8)
      .nullable()
      .optional(),
  })
  .strict();
export type JobSpecInput = z.infer<typeof jobSpecSchema>;

export const bookingSchema = z
  .object({
    customerId: z.coerce.number().int().positive("Choose a customer."),
    engine: z.string().trim().min(1, "Describe the engine.").max(200),
    notes: z.string().trim().max(4000).nullable().optional(),
    spec: jobSpecSchema,
  })
  .strict();
export type BookingInput = z.infer<typeof bookingSchema>;

export const specChangesSchema = z
  .object({
    version: z.number().int().positive(),
    spec: jobSpecSchema.partial(),
    status: z.enum(JOB_STATUSES).optional(),
  })
  .strict();

export const partKindField = z.enum(PART_KINDS, { message: "Not a kind of part." });

export const weightWriteSchema = z
  .object({
    cylinder: z.number().int().min(1).max(16),
    kind: partKindField,
    phase: z.enum(["initial", "final"]),
    readings: z.array(decimalString).max(10, "At most 10 readings of one part."),
    version: z.number().int().min(0),
  })
  .strict();

export const targetWriteSchema = z
  .object({
    kind: partKindField,
    target: positiveDecimal.nullable(),
    version: z.number().int().min(0),
  })
  .strict();

export const rotatingPartField = z.enum(ROTATING_PARTS);

/** A form's empty box means "not given". */
const blankToNull = (v: unknown) => (v === "" || v === undefined ? null : v);
const optionalPositive = z.preprocess(blankToNull, positiveDecimal.nullable()).optional();

const planeReading = z.preprocess(
  (v) =>
    v && typeof v === "object" && "mass" in v && (v as { mass: unknown }).mass === "" ? null : v,
  z
    .object({
      mass: decimalString,
      angle: z
        .preprocess(
          blankToNull,
          decimalString.refine((v) => Number(v) < 360, "Angle from 0 to 359.9°.").nullable(),
        )
        .optional(),
    })
    .nullable(),
);

const correction = z.object({
  plane: z.enum(["A", "B"]),
  method: z.enum(["drilled", "heavy-metal", "added", "other"]),
  where: z.string().trim().max(120),
  mass: decimalString,
});

/** The record of one rotating part on the balancer: readings before and after, and corrections. */
export const rotatingRecordSchema = z
  .object({
    massKg: optionalPositive,
    rpm: z.preprocess(blankToNull, z.number().int().min(100).max(30_000).nullable()).optional(),
    grade: z.string().max(10).nullable().optional(),
    radiusMm: optionalPositive,
    planeDistanceAMm: optionalPositive,
    planeDistanceBMm: optionalPositive,
    before: z.object({ A: planeReading, B: planeReading }).partial().optional(),
    after: z.object({ A: planeReading, B: planeReading }).partial().optional(),
    corrections: z.array(correction).max(40).optional(),
    notes: z.string().trim().max(2000).nullable().optional(),
  })
  .strict();
export type RotatingRecordInput = z.infer<typeof rotatingRecordSchema>;

export const rotatingWriteSchema = z
  .object({ data: rotatingRecordSchema, version: z.number().int().min(0) })
  .strict();

export const pairingApplySchema = z
  .object({
    assignment: z
      .array(
        z.object({
          rodCylinder: z.number().int().min(1).max(16),
          pistonFromCylinder: z.number().int().min(1).max(16),
        }),
      )
      .min(1)
      .max(16),
    groups: z
      .array(z.array(z.number().int().min(1).max(16)))
      .max(8)
      .optional(),
  })
  .strict();

/** A CSV of weights: previewed first, written only when the same file is sent back confirmed. */
export const weightsImportSchema = z
  .object({
    csv: z
      .string()
      .min(1, "Choose a CSV file.")
      .max(200_000, "The file is too large (200 000 characters at most)."),
    phase: z.enum(["initial", "final"]).default("initial"),
    confirm: z.boolean().default(false),
    /** "cylinder:kind:phase" → the version the preview showed; a part that moved since is a 409. */
    basedOn: z.record(z.string().max(40), z.number().int().min(0)).optional(),
  })
  .strict();

/**
 * Settings that are each valid but do not fit together: a preset layout has a fixed number of
 * cylinders. Answers field messages keyed as the request sent them, or null when they fit.
 */
export function specMismatch(spec: {
  layout?: string | null;
  cylinders?: number | null;
}): Record<string, string> | null {
  const preset = spec.layout ? findLayoutPreset(spec.layout) : undefined;
  if (!preset?.cylinders || spec.cylinders === undefined || spec.cylinders === null) return null;
  if (spec.cylinders === preset.cylinders) return null;
  return {
    "spec.cylinders": `${preset.label} has ${preset.cylinders} cylinders; choose the custom layout for anything else.`,
  };
}
