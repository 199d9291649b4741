import { z } from "zod";

// What each section of the build record holds, as the build screen sends it and the server
// stores it (a JSON column per section, parsed with these schemas on the way in and out).
// Lengths are decimal strings in the record's length unit, kept as typed (a leading point is
// given its zero: ".015" → "0.015"), so they show at the precision they were entered; angles
// are crank degrees unless said otherwise; a blank box is null.

export const BUILD_SECTIONS = [
  "specs",
  "rings",
  "tdc",
  "cam",
  "springs",
  "clearances",
  "deck",
] as const;
export type BuildSection = (typeof BUILD_SECTIONS)[number];

export const RING_POSITIONS = ["top", "second", "oil"] as const;
export type RingPosition = (typeof RING_POSITIONS)[number];
export const RING_USES = ["street", "boost", "race"] as const;
export type RingUse = (typeof RING_USES)[number];
export const VALVES = ["intake", "exhaust"] as const;
export const JOURNAL_KINDS = ["main", "rod"] as const;

const blank = (v: unknown) => (v === "" || v === undefined ? null : v);
const leadingZero = (v: string) => v.replace(/^(-?)\./, "$10.");

/** A length or volume as typed (digits and one point), at most 9 digits each side. */
export function measure(label: string, example: string) {
  const words = `${label}: a number like ${example}.`;
  return z.preprocess(
    blank,
    z
      .string({ message: words })
      .trim()
      .regex(/^(\d{1,9}(\.\d{1,9})?|\.\d{1,9})$/, words)
      .transform(leadingZero)
      .nullable(),
  );
}

/** A quantity that can be below zero (a piston out of the hole, a dome's volume). */
export function signedMeasure(label: string, example: string) {
  const words = `${label}: a number like ${example} (minus sign allowed).`;
  return z.preprocess(
    blank,
    z
      .string({ message: words })
      .trim()
      .regex(/^-?(\d{1,9}(\.\d{1,9})?|\.\d{1,9})$/, words)
      .transform(leadingZero)
      .nullable(),
  );
}

/** A degree-wheel reading, −360 to 360 with up to three decimals. */
export function angle(label: string, example: string) {
  const words = `${label}: degrees like ${example} (minus for before TDC).`;
  return z.preprocess(
    blank,
    z
      .string({ message: words })
      .trim()
      .regex(/^-?\d{1,3}(\.\d{1,3})?$/, words)
      .refine((v) => Math.abs(Number(v)) < 360, `${label}: between −360° and 360°.`)
      .nullable(),
  );
}

const gapFactor = (label: string) => {
  const words = `${label}: a gap per unit of bore like 0.0045 (0.0045 in per inch of bore).`;
  return z.preprocess(
    blank,
    z
      .string({ message: words })
      .trim()
      .regex(/^(0?\.\d{1,6})$/, words)
      .transform(leadingZero)
      .refine((v) => Number(v) > 0 && Number(v) < 0.05, words)
      .nullable(),
  );
};

const cylinder = z
  .number({ message: "Cylinder: a whole number from 1 to 16." })
  .int("Cylinder: a whole number from 1 to 16.")
  .min(1, "Cylinder: a whole number from 1 to 16.")
  .max(16, "Cylinder: a whole number from 1 to 16.");

const window = (label: string, example: string) =>
  z
    .object({
      min: measure(`${label}, smallest`, example),
      max: measure(`${label}, largest`, example),
    })
    .strict()
    .refine((w) => w.min === null || w.max === null || Number(w.max) >= Number(w.min), {
      path: ["max"],
      message: `${label}, largest: at least the smallest.`,
    });

/** The engine's own figures for this job: from the cam card, the spring and ring makers. */
export const specsSchema = z
  .object({
    lengthUnit: z.enum(["in", "mm"], { message: "Lengths in: in or mm." }),
    loadUnit: z.enum(["lb", "N"], { message: "Spring loads in: lb or N." }),
    bore: measure("Finished bore", "4.030"),
    stroke: measure("Stroke", "3.480"),
    ringMaker: z.preprocess(blank, z.string().trim().max(80).nullable()),
    ringUse: z.preprocess(
      blank,
      z.enum(RING_USES, { message: "Use: street, boost/nitrous or race." }).nullable(),
    ),
    ringFactors: z
      .object({
        top: gapFactor("Top ring gap factor"),
        second: gapFactor("Second ring gap factor"),
        oil: gapFactor("Oil rail gap factor"),
      })
      .strict(),
    cam: z
      .object({
        intakeOpenBtdc: angle("Intake opens (° BTDC)", "31"),
        intakeCloseAbdc: angle("Intake closes (° ABDC)", "63"),
        exhaustOpenBbdc: angle("Exhaust opens (° BBDC)", "73"),
        exhaustCloseAtdc: angle("Exhaust closes (° ATDC)", "21"),
        installCentreline: angle("Install at intake centreline (° ATDC)", "106"),
      })
      .strict(),
    spring: z
      .object({
        installedHeight: measure("Spring installed height", "1.800"),
        rate: measure("Spring rate", "300"),
        solidHeight: measure("Solid (coil-bind) height", "1.150"),
        lift: measure("Valve lift at the retainer", "0.500"),
        seatLoadMin: measure("Seat load, smallest", "100"),
        seatLoadMax: measure("Seat load, largest", "115"),
      })
      .strict()
      .refine(
        (s) =>
          s.seatLoadMin === null ||
          s.seatLoadMax === null ||
          Number(s.seatLoadMax) >= Number(s.seatLoadMin),
        { path: ["seatLoadMax"], message: "Seat load, largest: at least the smallest." },
      ),
    clearance: z
      .object({
        main: window("Main bearing clearance", "0.0020"),
        rod: window("Rod bearing clearance", "0.0020"),
      })
      .strict(),
    compression: z
      .object({
        chamberCc: measure("Chamber volume (cc)", "64.0"),
        pistonCc: signedMeasure("Piston dish (+) or dome (−) volume (cc)", "5.0"),
        gasketBore: measure("Gasket bore", "4.100"),
        gasketThickness: measure("Gasket thickness", "0.041"),
      })
      .strict(),
  })
  .strict();

