import { median as mathMedian } from "mathjs";
import { describe, expect, it } from "vitest";
import { checkPlausibility, DEFAULT_OUTLIER_PERCENT, isBalanceInputError } from "@/lib/balance";

describe("checkPlausibility", () => {
  it("holds a missed decimal point against the median of the set (hand-worked)", () => {
    // Pistons 498.6, 497.9, 498.2 and "1064" typed for the fourth.
    // Sorted: 497.9, 498.2, 498.6, 1064 → median = (498.2 + 498.6) / 2 = 996.8 / 2 = 498.4.
    // (1064 − 498.4) / 498.4 = 565.6 / 498.4 = 1.134831…, i.e. 113.48 % above: more than 5 %.
    const result = checkPlausibility({ weight: "1064", others: ["498.6", "497.9", "498.2"] });
    expect(result.outlier).toBe(true);
    expect(result.reason).toBe("far");
    expect(result.basis).toBe("median");
    expect(result.reference).toBe("498.4");
    // Second derivation of the median: mathjs, a reference library.
    expect(Number(result.reference)).toBeCloseTo(mathMedian([1064, 498.6, 497.9, 498.2]), 9);
    expect(Number(result.deviationPercent)).toBeCloseTo((565.6 / 498.4) * 100, 9);
    expect(Number(result.ratio)).toBeCloseTo(1064 / 498.4, 9);
  });

  it("uses the middle weight of an odd set, this part included (hand-worked)", () => {
    // Others 511.6, 511.9 with 512.4 checked: sorted 511.6, 511.9, 512.4 → median 511.9.
    // (512.4 − 511.9) / 511.9 = 0.5 / 511.9 = 0.0977 %: well inside 5 %.
    const fine = checkPlausibility({ weight: "512.4", others: ["511.6", "511.9"] });
    expect(fine.reference).toBe("511.9");
    expect(fine.outlier).toBe(false);
    expect(Number(fine.deviationPercent)).toBeCloseTo((0.5 / 511.9) * 100, 9);

    // 10.64 against 511.6 and 511.9: sorted 10.64, 511.6, 511.9 → median 511.6;
    // (10.64 − 511.6) / 511.6 = −500.96 / 511.6 = −97.92 %: an outlier, lighter.
    const slipped = checkPlausibility({ weight: "10.64", others: ["511.6", "511.9"] });
    expect(slipped.reference).toBe("511.6");
    expect(slipped.outlier).toBe(true);
    expect(Number(slipped.deviationPercent)).toBeCloseTo((-500.96 / 511.6) * 100, 9);
  });

  it("draws the line at the percentage: more than 5 % is held, exactly 5 % is not", () => {
    // Common practice: a matched set sits within a percent or two; 5 % is the default.
    expect(DEFAULT_OUTLIER_PERCENT).toBe("5");
    // Reference 500 (the other part, two parts only). 525 is (525 − 500) / 500 = 5 % exactly.
    expect(checkPlausibility({ weight: "525", others: ["500"] }).outlier).toBe(false);
    // 525.1: 25.1 / 500 = 5.02 %.
    expect(checkPlausibility({ weight: "525.1", others: ["500"] }).outlier).toBe(true);
    // 475 is −5 % exactly; 474.9 is −5.02 %.
    expect(checkPlausibility({ weight: "475", others: ["500"] }).outlier).toBe(false);
    expect(checkPlausibility({ weight: "474.9", others: ["500"] }).outlier).toBe(true);
    // A shop that sets 10 %: 540 is 8 % above 500, within.
    expect(checkPlausibility({ weight: "540", others: ["500"], percent: "10" }).outlier).toBe(
      false,
    );
  });

  it("with two parts compares with the other one, not with a median of two", () => {
    // A median of {498.6, 1064} would be their mean, 781.3, and both would look wrong;
    // compared with the other part, 1064 is (1064 − 498.6) / 498.6 = 113.4 % above.
    const result = checkPlausibility({ weight: "1064", others: ["498.6"] });
    expect(result.basis).toBe("other");
    expect(result.reference).toBe("498.6");
    expect(Number(result.deviationPercent)).toBeCloseTo((565.4 / 498.6) * 100, 9);
    expect(result.outlier).toBe(true);
  });

  it("cannot compare a part alone, but still refuses zero", () => {
    const alone = checkPlausibility({ weight: "1064", others: [] });
    expect(alone).toMatchObject({ outlier: false, reference: null, basis: null });
    expect(checkPlausibility({ weight: "0", others: [] })).toMatchObject({
      outlier: true,
      reason: "not-positive",
    });
    expect(checkPlausibility({ weight: "0.0", others: ["498.6", "497.9"] }).reason).toBe(
      "not-positive",
    );
    expect(checkPlausibility({ weight: "-2", others: ["498.6"] }).reason).toBe("not-positive");
  });

  it("uses the mean of repeated readings (hand-worked)", () => {
    // Readings 10.64 and 1064 of one part: mean (10.64 + 1064) / 2 = 537.32; against 498.6 that is
    // 38.72 / 498.6 = 7.77 % above: held.
    const result = checkPlausibility({ weight: ["10.64", "1064"], others: ["498.6"] });
    expect(result.weight).toBe("537.32");
    expect(result.outlier).toBe(true);
    // Others given as readings too: (498.5 + 498.7) / 2 = 498.6.
    expect(checkPlausibility({ weight: "498.6", others: [["498.5", "498.7"]] }).reference).toBe(
      "498.6",
    );
  });

  it("leaves out other weights at zero from the comparison", () => {
    // An old zero among the others is itself the suspect one; the reference is the other part.
    const result = checkPlausibility({ weight: "498.2", others: ["0", "498.6"] });
    expect(result).toMatchObject({ basis: "other", reference: "498.6", outlier: false });
  });

  it("never holds a difference within the allowance (light parts)", () => {
    // Pin retainers 1.2 g and 1.3 g: (1.3 − 1.2) / 1.2 = 8.3 %, but 0.1 g is one scale division.
    expect(checkPlausibility({ weight: "1.3", others: ["1.2"] }).outlier).toBe(true);
    expect(checkPlausibility({ weight: "1.3", others: ["1.2"], allowance: "0.5" }).outlier).toBe(
      false,
    );
    // "12" typed for 1.2: 10.8 g off, well past a 0.5 g allowance.
    expect(checkPlausibility({ weight: "12", others: ["1.2"], allowance: "0.5" }).outlier).toBe(
      true,
    );
  });

  describe("edge cases", () => {
    it("refuses what is not a weight, naming the field", () => {
      const fieldOf = (f: () => unknown) => {
        try {
          f();
        } catch (error) {
          return isBalanceInputError(error) ? error.field : "other error";
        }
        return "no error";
      };
      expect(fieldOf(() => checkPlausibility({ weight: "4x", others: [] }))).toBe("weight");
      expect(fieldOf(() => checkPlausibility({ weight: "1", others: ["2", "3a"] }))).toBe(
        "others.1",
      );
      expect(fieldOf(() => checkPlausibility({ weight: [], others: [] }))).toBe("weight");
      expect(fieldOf(() => checkPlausibility({ weight: "1", others: [], percent: "0" }))).toBe(
        "percent",
      );
    });
  });
});
