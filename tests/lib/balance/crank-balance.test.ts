import { describe, expect, it } from "vitest";
import { BALANCE_GRADES, checkResidual, permissibleUnbalance } from "@/lib/balance";

describe("permissibleUnbalance", () => {
  it("gives e_per ≈ 20.05 g·mm/kg for G 6.3 at 3000 rpm (ISO 21940-11 check value)", () => {
    const result = permissibleUnbalance({ grade: "6.3", rotorMassKg: "1", rpm: "3000" });
    // e_per = G/Ω = 6.3 mm/s ÷ (2π·3000/60 s⁻¹) = 0.0200535 mm = 20.0535 g·mm/kg
    expect(Number(result.ePer)).toBeCloseTo(20.05, 2);
    expect(result.ePer.startsWith("20.0535228295788")).toBe(true);
    expect(result.angularSpeed.startsWith("314.159265358979")).toBe(true);
  });

  it("agrees with the rounded 9549.3 form of ISO 21940-11 to its five figures", () => {
    // U_per [g·mm] = 9549.3 · G [mm/s] · m [kg] / n [rpm]; 9549.3 ≈ 60 000 / 2π
    const result = permissibleUnbalance({ grade: "G 2.5", rotorMassKg: "20", rpm: "6000" });
    const rounded = (9549.3 * 2.5 * 20) / 6000;
    expect(Math.abs(Number(result.uPer) - rounded) / rounded).toBeLessThan(1e-5);
    expect(Number(result.uPer)).toBeCloseTo(79.5775, 4); // 2500 / 628.3185 × 20
  });

  it("splits U_per half to each plane without plane distances (handbook simplification)", () => {
    const result = permissibleUnbalance({
      grade: "6.3",
      rotorMassKg: "10",
      rpm: "3000",
      correctionRadius: "100",
    });
    expect(result.allocation).toBe("half-each");
    expect(result.planes.map((p) => p.share)).toEqual(["0.5", "0.5"]);
    expect(result.planes[0].uPer).toBe(result.planes[1].uPer);
    expect(Number(result.planes[0].uPer)).toBeCloseTo(100.2676, 4);
    // mass at the radius: U / r, g·mm ÷ mm = g
    expect(Number(result.planes[0].massAtRadius)).toBeCloseTo(1.002676, 6);
    expect(Number(result.massAtRadius)).toBeCloseTo(2.005352, 6);
  });

  it("shares U_per by the plane distances, U_A = U·L_B/L (ISO 21940-11 §7.2)", () => {
    const result = permissibleUnbalance({
      grade: "6.3",
      rotorMassKg: "10",
      rpm: "3000",
      planes: { distanceA: "150", distanceB: "250" },
    });
    expect(result.allocation).toBe("by-distance");
    expect(result.planes.map((p) => p.share)).toEqual(["0.625", "0.375"]);
    expect(result.clamped).toBe(false);
  });

  it("limits each plane's share to 30–70 % and says so (ISO 21940-11 §7.2)", () => {
    const result = permissibleUnbalance({
      grade: "6.3",
      rotorMassKg: "10",
      rpm: "3000",
      planes: { distanceA: "100", distanceB: "300" },
    });
    // raw shares 0.75 / 0.25 → 0.7 / 0.3
    expect(result.planes.map((p) => [p.share, p.clamped])).toEqual([
      ["0.7", true],
      ["0.3", true],
    ]);
    expect(result.clamped).toBe(true);
    expect(Number(result.planes[0].uPer) + Number(result.planes[1].uPer)).toBeCloseTo(
      Number(result.uPer),
      9,
    );
  });

  it("lists the grades G 4000 to G 0.4", () => {
    expect(BALANCE_GRADES).toEqual([
      "4000",
      "1600",
      "630",
      "250",
      "100",
      "40",
      "16",
      "6.3",
      "2.5",
      "1",
      "0.4",
    ]);
    expect(permissibleUnbalance({ grade: "1.0", rotorMassKg: "1", rpm: "1000" }).grade).toBe("1");
  });

  describe("edge cases", () => {
    it("refuses unknown grades and non-positive mass or speed", () => {
      expect(() => permissibleUnbalance({ grade: "5", rotorMassKg: "1", rpm: "1000" })).toThrow(
        expect.objectContaining({ field: "grade", code: "unknown-grade" }),
      );
      expect(() => permissibleUnbalance({ grade: "6.3", rotorMassKg: "0", rpm: "1000" })).toThrow(
        expect.objectContaining({ field: "rotorMassKg", code: "not-positive" }),
      );
      expect(() => permissibleUnbalance({ grade: "6.3", rotorMassKg: "1", rpm: "-1" })).toThrow(
        expect.objectContaining({ field: "rpm", code: "negative" }),
      );
      expect(() =>
        permissibleUnbalance({
          grade: "6.3",
          rotorMassKg: "1",
          rpm: "1000",
          correctionRadius: "0",
        }),
      ).toThrow(expect.objectContaining({ field: "correctionRadius" }));
      expect(() =>
        permissibleUnbalance({
          grade: "6.3",
          rotorMassKg: "1",
          rpm: "1000",
          planes: { distanceA: "0", distanceB: "1" },
        }),
      ).toThrow(expect.objectContaining({ field: "planes.distanceA" }));
    });
  });
});

