import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import {
  createLineSplitter,
  parseBareNumber,
  parseHeaderLine,
  parsePrintLine,
  parseScaleLine,
  parseStatusLine,
  type ScaleReading,
} from "@/lib/scale";

// Invented recordings of the four output shapes scales send over a serial line (fixtures/).
const fixture = (name: string) => readFileSync(join(__dirname, "fixtures", name), "utf8");
const readAll = (stream: string) => {
  const split = createLineSplitter();
  return [...split.push(stream), ...split.flush()]
    .map(parseScaleLine)
    .filter((r): r is ScaleReading => r !== null)
    .map(({ kind, value, unit, note }) => ({ kind, value, unit, note }));
};
const r = (kind: ScaleReading["kind"], value?: string, unit?: string, note?: string) => ({
  kind,
  value,
  unit,
  note,
});

describe("status-prefixed lines", () => {
  it("reads S S as stable and S D as still moving, keeping the scale's decimals", () => {
    expect(parseStatusLine("S S     100.00 g")).toEqual({
      kind: "stable",
      value: "100.00",
      unit: "g",
      raw: "S S     100.00 g",
    });
    expect(parseStatusLine("S D     100.01 g")).toMatchObject({
      kind: "unstable",
      value: "100.01",
    });
  });

  it("reads S + as overload, S - as underload, S I and E? as error lines", () => {
    expect(parseStatusLine("S +")?.kind).toBe("overload");
    expect(parseStatusLine("S -")?.kind).toBe("underload");
    expect(parseStatusLine("S I")?.kind).toBe("error");
    expect(parseStatusLine("ES")?.kind).toBe("error");
    expect(parseStatusLine("EL")?.kind).toBe("error");
  });

  it("is not fooled by other families", () => {
    expect(parseStatusLine("ST,+00123.45  g")).toBeNull();
    expect(parseStatusLine("+   123.45 g")).toBeNull();
  });

  it("reads the recorded stream (CRLF): settling, stable twice, off the pan, busy, overload", () => {
    expect(readAll(fixture("status-prefixed.txt"))).toEqual([
      r("unstable", "0.00", "g"),
      r("unstable", "312.48", "g"),
      r("unstable", "498.71", "g"),
      r("unstable", "498.63", "g"),
      r("stable", "498.60", "g"),
      r("stable", "498.60", "g"),
      r("unstable", "120.02", "g"),
      r("stable", "0.00", "g"),
      r("error", undefined, undefined, "scale busy"),
      r("unstable", "512.30", "g"),
      r("stable", "512.34", "g"),
      r("overload"),
      r("underload"),
      r("error", undefined, undefined, "ES"),
      // Counting mode: a number, but not a weight.
      r("error", "12", undefined, "pcs"),
    ]);
  });
});

describe("comma header lines", () => {
  it("reads ST as stable with sign and leading zeros dropped", () => {
    expect(parseHeaderLine("ST,+00123.45  g")).toEqual({
      kind: "stable",
      value: "123.45",
      unit: "g",
      raw: "ST,+00123.45  g",
    });
    expect(parseHeaderLine("US,+00123.47  g")?.kind).toBe("unstable");
    expect(parseHeaderLine("OL,+9999999 g")).toEqual({ kind: "overload", raw: "OL,+9999999 g" });
  });

  it("reads the recorded stream (CR only), gross and net fields, ounces, underload", () => {
    expect(readAll(fixture("comma-header.txt"))).toEqual([
      r("unstable", "312.45", "g"),
      r("unstable", "498.66", "g"),
      r("stable", "498.60", "g"),
      r("stable", "498.60", "g"),
      r("overload"),
      r("stable", "17.588", "oz"),
      r("unstable", "17.590", "oz"),
      r("underload"),
    ]);
  });
});

describe("fixed-width print lines", () => {
  it("the recordings are 16 and 22 characters wide", () => {
    for (const line of fixture("print-16.txt").split("\n").filter(Boolean))
      expect(line).toHaveLength(16);
    for (const line of fixture("print-22.txt").split("\r\n").filter(Boolean))
      expect(line).toHaveLength(22);
  });

  it("reads sign, spaces, number and unit; a trailing ? is still moving", () => {
    expect(parsePrintLine("+   123.45 g    ")).toMatchObject({
      kind: "stable",
      value: "123.45",
      unit: "g",
    });
    expect(parsePrintLine("+   123.47 g  ? ")).toMatchObject({ kind: "unstable" });
    expect(parsePrintLine("-     0.02 g    ")).toMatchObject({ kind: "stable", value: "-0.02" });
    expect(parsePrintLine("+      OL       ")?.kind).toBe("overload");
    expect(parsePrintLine("      123.45    ")).toMatchObject({ kind: "stable", value: "123.45" });
    expect(parsePrintLine("123.45 g junk")).toBeNull();
  });

  it("reads the 16-character recording (LF)", () => {
    expect(readAll(fixture("print-16.txt"))).toEqual([
      r("unstable", "312.45", "g"),
      r("unstable", "498.66", "g"),
      r("stable", "498.60", "g"),
      r("stable", "498.60", "g"),
      r("stable", "-0.02", "g"),
      r("overload"),
      r("stable", "17.5876", "oz"),
    ]);
  });

  it("reads the 22-character recording with status words, carats and grains", () => {
    expect(readAll(fixture("print-22.txt"))).toEqual([
      r("unstable", "498.71", "g"),
      r("stable", "498.60", "g"),
      r("stable", "12.500", "ct"),
      r("stable", "100.0", "gn"),
      r("unstable", "498.65", "g"),
    ]);
  });
});

describe("bare numbers", () => {
  it("reads a number alone as a stable reading in no unit", () => {
    expect(parseBareNumber("0498.6")).toEqual({ kind: "stable", value: "498.6", raw: "0498.6" });
    expect(parseBareNumber("498.6 g")).toBeNull();
    expect(readAll(fixture("bare-number.txt"))).toEqual([
      r("stable", "498.6"),
      r("stable", "512.3"),
      r("stable", "500.0"),
    ]);
  });
});

describe("edge cases", () => {
  it("a blank line is nothing; an unknown line is an error carrying its text", () => {
    expect(parseScaleLine("   ")).toBeNull();
    expect(parseScaleLine("Err 4")).toMatchObject({ kind: "error", note: "Err 4" });
    expect(parseScaleLine("1.2.3 g")?.kind).toBe("error");
  });

  it("drops framing control characters (STX/ETX) around a reading", () => {
    expect(parseScaleLine("\u0002ST,+00123.45  g\u0003")).toMatchObject({
      kind: "stable",
      value: "123.45",
    });
  });

  it("tells grains (gr, gn) from grams (g) and troy from avoirdupois ounces", () => {
    expect(parseScaleLine("+  100.0 gr")?.unit).toBe("gn");
    expect(parseScaleLine("+  100.0 g")?.unit).toBe("g");
    expect(parseScaleLine("+  1.00 oz t")?.unit).toBe("ozt");
    expect(parseScaleLine("+  1.00 oz")?.unit).toBe("oz");
  });
});
