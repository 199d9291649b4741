import { evaluate, format } from "mathjs";
import { describe, expect, it } from "vitest";
import {
  formatDerivedMass,
  formatLength,
  formatLengthIn,
  formatMass,
  formatUnbalance,
  convertMassSetting,
  isScaleDivision,
  lengthResolutionOf,
  massDecimals,
} from "@/lib/balance";

describe("isScaleDivision", () => {
  it("accepts only 1, 2 or 5 × 10^k (scale divisions, NIST Handbook 44 / OIML R 76, from memory)", () => {
    for (const step of ["1", "2", "5", "10", "0.1", "0.2", "0.05", "0.001", "0.002", "50"]) {
      expect(isScaleDivision(step)).toBe(true);
    }
    for (const step of ["0.003527", "0.3", "2.5", "0.25", "0.15", "3"]) {
      expect(isScaleDivision(step)).toBe(false);
    }
  });
});

describe("formatMass", () => {
  it("rounds to a multiple of a 1/2/5 × 10^k division, halves away from zero", () => {
    // 511.63 / 0.05 = 10232.6 → 10233 × 0.05 = 511.65 (by hand)
    expect(formatMass("511.63", "0.05")).toBe("511.65");
    // 12.3 / 0.2 = 61.5 → 62 × 0.2 = 12.4 (by hand, half away from zero)
    expect(formatMass("12.3", "0.2")).toBe("12.4");
    // 513 / 5 = 102.6 → 103 × 5 = 515
    expect(formatMass("513", "5")).toBe("515");
  });

  it("rounds any other step to the decimal place of its leading digit", () => {
    // 0.003527 oz (0.1 g converted): leading digit in the thousandths → 3 decimals.
    // The old rule gave 10.95 / 0.003527 = 3104.62… → 3105 × 0.003527 = 10.951335.
    expect(formatMass("10.95", "0.003527")).toBe("10.950");
    expect(formatMass("18.0626", "0.003527")).toBe("18.063");
    expect(formatMass("12.34", "0.3")).toBe("12.3");
    expect(massDecimals("0.003527")).toBe(3);
    expect(massDecimals("0.05")).toBe(2);
    expect(massDecimals("1")).toBe(0);
  });
});

describe("formatDerivedMass", () => {
  it("shows a computed mass with one decimal more than the scale", () => {
    // (305.8 + 305.9 + 305.8) / 3 = 917.5 / 3 = 305.8333… (by hand) → 305.83 at 0.1 g
    expect(formatDerivedMass("305.833333333333333333333333333", "0.1")).toBe("305.83");
    // 1/6 g = 0.1666… → 0.17 at 0.1 g
    expect(formatDerivedMass("0.166666666666666666666666667", "0.1")).toBe("0.17");
    // 0.05 g scale → 3 decimals
    expect(formatDerivedMass("2.0625", "0.05")).toBe("2.063");
    // 0.003527 oz step → 3 + 1 = 4 decimals
    expect(formatDerivedMass("10.95", "0.003527")).toBe("10.9500");
    expect(formatDerivedMass("-0.004", "0.1")).toBe("0.00");
  });
});

describe("formatUnbalance", () => {
  it("keeps two significant figures and never shows 0.00", () => {
    expect(formatUnbalance("3.456")).toBe("3.5");
    expect(formatUnbalance("0.0123")).toBe("0.012");
    expect(formatUnbalance("0.0049")).toBe("0.0049");
    expect(formatUnbalance("0.0996")).toBe("0.10");
    expect(formatUnbalance("9.96")).toBe("10");
    expect(formatUnbalance("0")).toBe("0");
    expect(formatUnbalance("-0.0371")).toBe("-0.037");
  });

  it("rounds a fine grade's allowance to the same two figures mathjs gives", () => {
    // ISO 21940-11: U_per [g·mm] = 9549.3 · G · m / n. G 1, 20 kg crank, 8000 rpm:
    // 9549.3 × 1 × 20 / 8000 = 23.87325 g·mm; at a 60 mm radius 0.3978875 g. At G 0.4 and a
    // 100 mm radius: 0.4 × 23.87325 / 100 = 0.0954930 g.
    const gmm = evaluate("9549.3 * 1 * 20 / 8000");
    expect(formatUnbalance(String(gmm))).toBe("24");
    const fine = evaluate("0.4 * 9549.3 * 20 / 8000 / 100");
    expect(formatUnbalance(String(fine))).toBe(format(fine, { precision: 2 }));
    expect(formatUnbalance(String(fine))).toBe("0.095");
  });

  it("keeps whole digits from 10 up", () => {
    // 9549.3 × 6.3 × 18 / 6500 = 166.597… g·mm (hand and mathjs)
    expect(formatUnbalance(String(evaluate("9549.3 * 6.3 * 18 / 6500")))).toBe("167");
    expect(formatUnbalance("1909.86")).toBe("1910");
  });
});

describe("lengths", () => {
  it("are shown at the precision they were entered", () => {
    expect(formatLength("3.250")).toBe("3.250");
    expect(formatLength("86")).toBe("86");
    expect(formatLength("82.55000000001")).toBe("82.5500");
    expect(formatLength("82.55", "0.1")).toBe("82.6");
    expect(lengthResolutionOf("3.250")).toBe("0.001");
    expect(lengthResolutionOf("86")).toBe("1");
  });

  it("come back in the unit they were entered in (1 in = 25.4 mm, NIST SP 811 App. B.8)", () => {
    // 4.030 in × 25.4 = 102.362 mm (by hand)
    expect(formatLengthIn("102.362", "in", "0.001")).toBe("4.030 in");
    // 3.48 in = 88.392 mm
    expect(formatLengthIn("88.392", "in")).toBe("3.48 in");
    expect(formatLengthIn("92.00", "mm")).toBe("92.00 mm");
  });
});

describe("convertMassSetting (a job's settings when it changes unit)", () => {
  it("takes a resolution to the coarsest 1/2/5 × 10^k step not coarser than the exact value", () => {
    // 0.1 g ÷ 28.349523125 = 0.0035274 oz (mathjs below): 0.005 would be coarser, 0.002 is not.
    expect(evaluate("number(0.1 g, ounce)")).toBeCloseTo(0.0035274, 7);
    expect(convertMassSetting("0.1", "g", "oz", "resolution")).toBe("0.002");
    // 0.002 oz × 28.349523125 = 0.05669905 g → 0.05 g; 0.01 oz = 0.28349523 g → 0.2 g.
    expect(convertMassSetting("0.002", "oz", "g", "resolution")).toBe("0.05");
    expect(convertMassSetting("0.01", "oz", "g", "resolution")).toBe("0.2");
    // 1 g = 0.035274 oz → 0.02 oz.
    expect(convertMassSetting("1", "g", "oz", "resolution")).toBe("0.02");
  });

  it("rounds a tolerance or allowance to two significant figures", () => {
    // 0.5 g = 0.0176370 oz → 0.018; 4 g = 0.141096 oz → 0.14; 0.018 oz = 0.510291 g → 0.51.
    expect(convertMassSetting("0.5", "g", "oz", "amount")).toBe("0.018");
    expect(convertMassSetting("4", "g", "oz", "amount")).toBe("0.14");
    expect(convertMassSetting("0.018", "oz", "g", "amount")).toBe("0.51");
    expect(convertMassSetting("0", "g", "oz", "amount")).toBe("0");
    expect(Number(convertMassSetting("0.5", "g", "oz", "amount"))).toBeCloseTo(
      evaluate("number(0.5 g, ounce)"),
      3,
    );
  });
});
