import { all, type BigNumber, create, type FactoryFunctionMap } from "mathjs";
import { describe, expect, it } from "vitest";
import { convertScaleMass, GRAMS_PER_UNIT, readingInJobUnit } from "@/lib/scale";

// mathjs' own unit table, in exact decimal arithmetic, is the outside reference.
const math = create(all as FactoryFunctionMap, { number: "BigNumber", precision: 64 });
const inUnit = (value: string | BigNumber, unit: string, to: string) =>
  math.unit(math.bignumber(value), unit).toNumeric(to) as BigNumber;
const inGrams = (value: string, unit: string) => inUnit(value, unit, "g").toString();

describe("scale units to grams", () => {
  it("ounce, grain, pound, kilogram and milligram agree with mathjs (NIST Handbook 44 App. C)", () => {
    expect(convertScaleMass("1", "oz", "g")).toBe(inGrams("1", "oz"));
    expect(convertScaleMass("17.5", "oz", "g")).toBe(inGrams("17.5", "oz"));
    expect(convertScaleMass("100", "gn", "g")).toBe(inGrams("100", "grain"));
    expect(convertScaleMass("1", "lb", "g")).toBe(inGrams("1", "lbm"));
    expect(convertScaleMass("0.4986", "kg", "g")).toBe(inGrams("0.4986", "kg"));
    expect(convertScaleMass("250", "mg", "g")).toBe(inGrams("250", "mg"));
  });

  it("the metric carat is 200 mg exactly (NIST SP 811 App. B.8); by hand 12.5 ct × 0.2 = 2.5 g", () => {
    expect(convertScaleMass("12.5", "ct", "g")).toBe("2.5");
  });

  it("troy ounce is 480 grains and pennyweight 24 grains (second derivation via mathjs' grain)", () => {
    expect(GRAMS_PER_UNIT.ozt).toBe(inGrams("480", "grain"));
    expect(GRAMS_PER_UNIT.dwt).toBe(inGrams("24", "grain"));
  });

  it("grams to ounces divides by the exact factor (mathjs to 30 significant figures)", () => {
    const ours = convertScaleMass("498.6", "g", "oz");
    const theirs = inUnit("498.6", "g", "oz");
    expect(math.bignumber(ours).minus(theirs).abs().lessThan(math.bignumber("1e-30"))).toBe(true);
  });
});

describe("a reading in the job's unit", () => {
  it("keeps a reading in the job's unit (or in none) exactly as the scale sent it", () => {
    expect(readingInJobUnit("498.60", "g", "g")).toEqual({ ok: true, value: "498.60" });
    expect(readingInJobUnit("498.60", undefined, "oz")).toEqual({ ok: true, value: "498.60" });
  });

  it("rounds a conversion to a tenth of the scale's step: 498.6 g in ounces", () => {
    // By hand: 498.6 / 28.349523125 = 17.587596… oz. The scale's step 0.1 g is 0.003527 oz;
    // a tenth of it 0.00035 oz → 4 decimals (0.0001 ≤ 0.00035, 0.001 is not) → 17.5876.
    expect(readingInJobUnit("498.6", "g", "oz")).toEqual({ ok: true, value: "17.5876" });
  });

  it("17.5 oz in grams: 496.1166546875 g, step 0.1 oz = 2.83 g, a tenth 0.283 g → 496.1", () => {
    expect(readingInJobUnit("17.5", "oz", "g")).toEqual({ ok: true, value: "496.1" });
  });

  it("12.500 ct in grams: 2.5 g; step 0.001 ct = 0.0002 g, a tenth 0.00002 g → 5 decimals", () => {
    expect(readingInJobUnit("12.500", "ct", "g")).toEqual({ ok: true, value: "2.50000" });
  });

  it("the rounding never moves a reading by more than a twentieth of the scale's step", () => {
    for (const [value, unit] of [
      ["498.6", "g"],
      ["7.77", "gn"],
      ["0.0351", "lb"],
    ] as const) {
      const res = readingInJobUnit(value, unit, "oz");
      if (!res.ok) throw new Error(res.message);
      const mathUnit = unit === "gn" ? "grain" : unit === "lb" ? "lbm" : unit;
      const exact = inUnit(value, mathUnit, "oz");
      const decimals = value.split(".")[1]!.length;
      const step = inUnit(math.bignumber(10).pow(-decimals), mathUnit, "oz");
      expect(math.bignumber(res.value).minus(exact).abs().lessThanOrEqualTo(step.div(20))).toBe(
        true,
      );
    }
  });

  it("refuses a figure that is not a weight, saying which unit to set", () => {
    expect(readingInJobUnit("12", "pcs", "g")).toEqual({
      ok: false,
      message: 'The scale sent "pcs", not a weight: set it to weigh in grams.',
    });
  });
});
