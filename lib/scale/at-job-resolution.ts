import { formatMass, formatUnbalance } from "@/lib/balance";
import { type JobMassUnit, readingInJobUnit } from "./to-job-unit";
import { convertScaleMass, GRAMS_PER_UNIT, ScaleDecimal, type ScaleMassUnit } from "./units";

/** How the scale's own step compares with the job's scale resolution. */
export type ScaleStepFit = "same" | "finer" | "coarser";

export type JobReading =
  | {
      ok: true;
      /** The reading in the job's unit at the job's resolution (the display rule, formatMass). */
      value: string;
      /** How the scale's step (read from the decimals it printed) compares with the job's. */
      fit: ScaleStepFit;
      /** Said once in the scale panel when the scale reads finer or coarser than the job; else null. */
      note: string | null;
    }
  | { ok: false; message: string };

/** "0.01" for a figure printed with two decimals, "1" for none. */
function printedStep(value: string): string {
  const decimals = value.includes(".") ? value.split(".")[1]!.length : 0;
  return decimals === 0 ? "1" : `0.${"0".repeat(decimals - 1)}1`;
}

/**
 * A scale reading as the job records it: in the job's unit, rounded once, from the exact
 * figure, to the job's scale resolution by the display rule ({@link formatMass}: halves away
 * from zero at the resolution's step). The scale's own step is read from the decimals it
 * printed; where it is finer or coarser than the job's resolution, `note` says so in a
 * sentence for the machinist.
 *
 * @param value - the reading as the scale printed it, a decimal string ("401.70")
 * @param unit - the unit the scale printed, `undefined` for none (taken as the job's unit)
 * @param jobUnit - the job's unit, "g" or "oz"
 * @param resolution - the job's scale resolution in the job's unit, e.g. "0.1"
 * @returns `{ ok: true, value, fit, note }`, or `{ ok: false, message }` for a unit that is not
 *   a mass (as {@link readingInJobUnit})
 * @throws {BalanceInputError} when `resolution` is not a positive decimal string
 * @example
 * readingAtJobResolution("401.70", "g", "g", "0.1");
 * // { ok: true, value: "401.7", fit: "finer",
 * //   note: "The scale reads to 0.01 g; this job records to 0.1 g: …" }
 * readingAtJobResolution("17.500", "oz", "g", "0.1");
 * // 17.5 × 28.349523125 = 496.1166546875 g → "496.1"; 0.001 oz = 0.028 g, finer
 */
export function readingAtJobResolution(
  value: string,
  unit: ScaleMassUnit | string | undefined,
  jobUnit: JobMassUnit,
  resolution: string,
): JobReading {
  const checked = readingInJobUnit(value, unit, jobUnit);
  if (!checked.ok) return checked;
  const from: ScaleMassUnit = unit === undefined ? jobUnit : (unit as ScaleMassUnit);
  const exact = from === jobUnit ? value : convertScaleMass(value, from, jobUnit);
  const rounded = formatMass(exact, resolution);
  const step = printedStep(value);
  const stepInJobUnit = new ScaleDecimal(step)
    .times(GRAMS_PER_UNIT[from])
    .dividedBy(GRAMS_PER_UNIT[jobUnit]);
  const cmp = stepInJobUnit.comparedTo(new ScaleDecimal(resolution));
  const fit: ScaleStepFit = cmp < 0 ? "finer" : cmp > 0 ? "coarser" : "same";
  const scaleReads =
    from === jobUnit
      ? `${step} ${jobUnit}`
      : `${step} ${from} (${formatUnbalance(stepInJobUnit.toString())} ${jobUnit})`;
  const job = `${resolution} ${jobUnit}`;
  const note =
    fit === "finer"
      ? `The scale reads to ${scaleReads}; this job records to ${job}: each reading goes in rounded to ${job}.`
      : fit === "coarser"
        ? `The scale reads to ${scaleReads}; this job records to ${job}: readings go in no finer than the scale tells apart. A scale that reads to ${job} or finer matches the job.`
        : null;
  return { ok: true, value: rounded, fit, note };
}
