import { Dec, out } from "./decimal";
import { parseChoice, parseQuantity, requireAtMost, requireRecord } from "./parse";

/** The four ways a degree wheel marked 0–180–0 (or 0–90–0–90) reads, by the nearest dead centre. */
export const WHEEL_MARKS = ["BTDC", "ATDC", "BBDC", "ABDC"] as const;
export type WheelMark = (typeof WHEEL_MARKS)[number];

export interface WheelReadingInput {
  /** The number read on the wheel, degrees, 0 to 180. */
  reading: string;
  /** Which side of which dead centre the number is on. */
  mark: WheelMark;
}

/**
 * A degree-wheel reading as crank degrees after TDC (the convention every cam-degreeing
 * function in this module takes): BTDC x → −x, ATDC x → x, BBDC x → 180 − x, ABDC x → 180 + x.
 * Readings on the intake stroke run from about −90 (well before TDC) to about 270 (well after
 * BDC) with the engine turned in its normal direction of rotation.
 *
 * @param input - the wheel's number and the dead centre it counts from
 * @returns `{ degreesAtdc }`, crank degrees after TDC (negative before TDC)
 * @throws {AssemblyInputError} `reading` missing, negative or over 180; `mark` not one of
 *   "BTDC", "ATDC", "BBDC", "ABDC" (`unknown-unit`)
 *
 * @example
 * toDegreesAtdc({ reading: "30", mark: "ABDC" }); // { degreesAtdc: "210" }   (180 + 30)
 * toDegreesAtdc({ reading: "8", mark: "BTDC" }); // { degreesAtdc: "-8" }
 */
export function toDegreesAtdc(input: WheelReadingInput): { degreesAtdc: string } {
  const raw = requireRecord(input);
  const readingName = { field: "reading", label: "Wheel reading" };
  const reading = requireAtMost(
    parseQuantity(raw.reading, readingName, "non-negative"),
    readingName,
    new Dec(180),
    "0 to 180 degrees",
  );
  const mark = parseChoice(raw.mark, { field: "mark", label: "Wheel side" }, WHEEL_MARKS);
  const degrees =
    mark === "BTDC"
      ? reading.neg()
      : mark === "ATDC"
        ? reading
        : mark === "BBDC"
          ? new Dec(180).minus(reading)
          : new Dec(180).plus(reading);
  return { degreesAtdc: out(degrees) };
}
