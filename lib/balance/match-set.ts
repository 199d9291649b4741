import { BalanceInputError } from "./errors";
import { Dec, out } from "./decimal";
import { parseOptionalQuantity, parseQuantity } from "./parse";

/** Default allowed spread of a finished set, in grams: "all within half a gram" (common practice). */
export const DEFAULT_TOLERANCE_G = "0.5";

/**
 * What to do with a part: `ok` leave it, `remove` machine it to the target, `light` it is
 * under a set target and needs a heavier replacement or added weight, `reselect` it is over
 * the band but is a kind the trade does not machine (ring sets, wrist pins, pin retainers):
 * choose a lighter one from spares or replace it.
 */
export type PartStatus = "ok" | "remove" | "light" | "reselect";

export interface MatchSetInput {
  /** Weights of the parts of one kind, one per part, in one mass unit. */
  measured: readonly string[];
  /** Target weight; the lightest part when omitted. */
  target?: string;
  /** Allowed spread of the finished set, same unit; default {@link DEFAULT_TOLERANCE_G}. */
  tolerance?: string;
  /**
   * False for a kind that is matched by choice, never machined (ring sets, wrist pins, pin
   * retainers): a part over the band is `reselect` instead of `remove`. Default true.
   */
  machined?: boolean;
}

export interface MatchedPart {
  measured: string;
  remove: string;
  final: string;
  status: PartStatus;
}

export interface MatchSetResult {
  target: string;
  tolerance: string;
  /** In the order of `measured`. */
  parts: MatchedPart[];
  /** Heaviest minus lightest final weight of the parts that are neither light nor to re-select. */
  spread: string;
}

/** @internal Decimal-level matching shared with computeBalance. */
export interface MatchedDecimal {
  remove: Dec;
  final: Dec;
  status: PartStatus;
}

/** @internal */
export function matchDecimals(
  measured: readonly Dec[],
  target: Dec | undefined,
  tolerance: Dec,
  machined = true,
): { target: Dec; parts: MatchedDecimal[] } {
  const goal = target ?? Dec.min(...measured);
  const ceiling = goal.plus(tolerance);
  const zero = new Dec(0);
  const parts = measured.map((weight): MatchedDecimal => {
    if (weight.lt(goal)) return { remove: zero, final: weight, status: "light" };
    if (weight.gt(ceiling)) {
      return machined
        ? { remove: weight.minus(goal), final: goal, status: "remove" }
        : { remove: zero, final: weight, status: "reselect" };
    }
    return { remove: zero, final: weight, status: "ok" };
  });
  return { target: goal, parts };
}

/**
 * Matches a set of parts of one kind (common practice): the target is the lightest
 * part unless one is set; a part heavier than target + tolerance is machined to the target; a
 * part within the band is left alone; a part lighter than a set target is flagged `light`.
 * With `machined: false` (ring sets, wrist pins, pin retainers) a part over the band is
 * flagged `reselect` and keeps its weight. The finished set (light and re-select parts aside)
 * then spans at most the tolerance.
 *
 * @param input - weights, optional target and tolerance, all decimal strings in one unit
 * @returns per part the metal to remove and the final weight, in input order
 * @throws {BalanceInputError} `field: "measured"` (code `empty`) for an empty set;
 *   `"measured.<i>"`, `"target"`, `"tolerance"` for a value that is not a decimal string,
 *   a weight or target ≤ 0, or a negative tolerance
 *
 * @example
 * matchSet({ measured: ["512.4", "511.6", "511.9"], tolerance: "0.5" }).parts;
 * // [{ measured: "512.4", remove: "0.8", final: "511.6", status: "remove" },
 * //  { measured: "511.6", remove: "0", final: "511.6", status: "ok" },
 * //  { measured: "511.9", remove: "0", final: "511.9", status: "ok" }]
 * matchSet({ measured: ["46.1", "47.7"], machined: false }).parts[1];
 * // { measured: "47.7", remove: "0", final: "47.7", status: "reselect" }  (a ring set)
 */
export function matchSet(input: MatchSetInput): MatchSetResult {
  if (!Array.isArray(input.measured) || input.measured.length === 0) {
    throw new BalanceInputError("measured", "empty", "measured needs at least one weight");
  }
  const measured = input.measured.map((w, i) => parseQuantity(w, `measured.${i}`));
  const target = parseOptionalQuantity(input.target, "target");
  const tolerance = parseQuantity(
    input.tolerance ?? DEFAULT_TOLERANCE_G,
    "tolerance",
    "non-negative",
  );
  const matched = matchDecimals(measured, target, tolerance, input.machined !== false);
  const finals = matched.parts
    .filter((p) => p.status === "ok" || p.status === "remove")
    .map((p) => p.final);
  const spread = finals.length === 0 ? new Dec(0) : Dec.max(...finals).minus(Dec.min(...finals));
  return {
    target: out(matched.target),
    tolerance: out(tolerance),
    parts: matched.parts.map((p, i) => ({
      measured: out(measured[i] as Dec),
      remove: out(p.remove),
      final: out(p.final),
      status: p.status,
    })),
    spread: out(spread),
  };
}
