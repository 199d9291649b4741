import { Dec, out } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseQuantity } from "./parse";
import { MILLIMETRES_PER_INCH } from "./units";

/**
 * Number (wire-gauge) drill diameters #1 to #80, inches, as listed in ASME B94.11M (twist
 * drills). Written from memory of the standard's table; the tests check well-known entries
 * against published charts. Index 0 is #1.
 */
export const NUMBER_DRILL_INCHES: readonly string[] = [
  "0.2280", "0.2210", "0.2130", "0.2090", "0.2055", "0.2040", "0.2010", "0.1990", "0.1960", "0.1935", // #1–#10
  "0.1910", "0.1890", "0.1850", "0.1820", "0.1800", "0.1770", "0.1730", "0.1695", "0.1660", "0.1610", // #11–#20
  "0.1590", "0.1570", "0.1540", "0.1520", "0.1495", "0.1470", "0.1440", "0.1405", "0.1360", "0.1285", // #21–#30
  "0.1200", "0.1160", "0.1130", "0.1110", "0.1100", "0.1065", "0.1040", "0.1015", "0.0995", "0.0980", // #31–#40
  "0.0960", "0.0935", "0.0890", "0.0860", "0.0820", "0.0810", "0.0785", "0.0760", "0.0730", "0.0700", // #41–#50
  "0.0670", "0.0635", "0.0595", "0.0550", "0.0520", "0.0465", "0.0430", "0.0420", "0.0410", "0.0400", // #51–#60
  "0.0390", "0.0380", "0.0370", "0.0360", "0.0350", "0.0330", "0.0320", "0.0310", "0.0292", "0.0280", // #61–#70
  "0.0260", "0.0250", "0.0240", "0.0225", "0.0210", "0.0200", "0.0180", "0.0160", "0.0145", "0.0135", // #71–#80
]; // prettier-ignore

/**
 * Letter drill diameters A to Z, inches, as listed in ASME B94.11M. Written from memory of the
 * standard's table; the tests check well-known entries against published charts.
 */
export const LETTER_DRILL_INCHES: Readonly<Record<string, string>> = {
  A: "0.234", B: "0.238", C: "0.242", D: "0.246", E: "0.250", F: "0.257", G: "0.261",
  H: "0.266", I: "0.272", J: "0.277", K: "0.281", L: "0.290", M: "0.295", N: "0.302",
  O: "0.316", P: "0.323", Q: "0.332", R: "0.339", S: "0.348", T: "0.358", U: "0.368",
  V: "0.377", W: "0.386", X: "0.397", Y: "0.404", Z: "0.413",
}; // prettier-ignore

/** Largest drill the helpers take, mm (4 in): far above any balancing hole. */
export const MAX_DRILL_DIAMETER_MM = "101.6";

/** How the size was written: the unit a person reads it back in. */
export type DrillSizeKind = "metric" | "fraction" | "decimal-inch" | "number" | "letter";

export interface DrillSize {
  /** Diameter, mm, exact (inch sizes × 25.4). */
  diameterMm: string;
  /** Diameter, inches, exact (mm sizes ÷ 25.4, rounded to the engine's result digits). */
  diameterIn: string;
  /** The size as a machinist writes it: "8.5 mm", `3/8"`, `1-1/4"`, `0.375"`, "#21", "letter F". */
  entered: string;
  /** The unit the size was given in; number and letter sizes are inch sizes. */
  unit: "mm" | "in";
  kind: DrillSizeKind;
}

