import { z } from "zod";
import { BROUGHT_ITEMS } from "@/db/jobs";
import { JOB_STATUSES, PART_KINDS, ROTATING_PARTS } from "@/db/schema";
import {
  findLayoutPreset,
  isBalanceInputError,
  LAYOUT_PRESETS,
  parseDrillSize,
} from "@/lib/balance";
import { PART_NAMES } from "@/lib/workshop/outliers";
import { customerSchema } from "./customers";
import { decimalString, positiveDecimal } from "./decimal";
import { isZeroReading } from "./readings";

export { readingsTextSchema } from "./readings";

const layoutIds = LAYOUT_PRESETS.map((p) => p.id) as [string, ...string[]];

// Every refusal of a job setting names the field as the form labels it, so a message read
// anywhere (beside the box, in the save line, in an API answer) says which box to fix.

const PLAIN_DECIMAL = /^\d{1,9}(\.\d{1,9})?$/;
/** A form's empty box (or a missing value) is "not given". */
const blankAsNull = (v: unknown) => (v === "" || v === undefined ? null : v);
/** Numbers typed in a box arrive as text; "" is "not given", anything else is read as a number. */
const textToNumber = (v: unknown) =>
  v === "" || v === undefined || v === null
    ? null
    : typeof v === "string" && /^\s*-?\d+(\.\d+)?\s*$/.test(v)
      ? Number(v)
      : v;

/** A quantity typed at the bench, refused with the field's own name. */
function quantity(label: string, example: string, { zero = false } = {}) {
  const words = `${label}: enter a number like ${example} (digits and one point).`;
  return z
    .string({ message: words })
    .trim()
    .regex(PLAIN_DECIMAL, words)
    .refine((v) => zero || Number(v) > 0, `${label} must be more than zero.`);
}

function wholeNumber(label: string, min: number, max: number, example: string) {
  const words = `${label}: a whole number from ${min} to ${max}, like ${example}.`;
  return z.number({ message: words }).int(words).min(min, words).max(max, words);
}

/** A length typed in the job's length unit ("4.030" in or "102.36" mm); blank: not known. */
const enteredLength = (label: string) =>
  z.preprocess(blankAsNull, quantity(label, "92.00 or 3.622").nullable()).optional();

