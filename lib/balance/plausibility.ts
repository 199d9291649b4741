import { Dec, ONE_HUNDRED, out } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseQuantity } from "./parse";

/**
 * How far, in percent, a part may sit from the rest of its kind before its weight is held as a
 * likely typing slip: 5 %. Common practice: the parts of a matched set (pistons, pins, rods of
 * one make and part number) weigh within a percent or two of each other, while a slipped or
 * missed decimal point is off by a factor of ten. A shop can set its own figure.
 */
export const DEFAULT_OUTLIER_PERCENT = "5";

/** A weight as typed: one reading, or repeated readings of the same part (their mean is used). */
export type PlausibilityWeight = string | readonly string[];

export interface PlausibilityInput {
  /** The part's weight in the job's unit. Zero or below is what this check catches, not an error. */
  weight: PlausibilityWeight;
  /**
   * The weights of the other parts of the same kind in the set (this part left out), same unit.
   * Any at zero or below are left out of the comparison.
   */
  others: readonly PlausibilityWeight[];
  /** Percent of the reference a weight may differ by; above zero. Default {@link DEFAULT_OUTLIER_PERCENT}. */
  percent?: string;
  /**
   * A difference no larger than this (same unit) is never an outlier, whatever the percentage:
   * pass the job's matching tolerance so that light parts (pin retainers of 1.2 g) are not held
   * for a difference of one scale division. Default "0".
   */
  allowance?: string;
}

export interface Plausibility {
  /** True when the weight should be confirmed or retyped before it is used. */
  outlier: boolean;
  /** `not-positive`: zero or below; `far`: more than `percent` from the reference; null when plausible. */
  reason: "not-positive" | "far" | null;
  /** The part's weight (the mean of its readings). */
  weight: string;
  /**
   * What the weight was compared with: the median of the whole set (this part included) when the
   * kind has 3 parts or more, otherwise the other part; null when there is nothing to compare with.
   */
  reference: string | null;
  /** `median`: of 3 or more parts; `other`: the one other part; null: no comparison was made. */
  basis: "median" | "other" | null;
  /** weight ÷ reference; null without a reference. */
  ratio: string | null;
  /** (weight − reference) ÷ reference × 100, signed (negative: lighter); null without a reference. */
  deviationPercent: string | null;
  /** The percentage the check used. */
  percent: string;
}

function meanOf(weight: PlausibilityWeight, field: string): Dec {
  if (typeof weight === "string") return parseQuantity(weight, field, "signed");
  if (weight.length === 0) {
    throw new BalanceInputError(field, "empty", `${field} has an empty list of readings`);
  }
  let sum = new Dec(0);
  weight.forEach((reading, index) => {
    sum = sum.plus(parseQuantity(reading, `${field}.${index}`, "signed"));
  });
  return sum.div(weight.length);
}

function median(values: Dec[]): Dec {
  const sorted = [...values].sort((a, b) => a.comparedTo(b));
  const middle = Math.floor(sorted.length / 2);
  const upper = sorted[middle] as Dec;
  return sorted.length % 2 === 1 ? upper : (sorted[middle - 1] as Dec).plus(upper).div(2);
}

/**
 * Says whether a weight is far from the rest of its kind: a likely typing slip ("1064" typed for
 * 10.64, a missed decimal point) to be confirmed or retyped before the plan uses it.
 *
 * The weight is an outlier when it is zero or below, or when it differs from the reference by
 * more than `percent` of the reference and by more than `allowance`. The reference is the median
 * of the kind's whole set, this part included, when the set has 3 parts or more (one slip cannot
 * move a median of three far); with 2 parts it is the other part; a part alone is only checked
 * for being above zero.
 *
 * @param input - the weight, the other weights of the kind, the percentage and allowance
 * @returns whether it is an outlier, why, and what it was compared with (exact decimal strings)
 * @throws {BalanceInputError} a weight or another weight that is not a decimal string
 *   (`weight`, `others.2`, `others.2.0` for a reading), an empty list of readings, a
 *   `percent` that is not above zero, an `allowance` below zero
 *
 * @example
 * // Pistons 498.6, 497.9, 498.2 weighed; "1064" typed for the fourth.
 * // Median of 497.9, 498.2, 498.6, 1064 = (498.2 + 498.6) / 2 = 498.4;
 * // (1064 − 498.4) / 498.4 × 100 = 113.48…% > 5 %.
 * checkPlausibility({ weight: "1064", others: ["498.6", "497.9", "498.2"] });
 * // { outlier: true, reason: "far", weight: "1064", reference: "498.4", basis: "median",
 * //   ratio: "2.13483146067415730337078651685", deviationPercent: "113.483146067415730337078651685",
 * //   percent: "5" }
 */
export function checkPlausibility(input: PlausibilityInput): Plausibility {
  const percent = parseQuantity(input.percent ?? DEFAULT_OUTLIER_PERCENT, "percent");
  const allowance = parseQuantity(input.allowance ?? "0", "allowance", "non-negative");
  const weight = meanOf(input.weight, "weight");
  const others = input.others
    .map((w, i) => meanOf(w, `others.${i}`))
    .filter((w) => w.greaterThan(0));
  const base = { weight: out(weight), percent: out(percent) };
  if (weight.lessThanOrEqualTo(0)) {
    return {
      ...base,
      outlier: true,
      reason: "not-positive",
      reference: null,
      basis: null,
      ratio: null,
      deviationPercent: null,
    };
  }
  if (others.length === 0) {
    return {
      ...base,
      outlier: false,
      reason: null,
      reference: null,
      basis: null,
      ratio: null,
      deviationPercent: null,
    };
  }
  const basis = others.length >= 2 ? "median" : "other";
  const reference = basis === "median" ? median([weight, ...others]) : (others[0] as Dec);
  const difference = weight.minus(reference);
  const deviation = difference.div(reference).times(ONE_HUNDRED);
  const outlier = deviation.abs().greaterThan(percent) && difference.abs().greaterThan(allowance);
  return {
    ...base,
    outlier,
    reason: outlier ? "far" : null,
    reference: out(reference),
    basis,
    ratio: out(weight.div(reference)),
    deviationPercent: out(deviation),
  };
}
