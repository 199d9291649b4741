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
  /** Oil allowance for the crankpin, added once; default "0". */
  oilAllowance?: string;
}

/**
 * The bobweight for one crankpin (DOMAIN §3, common practice):
 * Σ rotating + oil allowance + balance factor × Σ reciprocating.
 * For a 90° V8 at 50 %: 2 × rotating + 1 × reciprocating.
 *
 * @param input - masses of the rods and cylinders on the pin, in one unit; factor in percent
 * @returns the bobweight mass in the same unit
 * @throws {BalanceInputError} `field: "rotating"`/`"reciprocating"` (code `empty`) for no rods,
 *   `"rotating.<i>"` etc. for a bad mass, `"balanceFactor"` outside 0–100
 *
 * @example
 * bobweightForCrankpin({
 *   rotating: ["550", "550"], reciprocating: ["870", "870"], balanceFactor: "50", oilAllowance: "4",
 * }); // "1974"  (1100 + 4 + 0.5 × 1740)
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
  const oil = parseQuantity(input.oilAllowance ?? "0", "oilAllowance", "non-negative");
  return out(bobweightDecimal(rotating, reciprocating, factor, oil));
}
