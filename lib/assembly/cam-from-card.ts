import { Dec, out } from "./decimal";
import { AssemblyInputError } from "./errors";
import { type FieldName, parseAngle, requireRecord } from "./parse";

export interface CamCardInput {
  /** Intake opens, crank degrees before TDC (negative if it opens after TDC). */
  intakeOpenBtdc: string;
  /** Intake closes, crank degrees after BDC (negative if it closes before BDC). */
  intakeCloseAbdc: string;
  /** Exhaust opens, crank degrees before BDC (negative if it opens after BDC). */
  exhaustOpenBbdc: string;
  /** Exhaust closes, crank degrees after TDC (negative if it closes before TDC). */
  exhaustCloseAtdc: string;
}

export interface CamCardResult {
  /** Intake duration, crank degrees: opening + 180 + closing. */
  intakeDuration: string;
  /** Exhaust duration, crank degrees: opening + 180 + closing. */
  exhaustDuration: string;
  /** Intake centreline, crank degrees after TDC: intake duration / 2 − intake opening. */
  intakeCentreline: string;
  /** Exhaust centreline, crank degrees before TDC: exhaust duration / 2 − exhaust closing. */
  exhaustCentreline: string;
  /** Lobe separation angle, cam degrees: (intake centreline + exhaust centreline) / 2. */
  lobeSeparation: string;
  /**
   * Advance the card's timing puts in, crank degrees: lobe separation − intake centreline
   * (= (exhaust centreline − intake centreline) / 2). Zero when the card is "straight up";
   * above zero when the intake centreline is earlier than the lobe separation.
   */
  advance: string;
  /** Overlap at the card's checking lift, crank degrees: intake opening + exhaust closing. */
  overlap: string;
}

/** Opening + 180 + closing, refused (naming the closing field) unless between 0 and 360. */
function duration(opening: Dec, closing: Dec, closingName: FieldName): Dec {
  const total = opening.plus(180).plus(closing);
  if (total.lte(0) || total.gte(360)) {
    throw new AssemblyInputError(
      closingName.field,
      "out-of-range",
      `${closingName.label} gives a duration of ${total.toString()}°; a lobe's duration lies between 0° and 360° of crank rotation`,
    );
  }
  return total;
}

/**
 * The figures a cam card implies from its four valve events at the card's checking lift
 * (the arithmetic cam makers and trade magazines publish): duration = opening + 180 +
 * closing; intake centreline = duration / 2 − opening (after TDC); exhaust centreline =
 * duration / 2 − closing (before TDC); lobe separation = (intake + exhaust centreline) / 2
 * in cam degrees. All other figures are crank degrees. Compare like with like: events at
 * 0.050 in tappet lift and advertised (seat) events give different durations.
 *
 * @param input - the four events as printed on the card, in crank degrees
 * @returns durations, centrelines, lobe separation, the advance ground in and the overlap
 * @throws {AssemblyInputError} any event missing, not a decimal string, or not strictly
 *   between −180 and 180 (`out-of-range`); `intakeCloseAbdc` or `exhaustCloseAtdc` when the
 *   duration they make is not between 0 and 360
 *
 * @example
 * camFromCard({
 *   intakeOpenBtdc: "31", intakeCloseAbdc: "63", exhaustOpenBbdc: "73", exhaustCloseAtdc: "21",
 * });
 * // intakeDuration "274" (31 + 180 + 63), intakeCentreline "106" (137 − 31),
 * // exhaustDuration "274", exhaustCentreline "116" (137 − 21), lobeSeparation "111",
 * // advance "5", overlap "52" (31 + 21)
 */
export function camFromCard(input: CamCardInput): CamCardResult {
  const raw = requireRecord(input);
  const intakeOpenName = { field: "intakeOpenBtdc", label: "Intake opens (° BTDC)" };
  const intakeCloseName = { field: "intakeCloseAbdc", label: "Intake closes (° ABDC)" };
  const exhaustOpenName = { field: "exhaustOpenBbdc", label: "Exhaust opens (° BBDC)" };
  const exhaustCloseName = { field: "exhaustCloseAtdc", label: "Exhaust closes (° ATDC)" };
  const intakeOpen = parseAngle(raw.intakeOpenBtdc, intakeOpenName, -180, 180);
  const intakeClose = parseAngle(raw.intakeCloseAbdc, intakeCloseName, -180, 180);
  const exhaustOpen = parseAngle(raw.exhaustOpenBbdc, exhaustOpenName, -180, 180);
  const exhaustClose = parseAngle(raw.exhaustCloseAtdc, exhaustCloseName, -180, 180);

  const intakeDuration = duration(intakeOpen, intakeClose, intakeCloseName);
  const exhaustDuration = duration(exhaustOpen, exhaustClose, exhaustCloseName);
  const intakeCentreline = intakeDuration.div(2).minus(intakeOpen);
  const exhaustCentreline = exhaustDuration.div(2).minus(exhaustClose);
  const lobeSeparation = intakeCentreline.plus(exhaustCentreline).div(2);
  return {
    intakeDuration: out(intakeDuration),
    exhaustDuration: out(exhaustDuration),
    intakeCentreline: out(intakeCentreline),
    exhaustCentreline: out(exhaustCentreline),
    lobeSeparation: out(lobeSeparation),
    advance: out(lobeSeparation.minus(intakeCentreline)),
    overlap: out(intakeOpen.plus(exhaustClose)),
  };
}
