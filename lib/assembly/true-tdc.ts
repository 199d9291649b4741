import { out } from "./decimal";
import { AssemblyInputError } from "./errors";
import { parseAngle, requireRecord } from "./parse";

export interface TrueTdcInput {
  /** Wheel reading where the piston met the stop turning one way, degrees (ATDC +, BTDC −). */
  firstStop: string;
  /** Wheel reading where it met the stop turning the other way, same sign convention. */
  secondStop: string;
}

export interface TrueTdcResult {
  /**
   * What the wheel reads at true TDC: (first + second) / 2, degrees. Zero means the pointer is
   * already right; otherwise set the pointer (or turn the wheel) so that this reading becomes
   * 0, i.e. subtract it from every reading taken with the present setting.
   */
  offset: string;
  /** What each stop reads once corrected: half the angle between the stops, degrees. */
  eachSide: string;
}

/**
 * True TDC by the piston-stop method (common practice): turn the crank until the
 * piston touches a stop screwed into the plug hole (or bolted across the bore), read the
 * wheel, turn back the other way to the stop and read again; the piston reaches the stop at
 * equal angles either side of TDC, so true TDC lies midway. Turn by hand only and never
 * start the engine with the stop fitted.
 *
 * Sign convention: readings after TDC positive, before TDC negative, as the wheel is marked.
 *
 * @param input - the two stop readings, in either order
 * @returns the pointer correction and the reading both stops show once corrected
 * @throws {AssemblyInputError} `firstStop` or `secondStop` missing, not a decimal string or
 *   not strictly between −180 and 180 (`out-of-range`); `secondStop` equal to `firstStop`
 *   (`same-reading`: the piston did not reach the stop on one side)
 *
 * @example
 * trueTdc({ firstStop: "-18", secondStop: "22" });
 * // { offset: "2", eachSide: "20" }   ((−18 + 22) / 2 = 2; (22 − (−18)) / 2 = 20)
 */
export function trueTdc(input: TrueTdcInput): TrueTdcResult {
  const raw = requireRecord(input);
  const first = parseAngle(
    raw.firstStop,
    { field: "firstStop", label: "First stop reading (°)" },
    -180,
    180,
  );
  const second = parseAngle(
    raw.secondStop,
    { field: "secondStop", label: "Second stop reading (°)" },
    -180,
    180,
  );
  if (first.eq(second)) {
    throw new AssemblyInputError(
      "secondStop",
      "same-reading",
      "Second stop reading equals the first: turn the crank the other way until the piston meets the stop again",
    );
  }
  return {
    offset: out(first.plus(second).div(2)),
    eachSide: out(second.minus(first).abs().div(2)),
  };
}
