import { normaliseScaleNumber } from "./reading";
import { type JobMassUnit, readingInJobUnit } from "./to-job-unit";
import { readScaleUnit } from "./units";

export type WedgeResult = { ok: true; readings: string[] } | { ok: false; message: string };

// One reading: sign, spaces, the number, spaces, a unit word; then a separator or the end.
const TOKEN = /([+-]?)\s*(\d+(?:\.\d*)?|\.\d+)\s*([a-z%]+(?: t)?)?(?=[\s/;]|$)[\s/;]*/iy;

/**
 * Reads what a keyboard-wedge scale types into a weigh box: "+ 498.6 g", "  17.5 oz", or
 * several readings "498.6 g 498.7 g"; plain typed figures ("498.6 498.7") pass through as
 * typed. A reading in another mass unit is converted to the job's unit by
 * {@link readingInJobUnit}; a unit that is not a mass, or a negative reading, is refused.
 *
 * @returns the readings in the job's unit, or `null` when the text is not of this shape (the
 *   weigh box's own number rule then says what is wrong)
 * @example
 * readWedgeReadings("+ 498.6 g", "g"); // { ok: true, readings: ["498.6"] }
 * readWedgeReadings("+ 17.5 oz", "g"); // { ok: true, readings: ["496.1"] }
 * readWedgeReadings("12 pcs", "g"); // { ok: false, message: 'The scale sent "pcs", …' }
 */
export function readWedgeReadings(text: string, jobUnit: JobMassUnit): WedgeResult | null {
  const body = text.replace(/^[\s/;]+/, "");
  const readings: string[] = [];
  TOKEN.lastIndex = 0;
  while (TOKEN.lastIndex < body.length) {
    const start = TOKEN.lastIndex;
    const m = TOKEN.exec(body);
    if (!m || TOKEN.lastIndex === start) return null;
    const [, sign = "", digits = "", unitWord] = m;
    if (!sign && !unitWord) {
      readings.push(digits);
      continue;
    }
    const value = normaliseScaleNumber(sign, digits);
    if (value === null) return null;
    if (value.startsWith("-"))
      return {
        ok: false,
        message: "A weight below zero is not a reading: zero the scale and weigh again.",
      };
    const unit = unitWord === undefined ? undefined : (readScaleUnit(unitWord) ?? unitWord);
    const inJobUnit = readingInJobUnit(value, unit, jobUnit);
    if (!inJobUnit.ok) return inJobUnit;
    readings.push(inJobUnit.value);
  }
  return { ok: true, readings };
}
