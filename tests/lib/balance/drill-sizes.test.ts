import { all, create, type FactoryFunctionMap } from "mathjs";
import { describe, expect, it } from "vitest";
import { LETTER_DRILL_INCHES, NUMBER_DRILL_INCHES, parseDrillSize } from "@/lib/balance";

// Reference library: mathjs with BigNumber arithmetic carries 1 in = 25.4 mm exactly.
const math = create(all as FactoryFunctionMap, { number: "BigNumber", precision: 64 });
const inchesToMm = (expr: string) => math.evaluate(`(${expr}) inch`).toNumeric("mm").toString();

describe("parseDrillSize", () => {
  describe("millimetre sizes", () => {
    it("reads a bare number as millimetres, with or without the unit", () => {
      expect(parseDrillSize("8.5")).toEqual({
        diameterMm: "8.5",
        diameterIn: expect.stringMatching(/^0\.33464566929133858/),
        entered: "8.5 mm",
        unit: "mm",
        kind: "metric",
      });
      expect(parseDrillSize("8.5 mm").diameterMm).toBe("8.5");
      expect(parseDrillSize("10mm").entered).toBe("10 mm");
      expect(parseDrillSize(" 12.7 MM ").diameterMm).toBe("12.7");
    });
  });

  describe("inch sizes (1 in = 25.4 mm exactly, NIST SP 811 App. B.8; checked with mathjs)", () => {
    it.each([
      ["3/8", "3/8", '3/8"'],
      ['3/8"', "3/8", '3/8"'],
      ["3/8 in", "3/8", '3/8"'],
      ["1/2 inch", "1/2", '1/2"'],
      ["1-1/4", "1 + 1/4", '1-1/4"'],
      ['1 1/4"', "1 + 1/4", '1-1/4"'],
      ["5/16", "5/16", '5/16"'],
    ])("reads the fraction %s", (text, expr, entered) => {
      const size = parseDrillSize(text);
      expect(size.diameterMm).toBe(inchesToMm(expr));
      expect(size).toMatchObject({ unit: "in", kind: "fraction", entered });
    });

    it("gives 3/8 in as 9.525 mm (hand: 0.375 × 25.4 = 9.525)", () => {
      expect(parseDrillSize("3/8")).toMatchObject({ diameterMm: "9.525", diameterIn: "0.375" });
    });

    it.each([
      ["0.375 in", "0.375"],
      ['0.375"', "0.375"],
      [".5 in", "0.5"],
      ["0.25 inches", "0.25"],
    ])("reads decimal inches %s", (text, value) => {
      const size = parseDrillSize(text);
      expect(size.diameterMm).toBe(inchesToMm(value));
      expect(size).toMatchObject({ unit: "in", kind: "decimal-inch", diameterIn: value });
    });
  });

  describe("number and letter sizes (ASME B94.11M table; values checked against published charts)", () => {
    // Published decimal equivalents (number/letter drill charts, ASME B94.11M): #1 = 0.2280 in,
    // #7 = 0.2010 (the 1/4-20 tap drill), #21 = 0.1590 (the 10-32 tap drill), #60 = 0.0400,
    // #80 = 0.0135; A = 0.234, F = 0.257 (the 5/16-18 tap drill), Q = 0.332, Z = 0.413.
    it.each([
      ["#1", "0.2280"],
      ["#7", "0.2010"],
      ["No. 21", "0.1590"],
      ["no 60", "0.0400"],
      ["#80", "0.0135"],
    ])("%s is %s in", (text, inches) => {
      const size = parseDrillSize(text);
      expect(size.diameterMm).toBe(inchesToMm(inches));
      expect(size).toMatchObject({ unit: "in", kind: "number" });
    });

    it.each([
      ["A", "0.234"],
      ["letter F", "0.257"],
      ["f", "0.257"],
      ["Q", "0.332"],
      ["Z", "0.413"],
    ])("letter %s is %s in", (text, inches) => {
      const size = parseDrillSize(text);
      expect(size.diameterMm).toBe(inchesToMm(inches));
      expect(size).toMatchObject({ unit: "in", kind: "letter" });
    });

    it("runs #80 to #1 and A to Z without a step backwards, and #1 is smaller than A", () => {
      // Published charts: the number series grows from #80 to #1 and the letter series takes over above it.
      const numbers = NUMBER_DRILL_INCHES.map(Number);
      expect(numbers).toHaveLength(80);
      for (let i = 1; i < numbers.length; i += 1) expect(numbers[i]).toBeLessThan(numbers[i - 1]!);
      const letters = Object.values(LETTER_DRILL_INCHES).map(Number);
      expect(letters).toHaveLength(26);
      for (let i = 1; i < letters.length; i += 1)
        expect(letters[i]).toBeGreaterThan(letters[i - 1]!);
      expect(numbers[0]).toBeLessThan(letters[0]!);
    });

    it("names the size as a machinist reads it back", () => {
      expect(parseDrillSize("No. 21").entered).toBe("#21");
      expect(parseDrillSize("f").entered).toBe("letter F");
    });
  });

  describe("refusals name the field", () => {
    it.each(["", "  ", "3/8x", "eight", "1/0", "8,5 mm", "#", "AA"])("refuses %j", (text) => {
      expect(() => parseDrillSize(text, "drill")).toThrow(
        expect.objectContaining({ field: "drill" }),
      );
    });

    it("refuses number sizes outside #1–#80 and sizes above 4 in", () => {
      expect(() => parseDrillSize("#81")).toThrow(
        expect.objectContaining({ field: "drillSize", code: "out-of-range" }),
      );
      expect(() => parseDrillSize("#0")).toThrow(expect.objectContaining({ code: "out-of-range" }));
      expect(() => parseDrillSize("5 in")).toThrow(
        expect.objectContaining({ code: "out-of-range" }),
      );
      expect(() => parseDrillSize("0")).toThrow(expect.objectContaining({ code: "not-positive" }));
      expect(() => parseDrillSize("0/8")).toThrow(
        expect.objectContaining({ code: "not-positive" }),
      );
    });

    it("says in the message which forms it reads", () => {
      expect(() => parseDrillSize("3/8x")).toThrow(/3\/8.*#21.*letter size/);
    });
  });
});
