import { convertScaleMass, GRAMS_PER_UNIT, ScaleDecimal, type ScaleMassUnit } from "./units";

/** The units a job's weights are kept in. */
export type JobMassUnit = "g" | "oz";

/** Most decimals a weight may carry (the weigh-in's number rule). */
export const MAX_READING_DECIMALS = 9;

export type JobUnitResult = { ok: true; value: string } | { ok: false; message: string };

const UNIT_WORDS: Readonly<Record<JobMassUnit, string>> = { g: "grams", oz: "ounces" };

/**
 * A scale reading in the job's unit.
 *
 * Same unit (or none printed): the figure as the scale sent it, its decimals kept. Another mass
 * unit: converted with the exact factors (NIST SP 811 / Handbook 44 App. C), then rounded half
 * up to the fewest decimals whose step is no more than a tenth of the scale's own step in the
 * job's unit, so the rounding (at most half a step) stays within a twentieth of what the scale
 * could tell apart; never more than {@link MAX_READING_DECIMALS}. A unit that is not a mass
 * (pieces, percent) is refused.
 *
 * @param value - the reading as a decimal string ("498.6")
 * @param unit - the unit the scale printed, `undefined` for none, or the word it printed
 * @param jobUnit - the job's unit
 * @example
 * readingInJobUnit("17.5", "oz", "g"); // { ok: true, value: "496.1" }
 *   // 17.5 × 28.349523125 = 496.1166546875 g; the scale's step 0.1 oz = 2.83 g, a tenth of it
 *   // 0.28 g → 1 decimal (0.1 g)
 * readingInJobUnit("498.6", "g", "oz"); // { ok: true, value: "17.5876" }
 *   // 498.6 / 28.349523125 = 17.58759… oz; step 0.1 g = 0.0035 oz, a tenth 0.00035 → 4 decimals
 */
export function readingInJobUnit(
  value: string,
  unit: ScaleMassUnit | string | undefined,
  jobUnit: JobMassUnit,
): JobUnitResult {
  if (unit === undefined || unit === jobUnit) return { ok: true, value };
  if (!(unit in GRAMS_PER_UNIT))
    return {
      ok: false,
      message: `The scale sent "${unit}", not a weight: set it to weigh in ${UNIT_WORDS[jobUnit]}.`,
    };
  const from = unit as ScaleMassUnit;
  const decimalsRead = value.includes(".") ? value.split(".")[1]!.length : 0;
  const stepInJobUnit = new ScaleDecimal(10)
    .pow(-decimalsRead)
    .times(GRAMS_PER_UNIT[from])
    .dividedBy(GRAMS_PER_UNIT[jobUnit]);
  const tenth = stepInJobUnit.dividedBy(10);
  let places = 0;
  while (places < MAX_READING_DECIMALS && new ScaleDecimal(10).pow(-places).greaterThan(tenth))
    places += 1;
  const converted = new ScaleDecimal(convertScaleMass(value, from, jobUnit));
  return { ok: true, value: converted.toFixed(places, ScaleDecimal.ROUND_HALF_UP) };
}