const MM = new Dec(MILLIMETRES_PER_INCH);
const MAX_MM = new Dec(MAX_DRILL_DIAMETER_MM);
const DECIMAL = "(\\d+(?:\\.\\d+)?|\\.\\d+)";
const INCH_WORD = "(?:\"|”|''|in\\.?|inch|inches)";
const METRIC = new RegExp(`^${DECIMAL}\\s*(?:mm)?$`, "i");
const DECIMAL_INCH = new RegExp(`^${DECIMAL}\\s*${INCH_WORD}$`, "i");
const FRACTION = new RegExp(
  `^(?:(\\d+)(?:\\s*-\\s*|\\s+))?(\\d+)\\s*/\\s*(\\d+)\\s*${INCH_WORD}?$`,
  "i",
);
const NUMBER = /^(?:#|no\.?|nr\.?|number|num\.?)\s*(\d{1,2})(?:\s*(?:drill|wire gauge|gauge))?$/i;
const LETTER = /^(?:letter\s*)?([a-z])(?:\s*drill)?$/i;

function refuse(field: string, text: string): never {
  throw new BalanceInputError(
    field,
    "not-a-decimal",
    `Drill size "${text}" is not a size we read: give mm (8.5 or 8.5 mm), an inch fraction ` +
      `(3/8, 3/8" or 1-1/4"), decimal inches (0.375 in), a number size (#21 or No. 21) or a letter size (F).`,
  );
}

/**
 * Reads a drill size as a machinist writes it and gives its diameter in millimetres.
 * A bare number is millimetres; fractions are always inches; number sizes #1–#80 and letter
 * sizes A–Z come from the ASME B94.11M twist-drill table (inch sizes); 1 in = 25.4 mm exactly
 * (NIST SP 811 App. B.8). A drill is never wider than {@link MAX_DRILL_DIAMETER_MM} here.
 *
 * @param text - the size as typed: "8.5", "8.5 mm", "3/8", `3/8"`, "0.375 in", "1-1/4", "#21",
 *   "No. 21", "F", "letter F"
 * @param field - the input's name for the error, default "drillSize"
 * @returns the diameter in mm and in inches (decimal strings), the size as a machinist reads
 *   it back, the unit it was given in and its kind
 * @throws {BalanceInputError} `field` with code `required` when empty, `not-a-decimal` when the
 *   text is not a size, `out-of-range` for a number size outside #1–#80 or a size above 101.6 mm,
 *   `not-positive` for a zero size
 *
 * @example
 * parseDrillSize("3/8"); // { diameterMm: "9.525", diameterIn: "0.375", entered: '3/8"', unit: "in", kind: "fraction" }
 * parseDrillSize("#21").diameterMm; // "4.0386"  (0.1590 in × 25.4)
 * parseDrillSize("letter F").diameterMm; // "6.5278"  (0.257 in × 25.4)
 * parseDrillSize("8.5 mm").entered; // "8.5 mm"
 */
export function parseDrillSize(text: string, field = "drillSize"): DrillSize {
  if (typeof text !== "string" || text.trim() === "") {
    throw new BalanceInputError(field, "required", 'Drill size is required (e.g. 8.5 mm or 3/8").');
  }
  const raw = text.trim().replace(/\s+/g, " ");
  if (raw.length > 40) refuse(field, raw.slice(0, 40));

  const inches = (value: Dec, entered: string, kind: DrillSizeKind): DrillSize =>
    finish(field, value.times(MM), value, entered, "in", kind);

  let m = METRIC.exec(raw);
  if (m) {
    const mm = parseQuantity(normalDecimal(m[1]!), field, "non-negative");
    return finish(field, mm, mm.div(MM), `${out(mm)} mm`, "mm", "metric");
  }
  m = DECIMAL_INCH.exec(raw);
  if (m) {
    const value = parseQuantity(normalDecimal(m[1]!), field, "non-negative");
    return inches(value, `${normalDecimal(m[1]!)}"`, "decimal-inch");
  }
  m = FRACTION.exec(raw);
  if (m) {
    const whole = m[1] === undefined ? new Dec(0) : new Dec(m[1]);
    const numerator = new Dec(m[2]!);
    const denominator = new Dec(m[3]!);
    if (denominator.isZero()) refuse(field, raw);
    const value = whole.plus(numerator.div(denominator));
    const fraction = `${m[2]}/${m[3]}`;
    return inches(value, `${m[1] === undefined ? fraction : `${m[1]}-${fraction}`}"`, "fraction");
  }
  m = NUMBER.exec(raw);
  if (m) {
    const n = Number(m[1]);
    const size = NUMBER_DRILL_INCHES[n - 1];
    if (size === undefined) {
      throw new BalanceInputError(
        field,
        "out-of-range",
        `Number drills run from #1 to #80 (got #${m[1]}).`,
      );
    }
    return inches(new Dec(size), `#${n}`, "number");
  }
  m = LETTER.exec(raw);
  if (m) {
    const letter = m[1]!.toUpperCase();
    return inches(new Dec(LETTER_DRILL_INCHES[letter]!), `letter ${letter}`, "letter");
  }
  return refuse(field, raw);
}

/** ".375" → "0.375", so the engine's plain-decimal rule accepts it. */
function normalDecimal(value: string): string {
  return value.startsWith(".") ? `0${value}` : value;
}

function finish(
  field: string,
  mm: Dec,
  inches: Dec,
  entered: string,
  unit: "mm" | "in",
  kind: DrillSizeKind,
): DrillSize {
  if (mm.isZero()) throw new BalanceInputError(field, "not-positive", "A drill size above zero.");
  if (mm.gt(MAX_MM)) {
    throw new BalanceInputError(
      field,
      "out-of-range",
      `Drill size ${entered} is more than ${MAX_DRILL_DIAMETER_MM} mm (4 in): not a balancing drill.`,
    );
  }
  return { diameterMm: out(mm), diameterIn: out(inches), entered, unit, kind };
}
