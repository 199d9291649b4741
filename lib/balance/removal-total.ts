import type { PartKind, PartResult } from "./compute-balance";
import { Dec, out } from "./decimal";
import { parseQuantity } from "./parse";

/**
 * The metal a removal plan takes off: the sum of `remove` over its parts, or over the parts of
 * some kinds only. Parts to re-select, light parts and bearing shells count nothing (their
 * `remove` is 0).
 *
 * @param plan - a computeBalance result (only `parts` is read); masses in its unit
 * @param kinds - optional: count only these kinds
 * @returns the total as a decimal string in the plan's unit, exact
 * @throws {BalanceInputError} `parts.<i>.remove` when a part's removal is not a non-negative
 *   decimal string (a hand-made plan)
 *
 * @example
 * removalTotal({ parts: [
 *   { cylinder: 1, kind: "piston", measured: "512.4", remove: "0.8", final: "511.6", status: "remove" },
 *   { cylinder: 2, kind: "bigEnd", measured: "521.1", remove: "1.1", final: "520", status: "remove" },
 * ] }); // "1.9"
 * // the same with kinds ["piston"]: "0.8"
 */
export function removalTotal(
  plan: { parts: readonly PartResult[] },
  kinds?: readonly PartKind[],
): string {
  const counted = plan.parts
    .map((part, i) => ({ part, i }))
    .filter(({ part }) => kinds === undefined || kinds.includes(part.kind));
  return out(
    Dec.sum(
      0,
      ...counted.map(({ part, i }) =>
        parseQuantity(part.remove, `parts.${i}.remove`, "non-negative"),
      ),
    ),
  );
}