export const ringsSchema = z
  .object({
    rows: z
      .array(
        z
          .object({
            cylinder,
            ring: z.enum(RING_POSITIONS, { message: "Ring: top, second or oil rails." }),
            /** Every gap measured, in order; the last is the ring as it is now. */
            readings: z
              .array(measure("Measured gap", "0.018"))
              .max(12)
              .transform((all) => all.filter((v): v is string => v !== null)),
            done: z.boolean(),
          })
          .strict(),
      )
      .max(48),
  })
  .strict();

export const tdcSchema = z
  .object({
    firstStop: angle("First stop reading", "-18"),
    secondStop: angle("Second stop reading", "22"),
  })
  .strict();

export const camSchema = z
  .object({
    lift: measure("Checking lift", "0.050"),
    checks: z
      .array(
        z
          .object({
            openingSide: angle("Opening side (° ATDC)", "62"),
            closingSide: angle("Closing side (° ATDC)", "146"),
            /** The crank turned twice and TDC checked again before this reading. */
            final: z.boolean(),
          })
          .strict(),
      )
      .max(12),
  })
  .strict();

export const springsSchema = z
  .object({
    rows: z
      .array(
        z
          .object({
            cylinder,
            valve: z.enum(VALVES, { message: "Valve: intake or exhaust." }),
            installedHeight: measure("Installed height", "1.800"),
            shim: measure("Shim", "0.030"),
            seatLoad: measure("Load at installed height", "105"),
          })
          .strict(),
      )
      .max(64),
  })
  .strict();

const readingsGrid = (label: string) => z.array(z.array(measure(label, "2.4525")).max(2)).max(2);

export const clearancesSchema = z
  .object({
    rows: z
      .array(
        z
          .object({
            kind: z.enum(JOURNAL_KINDS, { message: "Journal: main or rod." }),
            journal: z
              .number({ message: "Journal number: 1 to 16." })
              .int()
              .min(1, "Journal number: 1 to 16.")
              .max(16, "Journal number: 1 to 16."),
            /** Bearing bore, shells in and cap torqued: [front, rear] × [vertical, horizontal]. */
            bore: readingsGrid("Bearing bore"),
            /** Journal diameter, the same positions and directions. */
            journalDiameter: readingsGrid("Journal diameter"),
          })
          .strict(),
      )
      .max(32),
  })
  .strict();

export const deckSchema = z
  .object({
    rows: z
      .array(
        z
          .object({
            cylinder,
            /** Piston top to deck at TDC as measured: below the deck +, above it −. */
            deckClearance: signedMeasure("Deck clearance", "0.005"),
            chamberCc: measure("Chamber volume (cc)", "64.0"),
          })
          .strict(),
      )
      .max(16),
  })
  .strict();

export const SECTION_SCHEMAS = {
  specs: specsSchema,
  rings: ringsSchema,
  tdc: tdcSchema,
  cam: camSchema,
  springs: springsSchema,
  clearances: clearancesSchema,
  deck: deckSchema,
} as const;

export type SpecsData = z.output<typeof specsSchema>;
export type RingsData = z.output<typeof ringsSchema>;
export type TdcData = z.output<typeof tdcSchema>;
export type CamData = z.output<typeof camSchema>;
export type SpringsData = z.output<typeof springsSchema>;
export type ClearancesData = z.output<typeof clearancesSchema>;
export type DeckData = z.output<typeof deckSchema>;

export interface BuildRecordData {
  specs: SpecsData;
  rings: RingsData;
  tdc: TdcData;
  cam: CamData;
  springs: SpringsData;
  clearances: ClearancesData;
  deck: DeckData;
}

/** A section as it starts before anything is typed. */
export function emptySection<S extends BuildSection>(
  section: S,
  lengthUnit: "in" | "mm" = "in",
): BuildRecordData[S] {
  const empty: BuildRecordData = {
    specs: {
      lengthUnit,
      loadUnit: lengthUnit === "in" ? "lb" : "N",
      bore: null,
      stroke: null,
      ringMaker: null,
      ringUse: null,
      ringFactors: { top: null, second: null, oil: null },
      cam: {
        intakeOpenBtdc: null,
        intakeCloseAbdc: null,
        exhaustOpenBbdc: null,
        exhaustCloseAtdc: null,
        installCentreline: null,
      },
      spring: {
        installedHeight: null,
        rate: null,
        solidHeight: null,
        lift: null,
        seatLoadMin: null,
        seatLoadMax: null,
      },
      clearance: { main: { min: null, max: null }, rod: { min: null, max: null } },
      compression: { chamberCc: null, pistonCc: null, gasketBore: null, gasketThickness: null },
    },
    rings: { rows: [] },
    tdc: { firstStop: null, secondStop: null },
    cam: { lift: null, checks: [] },
    springs: { rows: [] },
    clearances: { rows: [] },
    deck: { rows: [] },
  };
  return empty[section];
}

/** What a PUT of one section sends: the data and the version it was based on (0: never saved). */
export function sectionWriteSchema<S extends BuildSection>(section: S) {
  return z
    .object({
      version: z
        .number({ message: "Version: send the version you read (0 if never saved)." })
        .int()
        .min(0),
      data: SECTION_SCHEMAS[section],
    })
    .strict();
}
