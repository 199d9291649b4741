import { normaliseScaleNumber } from "./reading";
import { readScaleUnit, type ScaleMassUnit } from "./units";

/** A weight as a scale prints it: sign, spaces, the number, a unit, then maybe a mark. */
export type WeightField = {
  value: string;
  unit?: ScaleMassUnit;
  /** A word after the number that is not a mass unit ("pcs", "%"). */
  otherUnit?: string;
  /** What followed the unit: "?" or a status word, upper-cased. */
  mark?: string;
};

const FIELD =
  /^([+-]?)\s*(\d+(?:\.\d*)?|\.\d+)\s*(?:([a-z%]+(?: t(?=\s|$))?))?\s*(\?|\*|[A-Z]{1,2})?$/i;

/**
 * Reads `[sign][spaces]number[spaces][unit][spaces][? or status]`, e.g. "+   123.45 g ?".
 *
 * @returns the field, or `null` when the text is not a weight
 * @example
 * readWeightField("+00123.45  g"); // { value: "123.45", unit: "g" }
 * readWeightField("-   0.50 oz ?"); // { value: "-0.50", unit: "oz", mark: "?" }
 */
export function readWeightField(text: string): WeightField | null {
  const m = FIELD.exec(text.trim());
  if (!m) return null;
  const value = normaliseScaleNumber(m[1] ?? "", m[2] ?? "");
  if (value === null) return null;
  const field: WeightField = { value };
  let unitToken = m[3];
  let mark = m[4]?.toUpperCase();
  // "123.45 ST": a status word alone, no unit.
  if (unitToken && !mark && readScaleUnit(unitToken) === null && isStatusWord(unitToken)) {
    mark = unitToken.toUpperCase();
    unitToken = undefined;
  }
  if (unitToken) {
    const unit = readScaleUnit(unitToken);
    if (unit) field.unit = unit;
    else field.otherUnit = unitToken;
  }
  if (mark) {
    if (mark !== "?" && mark !== "*" && !isStatusWord(mark)) return null;
    field.mark = mark;
  }
  return field;
}

/** Status words a print line may end with: stable or not. */
const STATUS_WORDS: Readonly<Record<string, "stable" | "unstable">> = {
  S: "stable",
  ST: "stable",
  U: "unstable",
  US: "unstable",
  D: "unstable",
  "?": "unstable",
  "*": "unstable",
};

function isStatusWord(word: string): boolean {
  return word.toUpperCase() in STATUS_WORDS;
}

/** Whether a print line's trailing mark says the reading is stable (no mark: stable). */
export function markIsStable(mark: string | undefined): boolean {
  return mark === undefined || STATUS_WORDS[mark.toUpperCase()] === "stable";
}
