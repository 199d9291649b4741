import { type Dec, out } from "./decimal";
import { AssemblyInputError } from "./errors";
import { parseAngle, requireRecord } from "./parse";

export interface CamCorrectionInput {
  /** Intake centreline measured by the equal-lift method, crank degrees after TDC. */
  measuredCentreline: string;
  /** Intake centreline the card says to install at, crank degrees after TDC. */
  specCentreline: string;
  /**
   * The settings the offset key, bushing or multi-keyway sprocket offers, as crank degrees of
   * advance from the present setting (retard negative), e.g. `["-4", "0", "4", "8"]`. Many
   * are marked in crank degrees, some in cam degrees: check yours and double cam degrees.
   */
  positions?: readonly string[];
}

/** Which way to turn the cam against the crank. */
export type CamMoveDirection = "advance" | "retard" | "none";

export interface CamCorrectionResult {
  /** Crank degrees to move the cam, always zero or above. */
  move: string;
  direction: CamMoveDirection;
  /** The same move at the cam sprocket: half the crank degrees (the cam turns at half speed). */
  camDegrees: string;
  /** The offered setting nearest the move (as given), when `positions` is given. */
  position?: string;
  /** Intake centreline after moving to `position`, crank degrees after TDC. */
  resultingCentreline?: string;
  /**
   * What is left after moving to `position`, in the same sign as `intakeCentreline`'s
   * advance: card − resulting centreline, above zero = still advanced.
   */
  resultingAdvance?: string;
}

/**
 * How far and which way to move the cam so the measured intake centreline lands on the card's
 * (common practice): advancing the cam by x crank degrees makes every event, the centreline
 * included, happen x degrees earlier, so the move is measured − card. A measured 108° against
 * a card 106° means the cam is 2° retarded: advance it 2 crank degrees (1° at the sprocket).
 * With the settings the key or sprocket offers, picks the nearest (the smaller move on a
 * tie) and says where the centreline ends up. Re-degree the cam after any change.
 *
 * @param input - measured and card centrelines, and optionally the settings on offer
 * @returns the move in crank and cam degrees, its direction, and the nearest setting
 * @throws {AssemblyInputError} `measuredCentreline` not strictly between −180 and 360,
 *   `specCentreline` not strictly between 0 and 180, `positions` an empty list (`empty`) or
 *   `positions.<i>` not strictly between −180 and 180 (`out-of-range`)
 *
 * @example
 * camCorrection({ measuredCentreline: "108.5", specCentreline: "106", positions: ["-4", "0", "4"] });
 * // { move: "2.5", direction: "advance", camDegrees: "1.25", position: "4",
 * //   resultingCentreline: "104.5", resultingAdvance: "1.5" }
 * // (108.5 − 106 = 2.5 to advance; 4 is nearer 2.5 than 0 is; 108.5 − 4 = 104.5; 106 − 104.5 = 1.5)
 */
export function camCorrection(input: CamCorrectionInput): CamCorrectionResult {
  const raw = requireRecord(input);
  const measured = parseAngle(
    raw.measuredCentreline,
    { field: "measuredCentreline", label: "Measured intake centreline (° ATDC)" },
    -180,
    360,
  );
  const spec = parseAngle(
    raw.specCentreline,
    { field: "specCentreline", label: "Card intake centreline (° ATDC)" },
    0,
    180,
  );
  const needed = measured.minus(spec);
  const result: CamCorrectionResult = {
    move: out(needed.abs()),
    direction: needed.isZero() ? "none" : needed.gt(0) ? "advance" : "retard",
    camDegrees: out(needed.abs().div(2)),
  };
  if (raw.positions === undefined) return result;

  if (!Array.isArray(raw.positions) || raw.positions.length === 0) {
    throw new AssemblyInputError(
      "positions",
      "empty",
      "Key or sprocket settings must be a list with at least one setting",
    );
  }
  const offered = (raw.positions as unknown[]).map((value, index) => ({
    text: value as string,
    advance: parseAngle(
      value,
      { field: `positions.${index}`, label: `Setting ${index + 1} (crank degrees)` },
      -180,
      180,
    ),
  }));
  let best = offered[0] as { text: string; advance: Dec };
  for (const candidate of offered) {
    const gap = candidate.advance.minus(needed).abs();
    const bestGap = best.advance.minus(needed).abs();
    if (gap.lt(bestGap) || (gap.eq(bestGap) && candidate.advance.abs().lt(best.advance.abs()))) {
      best = candidate;
    }
  }
  const resulting = measured.minus(best.advance);
  result.position = best.text;
  result.resultingCentreline = out(resulting);
  result.resultingAdvance = out(spec.minus(resulting));
  return result;
}