describe("checkResidual", () => {
  it("compares mass × radius with each plane's allowance (ISO 21940-11)", () => {
    const result = checkResidual({
      permissible: {
        planes: [
          { plane: "A", uPer: "100" },
          { plane: "B", uPer: "100" },
        ],
      },
      readings: [
        { plane: "A", mass: "0.8", radius: "100", angle: "45" },
        { plane: "B", mass: "1.1", radius: "100" },
      ],
    });
    expect(result).toEqual({
      pass: false,
      planes: [
        {
          plane: "A",
          residual: "80",
          allowed: "100",
          pass: true,
          margin: "20",
          marginPercent: "20",
          angle: "45",
        },
        {
          plane: "B",
          residual: "110",
          allowed: "100",
          pass: false,
          margin: "-10",
          marginPercent: "-10",
        },
      ],
    });
  });

  it("takes a permissibleUnbalance result directly and passes a residual right at the limit", () => {
    const permissible = permissibleUnbalance({ grade: "6.3", rotorMassKg: "10", rpm: "3000" });
    const atLimit = { plane: "A", mass: permissible.planes[0].uPer, radius: "1" };
    const result = checkResidual({
      permissible,
      readings: [atLimit, { plane: "B", mass: "0", radius: "50" }],
    });
    expect(result.pass).toBe(true);
    expect(result.planes[0]?.margin).toBe("0");
    expect(result.planes[1]?.marginPercent).toBe("100");
  });

  describe("edge cases", () => {
    const permissible = { planes: [{ plane: "A", uPer: "100" }] };
    it("refuses unknown, repeated and missing planes, and bad readings", () => {
      expect(() =>
        checkResidual({ permissible, readings: [{ plane: "C", mass: "1", radius: "1" }] }),
      ).toThrow(expect.objectContaining({ field: "readings.0.plane", code: "unknown-plane" }));
      expect(() =>
        checkResidual({
          permissible,
          readings: [
            { plane: "A", mass: "1", radius: "1" },
            { plane: "A", mass: "1", radius: "1" },
          ],
        }),
      ).toThrow(expect.objectContaining({ code: "duplicate" }));
      expect(() => checkResidual({ permissible, readings: [] })).toThrow(
        expect.objectContaining({ code: "missing-plane" }),
      );
      expect(() =>
        checkResidual({ permissible, readings: [{ plane: "A", mass: "1", radius: "0" }] }),
      ).toThrow(expect.objectContaining({ field: "readings.0.radius", code: "not-positive" }));
      expect(() =>
        checkResidual({
          permissible,
          readings: [{ plane: "A", mass: "1", radius: "1", angle: "361" }],
        }),
      ).toThrow(expect.objectContaining({ field: "readings.0.angle", code: "out-of-range" }));
      expect(() => checkResidual({ permissible: { planes: [] }, readings: [] })).toThrow(
        expect.objectContaining({ code: "empty" }),
      );
    });
  });
});
