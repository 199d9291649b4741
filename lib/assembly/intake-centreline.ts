import { out } from "./decimal";
import { AssemblyInputError } from "./errors";
import { parseAngle, requireRecord } from "./parse";

export interface IntakeCentrelineInput {
  /**
   * Crank degrees after TDC where the intake lifter reached the chosen lift on the way up
   * (e.g. 0.050 in before full lift), turning the engine in its normal direction.
   */
  openingSide: string;
  /**
   * Crank degrees after TDC where the lifter came back down to the same lift on the way down.
   * A reading past BDC is 180 + degrees after BDC (see `toDegreesAtdc`).
   */
  closingSide: string;
  /** Intake centreline the cam card says to install at, crank degrees after TDC. */
  specCentreline?: string;
}

/** Where the cam sits against the card, from the measured intake centreline. */
export type CamPhasing = "advanced" | "retarded" | "on-card";

export interface IntakeCentrelineResult {
  /** Measured intake centreline, crank degrees after TDC: (opening side + closing side) / 2. */
  centreline: string;
  /**
   * Crank degrees the cam is advanced against the card: spec − measured. Above zero the
   * measured centreline is earlier than the card's (cam advanced); below zero, retarded.
   * Present when `specCentreline` is given.
   */
  advance?: string;
  /** Present when `specCentreline` is given. */
  phasing?: CamPhasing;
}

/**
 * The intake centreline measured by the equal-lift method (as cam makers publish it; common practice): with a
 * dial indicator on the intake lifter and a degree wheel on the crank set to true TDC, read
 * the crank angle at the same lift on each side of full lift; full lift — the centreline —
 * lies midway: ICL = (θ₁ + θ₂) / 2. Reading both sides at one lift cancels the lobe's ramp
 * shape, which reading full lift alone cannot. Always turn the engine in its normal direction
 * so the timing chain or belt slack stays on the same side.
 *
 * Sign convention: both readings in crank degrees after TDC on the intake stroke (negative
 * before TDC, above 180 after BDC); `advance` = spec − measured, above zero = cam advanced.
 *
 * @param input - the two readings and, optionally, the card's installed centreline
 * @returns the measured centreline and, with a spec, how far it is advanced or retarded
 * @throws {AssemblyInputError} `openingSide` or `closingSide` missing, not a decimal string, or
 *   not strictly between −180 and 360 (`out-of-range`); `closingSide` not later than
 *   `openingSide` (`out-of-order`) or 360° or more after it (`out-of-range`); `specCentreline`
 *   not strictly between 0 and 180 (`out-of-range`)
 *
 * @example
 * intakeCentreline({ openingSide: "62", closingSide: "146", specCentreline: "106" });
 * // { centreline: "104", advance: "2", phasing: "advanced" }   ((62 + 146) / 2 = 104; 106 − 104 = 2)
 */
export function intakeCentreline(input: IntakeCentrelineInput): IntakeCentrelineResult {
  const raw = requireRecord(input);
  const opening = parseAngle(
    raw.openingSide,
    { field: "openingSide", label: "Opening-side reading (° ATDC)" },
    -180,
    360,
  );
  const closing = parseAngle(
    raw.closingSide,
    { field: "closingSide", label: "Closing-side reading (° ATDC)" },
    -180,
    360,
  );
  if (closing.lte(opening)) {
    throw new AssemblyInputError(
      "closingSide",
      "out-of-order",
      `Closing-side reading (${closing.toString()}° ATDC) must come after the opening-side reading (${opening.toString()}° ATDC); give a reading past BDC as 180 + degrees ABDC`,
    );
  }
  if (closing.minus(opening).gte(360)) {
    throw new AssemblyInputError(
      "closingSide",
      "out-of-range",
      "Closing-side reading must be less than 360° after the opening-side reading",
    );
  }
  const centreline = opening.plus(closing).div(2);
  const result: IntakeCentrelineResult = { centreline: out(centreline) };
  if (raw.specCentreline === undefined) return result;

  const spec = parseAngle(
    raw.specCentreline,
    { field: "specCentreline", label: "Card intake centreline (° ATDC)" },
    0,
    180,
  );
  const advance = spec.minus(centreline);
  result.advance = out(advance);
  result.phasing = advance.isZero() ? "on-card" : advance.gt(0) ? "advanced" : "retarded";
  return result;
}
