import { describe, expect, it } from "vitest";
import { formatMass } from "@/lib/balance";
import { readingAtJobResolution } from "@/lib/scale";

// A reading goes in at the job's scale resolution by the same rule as formatMass: round half
// away from zero at the resolution's step, as a scale's indication is rounded (NIST Handbook 44,
// from memory). Each expected figure below is rounded by hand.
const at = (value: string, unit: string | undefined, jobUnit: "g" | "oz", resolution: string) =>
  readingAtJobResolution(value, unit, jobUnit, resolution);

describe("a scale reading at the job's resolution", () => {
  it("rounds a 0.01 g reading to a 0.1 g job, halves away from zero", () => {
    // 401.70 → 401.7; 400.45 is exactly half a 0.1 g step above 400.4 → 400.5 (away from zero).
    expect(at("401.70", "g", "g", "0.1")).toMatchObject({ ok: true, value: "401.7" });
    expect(at("400.45", "g", "g", "0.1")).toMatchObject({ ok: true, value: "400.5" });
    expect(at("400.44", "g", "g", "0.1")).toMatchObject({ ok: true, value: "400.4" });
    // The same rule formatMass uses, so the box and every later screen agree.
    expect(at("400.45", "g", "g", "0.1")).toMatchObject({ value: formatMass("400.45", "0.1") });
  });

  it("rounds to a 0.05 g step: 498.63 → 498.65, 498.62 → 498.60", () => {
    // 498.63 / 0.05 = 9972.6 → 9973 × 0.05 = 498.65; 498.62 / 0.05 = 9972.4 → 9972 → 498.60.
    expect(at("498.63", "g", "g", "0.05")).toMatchObject({ value: "498.65" });
    expect(at("498.62", "g", "g", "0.05")).toMatchObject({ value: "498.60" });
  });

  it("rounds the exact conversion once, not a rounded one again", () => {
    // By hand (NIST SP 811 factor 28.349523125 g/oz): 10.1395 oz = 283.49523125 + 3.9547584759375
    // = 287.4499897259375 g → 287.4 at 0.1 g. Rounding first to the 4 decimals the converted
    // reading used to carry gives 287.4500, then 287.5: a double rounding.
    expect(at("10.1395", "oz", "g", "0.1")).toMatchObject({ value: "287.4" });
    // 0.0176 oz = 0.4989516070 g → 0.5 g.
    expect(at("0.0176", "oz", "g", "0.1")).toMatchObject({ value: "0.5" });
    // 498.6 g / 28.349523125 = 17.587596… oz → 17.588 oz at a 0.001 oz job.
    expect(at("498.6", "g", "oz", "0.001")).toMatchObject({ value: "17.588" });
  });

  it("says once that a finer scale's last digit is rounded off", () => {
    const r = at("401.70", "g", "g", "0.1");
    expect(r).toMatchObject({ fit: "finer" });
    expect(r.ok && r.note).toContain("The scale reads to 0.01 g; this job records to 0.1 g");
  });

  it("says where the scale is coarser than the job, and nothing where they match", () => {
    const coarse = at("401", "g", "g", "0.1");
    expect(coarse).toMatchObject({ value: "401.0", fit: "coarser" });
    expect(coarse.ok && coarse.note).toContain("The scale reads to 1 g; this job records to 0.1 g");
    expect(at("401.7", "g", "g", "0.1")).toMatchObject({ fit: "same", note: null });
    expect(at("401.7", undefined, "g", "0.1")).toMatchObject({ fit: "same", note: null });
    // 0.1 oz = 2.8349523125 g, coarser than 0.1 g; shown to two significant figures.
    const oz = at("17.5", "oz", "g", "0.1");
    expect(oz).toMatchObject({ value: "496.1", fit: "coarser" });
    expect(oz.ok && oz.note).toContain("The scale reads to 0.1 oz (2.8 g)");
  });

  it("refuses a count as before", () => {
    expect(at("12", "pcs", "g", "0.1")).toMatchObject({ ok: false });
  });
});