/** The engine and balancing settings of a job, as the booking and settings forms send them. */
export const jobSpecSchema = z
  .object({
    layout: z.enum(layoutIds, { message: "Layout: choose one from the list." }),
    rodsPerPin: z
      .preprocess(textToNumber, wholeNumber("Rods per crankpin", 1, 4, "2").nullable())
      .optional(),
    bobweightNeeded: z.boolean({ message: "Bobweight needed: yes or no." }).nullable().optional(),
    cylinders: z.preprocess(
      (v) => (v === null || v === undefined ? v : textToNumber(v)),
      wholeNumber("Cylinders", 1, 16, "8"),
    ),
    /** Lengths in mm, as the engine takes them (older callers send these directly). */
    boreMm: z.preprocess(blankAsNull, quantity("Bore (mm)", "92.00").nullable()).optional(),
    strokeMm: z.preprocess(blankAsNull, quantity("Stroke (mm)", "86.00").nullable()).optional(),
    rodLengthMm: z
      .preprocess(blankAsNull, quantity("Rod length (mm)", "143.00").nullable())
      .optional(),
    /** The unit bore, stroke and rod length are typed in; the server keeps them as typed. */
    lengthUnit: z.enum(["mm", "in"], { message: "Lengths in: mm or inches." }).optional(),
    bore: enteredLength("Bore"),
    stroke: enteredLength("Stroke"),
    rodLength: enteredLength("Rod length"),
    maxRpm: z
      .preprocess(textToNumber, wholeNumber("Max service speed", 100, 30_000, "7000").nullable())
      .optional(),
    massUnit: z.enum(["g", "oz"], { message: "Weights in: grams or ounces." }).optional(),
    scaleResolution: quantity("Scale resolution", "0.1").optional(),
    scaleName: z
      .string()
      .trim()
      .max(80, "Scale used: at most 80 characters.")
      .nullable()
      .optional(),
    balancerName: z
      .string()
      .trim()
      .max(80, "Balancer used: at most 80 characters.")
      .nullable()
      .optional(),
    tolerance: quantity("Tolerance", "0.5").optional(),
    /** Blank: the layout's own factor (or none, for a layout balanced without bobweights). */
    balanceFactor: z
      .preprocess(
        blankAsNull,
        quantity("Balance factor", "50", { zero: true })
          .refine((v) => Number(v) <= 100, "Balance factor: from 0 to 100 %.")
          .nullable(),
      )
      .optional(),
    /** Per crankpin: the older form of the oil allowance. New callers send `oilAllowancePerRod`. */
    oilAllowance: quantity("Oil allowance per crankpin", "4", { zero: true }).optional(),
    oilAllowancePerRod: quantity("Oil allowance per rod", "2", { zero: true }).optional(),
    benchOrder: z.enum(["by-kind", "by-cylinder"]).optional(),
    matching: z.enum(["by-part", "by-cylinder"]).optional(),
    /** The drill's diameter in mm (older callers); the settings form sends `drillSize`. */
    drillDiameterMm: z
      .preprocess(blankAsNull, quantity("Drill diameter (mm)", "9.5").nullable())
      .optional(),
    /** A drill size as written: "8.5", "8.5 mm", "3/8", "0.375 in", "#21", "F". Blank: none. */
    drillSize: z
      .preprocess(
        blankAsNull,
        z
          .string({ message: "Drill size: write it like 8.5 mm, 3/8, #21 or F." })
          .trim()
          .max(40, "Drill size: at most 40 characters.")
          .superRefine((text, ctx) => {
            try {
              parseDrillSize(text, "drillSize");
            } catch (error) {
              ctx.addIssue({
                code: "custom",
                message: isBalanceInputError(error)
                  ? error.message
                  : "Drill size: write it like 8.5 mm, 3/8, #21 or F.",
              });
            }
          })
          .nullable(),
      )
      .optional(),
    material: z.string().max(200).nullable().optional(),
    items: z
      .array(
        z.object({
          item: z.enum(BROUGHT_ITEMS, { message: "What came in: choose from the list." }),
          // A count of parts: "abc", 2.5 or nothing is refused, never booked as 0.
          quantity: z.preprocess(textToNumber, wholeNumber("Quantity", 1, 64, "8")),
          condition: z
            .string()
            .trim()
            .max(200, "Condition of a part: at most 200 characters.")
            .nullable(),
        }),
      )
      .max(BROUGHT_ITEMS.length)
      .optional(),
    condition: z
      .string()
      .trim()
      .max(2000, "Condition notes: at most 2000 characters.")
      .nullable()
      .optional(),
    /** Blank: no date promised. */
    promisedDate: z
      .preprocess(
        blankAsNull,
        z.iso.date({ message: "Promised for: a date like 2026-12-24." }).nullable(),
      )
      .optional(),
    balanceType: z
      .preprocess(
        blankAsNull,
        z.enum(["internal", "external"], { message: "Balance: internal or external." }).nullable(),
      )
      .optional(),
    pairingGroups: z
      .array(z.array(z.number().int().min(1).max(16)).min(1).max(16))
      .max(8)
      .nullable()
      .optional(),
  })
  .strict();
export type JobSpecInput = z.infer<typeof jobSpecSchema>;

/** Engine description and work asked for, refused in the booking form's own words. */
export const bookingEngineField = z
  .string({ message: "Engine: describe it, like cross-plane V8, 4.030 in bore." })
  .trim()
  .min(1, "Engine: describe it, like cross-plane V8, 4.030 in bore.")
  .max(200, "Engine: at most 200 characters.");
export const bookingNotesField = z
  .string()
  .trim()
  .max(4000, "Work asked for: at most 4000 characters.");

/**
 * Booking a job in: an existing customer (`customerId`) or one met at the counter (`customer`,
 * saved with the job in one transaction, so a refused booking leaves no customer behind).
 */
