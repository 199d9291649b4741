import { describe, expect, it } from "vitest";
import { readWedgeReadings } from "@/lib/scale";
import { readingsTextSchema, readingsTextSchemaFor } from "@/lib/validation/readings";

const issues = (r: { success: boolean; error?: { issues: { message: string }[] } }) =>
  r.error?.issues.map((i) => i.message) ?? [];

describe("what a keyboard-wedge scale types into a weigh box", () => {
  it("drops the sign, the spaces and the job's own unit", () => {
    expect(readWedgeReadings("+ 498.6 g", "g")).toEqual({ ok: true, readings: ["498.6"] });
    expect(readWedgeReadings("+   0498.60 g", "g")).toEqual({ ok: true, readings: ["498.60"] });
    expect(readWedgeReadings("  17.588 oz", "oz")).toEqual({ ok: true, readings: ["17.588"] });
  });

  it("reads repeated readings, each with its unit, after one another", () => {
    expect(readWedgeReadings("+ 498.6 g + 498.7 g", "g")).toEqual({
      ok: true,
      readings: ["498.6", "498.7"],
    });
    expect(readWedgeReadings("498.6 g / 498.7 g", "g")).toEqual({
      ok: true,
      readings: ["498.6", "498.7"],
    });
  });

  it("converts another mass unit: + 17.5 oz in a job in grams", () => {
    // By hand: 17.5 × 28.349523125 = 496.1166546875 g (NIST Handbook 44 App. C factor); the
    // scale's step 0.1 oz is 2.83 g, so a tenth of it (0.28 g) keeps one decimal → 496.1.
    expect(readWedgeReadings("+ 17.5 oz", "g")).toEqual({ ok: true, readings: ["496.1"] });
  });

  it("refuses a figure that is not a weight and a reading below zero", () => {
    expect(readWedgeReadings("+ 12 pcs", "g")).toEqual({
      ok: false,
      message: 'The scale sent "pcs", not a weight: set it to weigh in grams.',
    });
    expect(readWedgeReadings("- 3.0 g", "g")).toMatchObject({ ok: false });
  });

  it("leaves anything else to the weigh box's number rule", () => {
    expect(readWedgeReadings("512.4.3", "g")).toBeNull();
    expect(readWedgeReadings("498.6 g junk 1", "g")).toBeNull();
  });
});

describe("the weigh cell's reading rule", () => {
  it("accepts what the wedge types, which the unit-free rule refuses", () => {
    expect(readingsTextSchema.safeParse("+ 498.6 g").success).toBe(false);
    expect(readingsTextSchemaFor("g").safeParse("+ 498.6 g")).toMatchObject({
      success: true,
      data: ["498.6"],
    });
  });

  it("keeps plain typing exactly as before", () => {
    expect(readingsTextSchemaFor("g").safeParse("498.6 498.7").data).toEqual(["498.6", "498.7"]);
    expect(issues(readingsTextSchemaFor("g").safeParse("512.4.3"))).toEqual([
      "Enter a number, like 512.4; separate repeated readings with spaces.",
    ]);
    expect(issues(readingsTextSchemaFor("g").safeParse("+ 0.0 g"))).toEqual([
      "A weight of zero is not a reading: weigh the part again.",
    ]);
  });

  it("names the unit it refuses, in the machinist's words", () => {
    expect(issues(readingsTextSchemaFor("oz").safeParse("+ 12 pcs"))).toEqual([
      'The scale sent "pcs", not a weight: set it to weigh in ounces.',
    ]);
  });
});
