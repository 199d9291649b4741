import { unit } from "mathjs";
import { describe, expect, it } from "vitest";
import {
  BalanceInputError,
  convertLength,
  convertMass,
  formatMass,
  GRAMS_PER_GRAIN,
  GRAMS_PER_OUNCE,
  MILLIMETRES_PER_INCH,
} from "@/lib/balance";

describe("unit factors", () => {
  it("uses the exact definitions", () => {
    // NIST Handbook 44 App. C / 1959 agreement: 1 lb = 453.59237 g, 1 oz = 1/16 lb, 1 grain = 1/7000 lb.
    expect(GRAMS_PER_OUNCE).toBe("28.349523125"); // 453.59237 / 16
    expect(GRAMS_PER_GRAIN).toBe("0.06479891"); // 453.59237 / 7000
    // NIST SP 811 App. B.8: 1 in = 25.4 mm exactly.
    expect(MILLIMETRES_PER_INCH).toBe("25.4");
    // 1 lb = 16 oz = 7000 grain, so the ounce is exactly 437.5 grains.
    expect(convertMass("16", "oz", "g")).toBe("453.59237");
    expect(convertMass("7000", "grain", "g")).toBe("453.59237");
    expect(convertMass("1", "oz", "grain")).toBe("437.5");
  });

  it("agrees with mathjs as an independent reference", () => {
    // mathjs carries the same definitions; it works in binary floating point, hence toBeCloseTo.
    expect(Number(convertMass("1", "oz", "g"))).toBeCloseTo(unit(1, "oz").toNumber("g"), 12);
    expect(Number(convertMass("1", "grain", "g"))).toBeCloseTo(unit(1, "grain").toNumber("g"), 12);
    expect(Number(convertMass("100", "g", "oz"))).toBeCloseTo(unit(100, "g").toNumber("oz"), 12);
    expect(Number(convertMass("2", "oz", "grain"))).toBeCloseTo(unit(2, "oz").toNumber("grain"), 9);
    expect(Number(convertLength("1", "in", "mm"))).toBeCloseTo(unit(1, "inch").toNumber("mm"), 12);
    expect(Number(convertLength("100", "mm", "in"))).toBeCloseTo(
      unit(100, "mm").toNumber("inch"),
      12,
    );
  });
});

describe("convertMass", () => {
  it("multiplies exactly and divides to the shortest decimal within 1 part in 10³⁰", () => {
    expect(convertMass("1", "oz", "g")).toBe("28.349523125");
    expect(convertMass("28.349523125", "g", "oz")).toBe("1");
    expect(convertMass("10", "g", "oz")).toBe("0.352739619495804129156758082152");
    expect(convertMass("10", "g", "g")).toBe("10");
    expect(convertMass("0", "g", "oz")).toBe("0");
  });

  it("returns the original grams after a trip through ounces", () => {
    for (const grams of ["511.6", "0.1", "1977.25", "0.000001", "123456789.123456789"]) {
      expect(convertMass(convertMass(grams, "g", "oz"), "oz", "g")).toBe(grams);
      expect(convertMass(convertMass(grams, "g", "grain"), "grain", "g")).toBe(grams);
    }
  });

  it("refuses bad values and units, naming the field", () => {
    expect(() => convertMass("-1", "g", "oz")).toThrow(BalanceInputError);
    expect(() => convertMass("x", "g", "oz")).toThrow(/value/);
    expect(() => convertMass("1", "lb" as never, "oz")).toThrow(
      expect.objectContaining({ field: "from", code: "unknown-unit" }),
    );
    expect(() => convertMass(1 as never, "g", "oz")).toThrow(
      expect.objectContaining({ field: "value", code: "not-a-string" }),
    );
  });
});

describe("convertLength", () => {
  it("converts inches to millimetres exactly and back", () => {
    expect(convertLength("3.5", "in", "mm")).toBe("88.9");
    expect(convertLength("88.9", "mm", "in")).toBe("3.5");
    expect(convertLength("1", "mm", "in")).toBe("0.03937007874015748031496062992126");
    expect(convertLength(convertLength("1", "mm", "in"), "in", "mm")).toBe("1");
  });
});

describe("formatMass", () => {
  it("rounds to the scale resolution, halves away from zero, at the display edge", () => {
    expect(formatMass("511.65", "0.1")).toBe("511.7");
    expect(formatMass("511.649", "0.1")).toBe("511.6");
    expect(formatMass("511.63", "0.05")).toBe("511.65");
    expect(formatMass("12.3", "0.2")).toBe("12.4");
    expect(formatMass("512", "0.1")).toBe("512.0");
    expect(formatMass("512.4", "1")).toBe("512");
    expect(formatMass("310.433333333333333333333333333", "0.01")).toBe("310.43");
  });

  it("shows signed values without a negative zero", () => {
    expect(formatMass("-1.25", "0.1")).toBe("-1.3");
    expect(formatMass("-0.04", "0.1")).toBe("0.0");
  });

  it("refuses a resolution that is not positive", () => {
    expect(() => formatMass("1", "0")).toThrow(
      expect.objectContaining({ field: "resolution", code: "not-positive" }),
    );
  });
});