export const bookingSchema = z
  .object({
    customerId: z.coerce
      .number({ message: "Customer: choose one from the search, or add a new one." })
      .int("Customer: choose one from the search, or add a new one.")
      .positive("Customer: choose one from the search, or add a new one.")
      .optional(),
    customer: customerSchema.optional(),
    engine: bookingEngineField,
    notes: bookingNotesField.nullable().optional(),
    spec: jobSpecSchema,
  })
  .strict()
  .superRefine((booking, ctx) => {
    if (booking.customerId === undefined && booking.customer === undefined)
      ctx.addIssue({
        code: "custom",
        path: ["customerId"],
        message: "Customer: choose one from the search, or add a new one.",
      });
    if (booking.customerId !== undefined && booking.customer !== undefined)
      ctx.addIssue({
        code: "custom",
        path: ["customerId"],
        message: "Customer: choose an existing one or add a new one, not both.",
      });
  });
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
    /** The machinist confirms readings far from the rest of the kind (lib/workshop/outliers.ts). */
    confirmOutlier: z.boolean().optional(),
  })
  .strict()
  .superRefine((write, ctx) => {
    if (write.readings.some(isZeroReading))
      ctx.addIssue({
        code: "custom",
        path: ["readings"],
        message: `Cylinder ${write.cylinder} ${PART_NAMES[write.kind].one}: a weight of zero is not a reading. Weigh the part again.`,
      });
  });

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

/** An angle on the balancer's dial, degrees; 360 is the same mark as 0. */
const dialAngle = z.preprocess(
  blankToNull,
  decimalString.refine((v) => Number(v) <= 360, "An angle from 0 to 360°.").nullable(),
);

/**
 * The units a rotating record is typed in: readings and corrections in grams or ounces (the
 * rotor's mass then in kg or lb), radius and plane distances in mm or inches. A record saved
 * without them is grams and millimetres.
 */
export const ROTATING_MASS_UNITS = ["g", "oz"] as const;
export type RotatingMassUnit = (typeof ROTATING_MASS_UNITS)[number];
export const ROTATING_LENGTH_UNITS = ["mm", "in"] as const;
export type RotatingLengthUnit = (typeof ROTATING_LENGTH_UNITS)[number];

/** How a record's units are named in the machinist's words. */
export const ROTATING_UNIT_WORDS = {
  g: { mass: "grams", reading: "0.4", correction: "4.2", rotor: "kg" },
  oz: { mass: "ounces", reading: "0.015", correction: "0.15", rotor: "lb" },
} as const;

/** A balancer reading in one plane, in the record's mass unit, and where the heavy spot is. */
function planeReadingIn(unit: RotatingMassUnit) {
  const words = `Enter the ${ROTATING_UNIT_WORDS[unit].mass} the balancer reads, like ${ROTATING_UNIT_WORDS[unit].reading}.`;
  return z.preprocess(
    (v) => {
      // Both boxes left empty: the plane was not read. An angle alone still needs its mass.
      if (!v || typeof v !== "object") return v;
      const { mass, angle } = v as { mass?: unknown; angle?: unknown };
      return (mass === "" || mass === undefined || mass === null) &&
        (angle === "" || angle === undefined || angle === null)
        ? null
        : v;
    },
    z
      .object({
        mass: z.string({ message: words }).trim().min(1, words).pipe(decimalString),
        angle: dialAngle.optional(),
      })
      .nullable(),
  );
}

/** Correction methods on a crank, flywheel, clutch cover or damper. */
export const CORRECTION_METHODS = ["drilled", "heavy-metal", "added", "other"] as const;

function correctionIn(unit: RotatingMassUnit) {
  const words = `Enter the ${ROTATING_UNIT_WORDS[unit].mass} of this correction, like ${ROTATING_UNIT_WORDS[unit].correction}.`;
  return z.object({
    plane: z.enum(["A", "B"], { message: "Choose plane A or B." }),
    method: z.enum(CORRECTION_METHODS, { message: "Choose how the correction was made." }),
    where: z.string().trim().max(120, "At most 120 characters."),
    mass: z.string({ message: words }).trim().min(1, words).pipe(positiveDecimal),
    angle: dialAngle.optional(),
  });
}

/**
 * How many correction planes the part is balanced in: a crankshaft in two; a flexplate,
 * flywheel, clutch cover or damper usually in one (the whole allowance in that plane).
 */
export const CORRECTION_PLANES = ["one", "two"] as const;
export type CorrectionPlanes = (typeof CORRECTION_PLANES)[number];

