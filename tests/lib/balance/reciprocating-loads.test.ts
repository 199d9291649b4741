import { describe, expect, it } from "vitest";
import { reciprocatingLoads } from "@/lib/balance";

describe("reciprocatingLoads", () => {
  // Worked by hand (Heywood, ICE Fundamentals, ch. 2): stroke 86 mm, rod 143 mm, 6000 rpm, 600 g.
  // S̄p = 2 × 0.086 m × 6000 / 60 = 17.2 m/s; r = 43 mm; λ = 43/143 = 0.300699;
  // ω = 2π × 6000 / 60 = 628.3185 rad/s; r ω² = 0.043 × 394784.18 = 16975.72 m/s²;
  // a(θ = 0) = r ω² (1 + λ) = 22080.31 m/s²; primary m r ω² = 10185.43 N; secondary λ × that = 3062.75 N.
  const loads = reciprocatingLoads({
    stroke: "86",
    rodLength: "143",
    rpm: "6000",
    reciprocatingMass: "600",
  });

  it("gives the mean piston speed 2·L·N (Heywood ch. 2)", () => {
    expect(loads.meanPistonSpeed).toBe("17.2");
  });

  it("gives the two-term peak acceleration and says which form it used", () => {
    expect(loads.form).toBe("two-term");
    expect(loads.crankRadius).toBe("43");
    expect(Number(loads.lambda)).toBeCloseTo(0.300699, 6);
    expect(Number(loads.angularSpeed)).toBeCloseTo(628.3185, 4);
    expect(Number(loads.peakAcceleration)).toBeCloseTo(22080.31, 2);
  });

  it("gives the primary and secondary force amplitudes m r ω² and λ m r ω²", () => {
    expect(Number(loads.primaryForce)).toBeCloseTo(10185.43, 2);
    expect(Number(loads.secondaryForce)).toBeCloseTo(3062.75, 2);
  });

  describe("edge cases", () => {
    it("refuses a rod no longer than the crank radius and zero speed", () => {
      expect(() =>
        reciprocatingLoads({
          stroke: "86",
          rodLength: "43",
          rpm: "6000",
          reciprocatingMass: "600",
        }),
      ).toThrow(expect.objectContaining({ field: "rodLength", code: "out-of-range" }));
      expect(() =>
        reciprocatingLoads({ stroke: "86", rodLength: "143", rpm: "0", reciprocatingMass: "600" }),
      ).toThrow(expect.objectContaining({ field: "rpm", code: "not-positive" }));
    });
  });
});
