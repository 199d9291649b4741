import { unit } from "mathjs";
import { describe, expect, it } from "vitest";
import { valveSpring } from "@/lib/assembly";

// Reference library for the unit check: mathjs units (lbf, inch; 1 lbf = 4.4482216152605 N and
// 1 in = 25.4 mm exactly, NIST SP 811 appendix B).

// Hooke's law for a linear spring: F = k x.
describe("valveSpring", () => {
  it("gives 250 lb open from 100 lb seat, 300 lb/in and 0.500 in lift (published worked example)", () => {
    const result = valveSpring({
      installedLoad: "100",
      rate: "300",
      installedHeight: "1.800",
      lift: "0.500",
    });
    expect(result).toEqual({ seatLoad: "100", openLoad: "250", openHeight: "1.3" });
  });

  it("estimates the seat load from free length and adds rate × shim (worked by hand)", () => {
    // free 2.100, installed 1.750, shim 0.030 → height 1.720;
    // seat = 300 × (2.100 − 1.720) = 114 lb (= 300 × 0.350 = 105 plus 300 × 0.030 = 9);
    // open = 114 + 300 × 0.450 = 249 lb; open height 1.720 − 0.450 = 1.270; margin 1.270 − 1.100 = 0.170
    expect(
      valveSpring({
        rate: "300",
        freeLength: "2.100",
        installedHeight: "1.750",
        shim: "0.030",
        lift: "0.450",
        solidHeight: "1.100",
      }),
    ).toEqual({
      seatLoad: "114",
      openLoad: "249",
      openHeight: "1.27",
      coilBindMargin: "0.17",
      coilBind: false,
    });
  });

  it("adds rate × shim to a measured installed load too", () => {
    // 100 + 300 × 0.060 = 118 lb seat; 118 + 300 × 0.500 = 268 lb open
    expect(
      valveSpring({
        installedLoad: "100",
        rate: "300",
        installedHeight: "1.800",
        shim: "0.060",
        lift: "0.500",
      }),
    ).toMatchObject({ seatLoad: "118", openLoad: "268", openHeight: "1.24" });
  });

  it("flags coil bind when the spring goes solid before full lift", () => {
    // 1.800 − 0.650 = 1.150 open height against 1.160 solid: −0.010, bound
    expect(
      valveSpring({
        installedLoad: "110",
        rate: "320",
        installedHeight: "1.800",
        lift: "0.650",
        solidHeight: "1.160",
      }),
    ).toMatchObject({ coilBindMargin: "-0.01", coilBind: true });
    // exactly solid counts as bound
    expect(
      valveSpring({
        installedLoad: "110",
        rate: "320",
        installedHeight: "1.800",
        lift: "0.640",
        solidHeight: "1.160",
      }),
    ).toMatchObject({ coilBindMargin: "0", coilBind: true });
  });

  it("gives the same loads in N from N/mm and mm (mathjs units)", () => {
    const lbf = unit("1 lbf").toNumber("N");
    const metric = valveSpring({
      installedLoad: String(100 * lbf),
      rate: String((300 * lbf) / 25.4),
      installedHeight: "45.72", // 1.800 × 25.4
      lift: "12.7", // 0.500 × 25.4
    });
    expect(Number(metric.openLoad)).toBeCloseTo(unit("250 lbf").toNumber("N"), 6);
  });

  describe("refusals name the field", () => {
    const base = { installedLoad: "100", rate: "300", installedHeight: "1.800", lift: "0.500" };
    const cases: [string, Record<string, string | undefined>, string, string][] = [
      [
        "no load and no free length",
        { ...base, installedLoad: undefined },
        "installedLoad",
        "required",
      ],
      ["rate zero", { ...base, rate: "0" }, "rate", "not-positive"],
      ["installed height missing", { ...base, installedHeight: "" }, "installedHeight", "required"],
      ["lift zero", { ...base, lift: "0" }, "lift", "not-positive"],
      ["lift past the installed height", { ...base, lift: "1.800" }, "lift", "out-of-range"],
      ["shim negative", { ...base, shim: "-0.015" }, "shim", "negative"],
      ["shim as thick as the height", { ...base, shim: "1.800" }, "shim", "out-of-range"],
      [
        "a free length no longer than the installed height",
        { ...base, installedLoad: undefined, freeLength: "1.800" },
        "freeLength",
        "out-of-range",
      ],
      [
        "a solid height at the free length",
        { ...base, freeLength: "2.100", solidHeight: "2.100" },
        "solidHeight",
        "out-of-range",
      ],
      ["load negative", { ...base, installedLoad: "-1" }, "installedLoad", "negative"],
    ];
    it.each(cases)("%s", (_label, input, field, code) => {
      expect(() => valveSpring(input as never)).toThrow(expect.objectContaining({ field, code }));
    });
  });
});
