import { Dec, ONE_HUNDRED, out } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseQuantity, requireAtMost } from "./parse";

/** @internal Decimal-level bobweight shared with computeBalance. */
export function bobweightDecimal(
  rotating: readonly Dec[],
  reciprocating: readonly Dec[],
  factorPercent: Dec,
  oilAllowance: Dec,
): Dec {
  const sumRotating = Dec.sum(0, ...rotating);
  const sumReciprocating = Dec.sum(0, ...reciprocating);
  return sumRotating
    .plus(oilAllowance)
    .plus(factorPercent.div(ONE_HUNDRED).times(sumReciprocating));
}

export interface BobweightInput {
  /** Rotating mass of each rod on the crankpin (big end + bearing shells), g or oz. */
  rotating: readonly string[];
  /** Reciprocating mass of each of those cylinders (piston, pin, retainers, rings, small end). */
  reciprocating: readonly string[];
  /** Balance factor in percent, 0–100. */
  balanceFactor: string;
  /**
   * Oil allowance for the whole crankpin, added once; default "0". Older form of the setting:
   * give `oilAllowancePerRod` instead, not both.
   */
  oilAllowance?: string;
  /**
   * Oil allowance per rod (2–5 g per rod is common practice): the pin takes it once
   * for each rod on it, i.e. once per entry of `rotating`.
   */
  oilAllowancePerRod?: string;
}

/**
 * The bobweight for one crankpin (common practice):
 * Σ rotating + oil allowance + balance factor × Σ reciprocating, where the oil allowance is the
 * per-rod figure times the rods on the pin (or a figure for the whole pin, the older form).
 * For a 90° V8 at 50 %: 2 × rotating + 1 × reciprocating + 2 × oil per rod.
 *
 * @param input - masses of the rods and cylinders on the pin, in one unit; factor in percent
 * @returns the bobweight mass in the same unit
 * @throws {BalanceInputError} `field: "rotating"`/`"reciprocating"` (code `empty`) for no rods,
 *   `"rotating.<i>"` etc. for a bad mass, `"balanceFactor"` outside 0–100, `"oilAllowance"` /
 *   `"oilAllowancePerRod"` negative, `"oilAllowancePerRod"` (code `conflict`) when both are given
 *
 * @example
 * bobweightForCrankpin({
 *   rotating: ["550", "550"], reciprocating: ["870", "870"], balanceFactor: "50",
 *   oilAllowancePerRod: "2",
 * }); // "1974"  (1100 + 2 × 2 + 0.5 × 1740)
 * bobweightForCrankpin({
 *   rotating: ["550", "550"], reciprocating: ["870", "870"], balanceFactor: "50", oilAllowance: "4",
 * }); // "1974"  (the same pin with 4 for the whole pin)
 */
export function bobweightForCrankpin(input: BobweightInput): string {
  if (input.rotating.length === 0)
    throw new BalanceInputError("rotating", "empty", "rotating needs at least one rod");
  if (input.reciprocating.length === 0) {
    throw new BalanceInputError(
      "reciprocating",
      "empty",
      "reciprocating needs at least one cylinder",
    );
  }
  const rotating = input.rotating.map((m, i) => parseQuantity(m, `rotating.${i}`));
  const reciprocating = input.reciprocating.map((m, i) => parseQuantity(m, `reciprocating.${i}`));
  const factor = requireAtMost(
    parseQuantity(input.balanceFactor, "balanceFactor", "non-negative"),
    ONE_HUNDRED,
    "balanceFactor",
    "a percentage from 0 to 100",
  );
  const oil = parseOilAllowance(input);
  const pinOil = oil.perRod === null ? oil.perPin : oil.perRod.times(rotating.length);
  return out(bobweightDecimal(rotating, reciprocating, factor, pinOil));
}

/** @internal The oil allowance as given: per rod, or (the older form) per crankpin. */
export interface ParsedOilAllowance {
  /** Per rod; null when the allowance is given per crankpin. */
  perRod: Dec | null;
  /** Per crankpin as given; zero when the allowance is given per rod. */
  perPin: Dec;
}

/**
 * @internal Reads `oilAllowance` (per crankpin) and `oilAllowancePerRod`; refuses both at once,
 * since adding them would count the oil twice and choosing one would hide the other.
 */
export function parseOilAllowance(root: {
  oilAllowance?: unknown;
  oilAllowancePerRod?: unknown;
}): ParsedOilAllowance {
  if (root.oilAllowancePerRod === undefined) {
    return {
      perRod: null,
      perPin: parseQuantity(root.oilAllowance ?? "0", "oilAllowance", "non-negative"),
    };
  }
  const perRod = parseQuantity(root.oilAllowancePerRod, "oilAllowancePerRod", "non-negative");
  if (root.oilAllowance !== undefined) {
    throw new BalanceInputError(
      "oilAllowancePerRod",
      "conflict",
      "oilAllowancePerRod and oilAllowance (per crankpin) are both given: give the oil allowance one way only",
    );
  }
  return { perRod, perPin: new Dec(0) };
}
