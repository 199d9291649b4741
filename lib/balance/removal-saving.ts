import type { PartKind, PartResult } from "./compute-balance";
import { Dec, out } from "./decimal";
import { removalTotal } from "./removal-total";

export interface RemovalSaving {
  /** Metal the current plan takes off. */
  current: string;
  /** Metal the alternative plan takes off. */
  alternative: string;
  /** current − alternative: positive when the alternative takes less off. */
  saved: string;
}

/**
 * Compares the metal two removal plans take off, e.g. the plan with the pistons as numbered and
 * the plan for the same parts re-paired. Both totals are {@link removalTotal}.
 *
 * @param current - a computeBalance result (only `parts` is read)
 * @param alternative - another, same unit
 * @param kinds - optional: count only these kinds
 * @returns both totals and their difference, decimal strings in the plans' unit, exact
 * @throws {BalanceInputError} as {@link removalTotal}
 *
 * @example
 * // 9.5 g taken off as numbered, 1 g re-paired:
 * removalSaving(numbered, repaired); // { current: "9.5", alternative: "1", saved: "8.5" }
 */
export function removalSaving(
  current: { parts: readonly PartResult[] },
  alternative: { parts: readonly PartResult[] },
  kinds?: readonly PartKind[],
): RemovalSaving {
  const a = removalTotal(current, kinds);
  const b = removalTotal(alternative, kinds);
  return { current: a, alternative: b, saved: out(new Dec(a).minus(b)) };
}