/** The same figure sent twice, as typed and under its older millimetre/kilogram name. */
const TWICE: [typed: string, older: string, words: string][] = [
  ["rotorMass", "massKg", "Rotor mass"],
  ["radius", "radiusMm", "Balancer reading radius"],
  ["planeDistanceA", "planeDistanceAMm", "Plane A from centre of mass"],
  ["planeDistanceB", "planeDistanceBMm", "Plane B from centre of mass"],
];

/**
 * The record of one rotating part on the balancer, typed in one mass unit (the messages name
 * it): readings before and after, corrections, the rotor and where it is read. The form uses
 * this for the job's unit; the server picks it by the record's `massUnit`.
 */
export function rotatingRecordSchemaIn(unit: RotatingMassUnit) {
  const reading = planeReadingIn(unit);
  return z
    .object({
      massUnit: z.enum(ROTATING_MASS_UNITS, { message: "Weights in: grams or ounces." }).optional(),
      lengthUnit: z
        .enum(ROTATING_LENGTH_UNITS, { message: "Lengths in: mm or inches." })
        .optional(),
      /** The rotor's mass as typed: kg with grams, lb with ounces. */
      rotorMass: optionalPositive,
      /** Older callers: the rotor's mass in kg, whatever the unit. */
      massKg: optionalPositive,
      rpm: z
        .preprocess(
          blankToNull,
          z
            .number({ message: "Service speed: a whole number of rpm, like 7000." })
            .int("Service speed: a whole number of rpm, like 7000.")
            .min(100, "At least 100 rpm.")
            .max(30_000, "At most 30 000 rpm.")
            .nullable(),
        )
        .optional(),
      grade: z.string().max(10).nullable().optional(),
      /** Balancer reading radius as typed, in the record's length unit. */
      radius: optionalPositive,
      /** Older callers: the radius in mm. */
      radiusMm: optionalPositive,
      planes: z.enum(CORRECTION_PLANES, { message: "One plane or two." }).optional(),
      /** Plane distances from the centre of mass as typed, in the record's length unit. */
      planeDistanceA: optionalPositive,
      planeDistanceB: optionalPositive,
      /** Older callers: the plane distances in mm. */
      planeDistanceAMm: optionalPositive,
      planeDistanceBMm: optionalPositive,
      before: z.object({ A: reading, B: reading }).partial().optional(),
      after: z.object({ A: reading, B: reading }).partial().optional(),
      corrections: z.array(correctionIn(unit)).max(40).optional(),
      notes: z.string().trim().max(2000).nullable().optional(),
    })
    .strict()
    .superRefine((record, ctx) => {
      const values = record as Record<string, unknown>;
      for (const [typed, older, words] of TWICE)
        if (values[typed] && values[older])
          ctx.addIssue({
            code: "custom",
            path: [typed],
            message: `${words}: give it once (${typed} in the record's unit, or ${older}).`,
          });
    });
}

const RECORD_SCHEMAS = { g: rotatingRecordSchemaIn("g"), oz: rotatingRecordSchemaIn("oz") };

/**
 * The record of one rotating part, read in the unit it says it was typed in (`massUnit`,
 * grams when absent), so a refusal names grams or ounces as the machinist typed them.
 */
export const rotatingRecordSchema = z.preprocess((value, ctx) => {
  // A record in ounces is read with the ounce messages; its shape is the same as in grams.
  if (!value || typeof value !== "object" || (value as { massUnit?: unknown }).massUnit !== "oz")
    return value;
  const parsed = RECORD_SCHEMAS.oz.safeParse(value);
  if (!parsed.success)
    for (const issue of parsed.error.issues)
      ctx.addIssue({ code: "custom", message: issue.message, path: issue.path });
  return value;
}, RECORD_SCHEMAS.g);
export type RotatingRecordInput = z.output<ReturnType<typeof rotatingRecordSchemaIn>>;

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
    /**
     * The last pairing the machinist saw applied (its id in the change history; 0 for none).
     * When another has been applied or undone since, the request is refused (409).
     */
    lastPairingId: z.number().int().min(0).optional(),
  })
  .strict();

/** Undoes the last pairing applied, named by its id in the change history (409 if not the last). */
export const pairingUndoSchema = z.object({ pairingId: z.number().int().positive() }).strict();

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
