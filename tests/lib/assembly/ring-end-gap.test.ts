import { describe, expect, it } from "vitest";
import { AssemblyInputError, isAssemblyInputError, ringEndGap } from "@/lib/assembly";

// Ring end gap = factor × bore (common practice). The factors used here are
// invented for the tests: real ones come from the ring maker and vary by maker and use.

describe("ringEndGap", () => {
  it("gives factor × bore in the bore's unit (worked by hand)", () => {
    // 0.0045 × 4.030 in = 0.018135 in
    expect(ringEndGap({ bore: "4.030", factor: "0.0045" })).toEqual({ target: "0.018135" });
    // metric: 0.0045 × 86 mm = 0.387 mm
    expect(ringEndGap({ bore: "86", factor: "0.0045" }).target).toBe("0.387");
  });

  it("calls a 0.004 in gap on a 3 in bore far too tight and says how much to file (common practice)", () => {
    // target 0.004 × 3.000 = 0.012 in; 0.012 − 0.004 = 0.008 in to file off
    expect(ringEndGap({ bore: "3.000", factor: "0.004", measured: "0.004" })).toEqual({
      target: "0.012",
      status: "tight",
      fileOff: "0.008",
    });
  });

  it("is ok from the target up to the shop maximum and wide above it", () => {
    // target 0.0045 × 4.000 = 0.018; max 0.0065 × 4.000 = 0.026
    const base = { bore: "4.000", factor: "0.0045", maxFactor: "0.0065" };
    expect(ringEndGap({ ...base, measured: "0.018" })).toEqual({
      target: "0.018",
      maxGap: "0.026",
      status: "ok",
    });
    expect(ringEndGap({ ...base, measured: "0.026" }).status).toBe("ok");
    expect(ringEndGap({ ...base, measured: "0.0261" })).toEqual({
      target: "0.018",
      maxGap: "0.026",
      status: "wide",
    });
    expect(ringEndGap({ ...base, measured: "0.0179" })).toMatchObject({
      status: "tight",
      fileOff: "0.0001",
    });
  });

  it("gives no file-off figure unless the ring is tight, and no status without a measurement", () => {
    expect(ringEndGap({ bore: "4.000", factor: "0.0045", measured: "0.030" })).toEqual({
      target: "0.018",
      status: "ok",
    });
  });

  describe("refusals name the field", () => {
    const cases: [string, Record<string, unknown>, string, string][] = [
      ["bore missing", { factor: "0.0045" }, "bore", "required"],
      ["bore zero", { bore: "0", factor: "0.0045" }, "bore", "not-positive"],
      ["bore as a number", { bore: 4.03, factor: "0.0045" }, "bore", "not-a-string"],
      ["factor typed as 4.5", { bore: "4.030", factor: "4.5" }, "factor", "out-of-range"],
      ["factor zero", { bore: "4.030", factor: "0" }, "factor", "not-positive"],
      ["factor in words", { bore: "4.030", factor: "abc" }, "factor", "not-a-decimal"],
      [
        "measured negative",
        { bore: "4.030", factor: "0.0045", measured: "-0.01" },
        "measured",
        "negative",
      ],
      [
        "max below factor",
        { bore: "4.030", factor: "0.0045", maxFactor: "0.004" },
        "maxFactor",
        "out-of-range",
      ],
      [
        "max typed as 6.5",
        { bore: "4.030", factor: "0.0045", maxFactor: "6.5" },
        "maxFactor",
        "out-of-range",
      ],
      ["bore NaN", { bore: "NaN", factor: "0.0045" }, "bore", "not-finite"],
    ];
    it.each(cases)("%s", (_label, input, field, code) => {
      expect(() => ringEndGap(input as never)).toThrow(expect.objectContaining({ field, code }));
    });

    it("throws the typed error with the builder's name for the field", () => {
      try {
        ringEndGap({ bore: "4.030", factor: "4.5" });
        expect.unreachable();
      } catch (error) {
        expect(error).toBeInstanceOf(AssemblyInputError);
        expect(isAssemblyInputError(error)).toBe(true);
        expect((error as Error).message).toMatch(/^Gap factor /);
      }
    });
  });
});
