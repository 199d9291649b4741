import { describe, expect, it } from "vitest";
import {
  DEFAULT_POINT_ANGLE_DEG,
  drillDepthForMass,
  MATERIAL_DENSITIES,
  moveCorrection,
  plugNetMass,
  splitCorrection,
} from "@/lib/balance";

describe("material densities", () => {
  it("carries the handbook values, g/cm³", () => {
    // ASM Metals Handbook Desk Edition: steel 7.85, grey cast iron ≈ 7.2, ductile iron ≈ 7.15.
    expect(MATERIAL_DENSITIES.steel.density).toBe("7.85");
    expect(MATERIAL_DENSITIES.greyCastIron.density).toBe("7.2");
    expect(MATERIAL_DENSITIES.ductileIron.density).toBe("7.15");
    // Aluminum Association typical values: 4032 ≈ 2.68, 2618 ≈ 2.76.
    expect(MATERIAL_DENSITIES.aluminium4032.density).toBe("2.68");
    expect(MATERIAL_DENSITIES.aluminium2618.density).toBe("2.76");
    // ASTM B777 classes 1–4, about 17–18.8 g/cm³ (nominal values from memory, marked as such).
    const heavy = [1, 2, 3, 4].map(
      (n) => MATERIAL_DENSITIES[`heavyMetalClass${n}` as keyof typeof MATERIAL_DENSITIES],
    );
    expect(heavy.map((m) => m.density)).toEqual(["17.0", "17.5", "18.0", "18.5"]);
    for (const material of heavy) expect(material.source).toMatch(/ASTM B777.*from memory/);
  });
});

describe("drillDepthForMass", () => {
  it("has a 118° point of length 0.3004 × D (geometry)", () => {
    expect(DEFAULT_POINT_ANGLE_DEG).toBe("118");
    const result = drillDepthForMass({ mass: "5", diameter: "10", density: "7.85" });
    // h = (D/2)·cot 59° = 5 × 0.600861 = 3.004303 mm
    expect(Number(result.coneLength)).toBeCloseTo(3.004303, 6);
    expect(Number(result.coneLength) / 10).toBeCloseTo(0.3004, 4);
  });

  it("drills T = m/(ρπr²) + 2h/3 past the full cone (worked by hand)", () => {
    // 5 g of steel with a 10 mm drill: V = 5 / 7.85 × 1000 = 636.9427 mm³; πr² = 78.53982 mm²;
    // T = 636.9427 / 78.53982 + 2 × 3.004303 / 3 = 8.109806 + 2.002869 = 10.112675 mm; at full diameter 7.108372 mm.
    const result = drillDepthForMass({
      mass: "5",
      diameter: "10",
      density: MATERIAL_DENSITIES.steel.density,
    });
    expect(result.shallow).toBe(false);
    expect(Number(result.volume)).toBeCloseTo(636.9427, 4);
    expect(Number(result.tipDepth)).toBeCloseTo(10.112675, 6);
    expect(Number(result.fullDiameterDepth)).toBeCloseTo(7.108372, 6);
    expect(result.pointAngle).toBe("118");
  });

  it("cuts only part of the cone for a small mass: T = ∛(3V / (π tan²α))", () => {
    // 0.01 g of steel: V = 1.273885 mm³ < cone 78.65 mm³; tan 59° = 1.664279;
    // T = ∛(3 × 1.273885 / (π × 2.769825)) = ∛0.439189 = 0.760122 mm
    const result = drillDepthForMass({ mass: "0.01", diameter: "10", density: "7.85" });
    expect(result.shallow).toBe(true);
    expect(result.fullDiameterDepth).toBe("0");
    expect(Number(result.tipDepth)).toBeCloseTo(0.760122, 6);
  });

  it("meets at the full cone: both cases give T = h", () => {
    const h = 3.004303095137802;
    const coneMass = ((Math.PI * 25 * h) / 3 / 1000) * 7.85;
    const below = drillDepthForMass({
      mass: (coneMass * (1 - 1e-12)).toFixed(15),
      diameter: "10",
      density: "7.85",
    });
    const above = drillDepthForMass({
      mass: (coneMass * (1 + 1e-12)).toFixed(15),
      diameter: "10",
      density: "7.85",
    });
    expect(below.shallow).toBe(true);
    expect(above.shallow).toBe(false);
    expect(Number(below.tipDepth)).toBeCloseTo(h, 9);
    expect(Number(above.tipDepth)).toBeCloseTo(h, 9);
  });

  it("takes another point angle: 90° gives a point as long as the radius", () => {
    expect(
      drillDepthForMass({ mass: "5", diameter: "10", density: "7.85", pointAngle: "90" })
        .coneLength,
    ).toBe("5");
  });

  describe("edge cases", () => {
    it("refuses non-positive sizes and impossible point angles", () => {
      expect(() => drillDepthForMass({ mass: "5", diameter: "0", density: "7.85" })).toThrow(
        expect.objectContaining({ field: "diameter", code: "not-positive" }),
      );
      expect(() => drillDepthForMass({ mass: "5", diameter: "10", density: "-7.85" })).toThrow(
        expect.objectContaining({ field: "density", code: "negative" }),
      );
      expect(() => drillDepthForMass({ mass: "0", diameter: "10", density: "7.85" })).toThrow(
        expect.objectContaining({ field: "mass" }),
      );
      expect(() =>
        drillDepthForMass({ mass: "5", diameter: "10", density: "7.85", pointAngle: "180" }),
      ).toThrow(expect.objectContaining({ field: "pointAngle", code: "out-of-range" }));
    });
  });
});

describe("plugNetMass", () => {
  it("adds (ρ_plug − ρ_host) × V, not ρ_plug × V (geometry)", () => {
    // 12.7 mm × 25 mm: V = π × 6.35² × 25 = 3166.922 mm³ = 3.166922 cm³.
    // ASTM B777 class 3 (18.0) in steel (7.85): (18.0 − 7.85) × 3.166922 = 32.14426 g.
    const result = plugNetMass({
      diameter: "12.7",
      length: "25",
      plugDensity: "18.0",
      hostDensity: "7.85",
    });
    expect(Number(result.volume)).toBeCloseTo(3166.9217, 4);
    expect(Number(result.plugMass)).toBeCloseTo(57.00459, 5);
    expect(Number(result.removedMass)).toBeCloseTo(24.86034, 5);
    expect(Number(result.netMass)).toBeCloseTo(32.14426, 5);
  });

  it("counts the empty cone a 118° point leaves under a flat-ended ½ in plug (worked by hand)", () => {
    // ½ in = 12.7 mm (NIST SP 811), r = 6.35 mm, r² = 40.3225 mm².
    // Point length h = r·cot 59° = 6.35 × 0.6008606 = 3.8154649 mm (geometry: 0.3004·D).
    // Cone V = π r² h / 3 = 126.67687 × 3.8154649 / 3 = 161.11038 mm³.
    // Its steel (7.85 g/cm³): 161.11038 × 7.85 / 1000 = 1.2647165 g, nothing in its place.
    // Net = 32.1442557 − 1.2647165 = 30.8795392 g: 1.26 g less, 3.9 % of the flat figure.
    const flat = plugNetMass({
      diameter: "12.7",
      length: "25",
      plugDensity: "18.0",
      hostDensity: "7.85",
    });
    const pointed = plugNetMass({
      diameter: "12.7",
      length: "25",
      plugDensity: "18.0",
      hostDensity: "7.85",
      pointAngle: "118",
    });
    expect(Number(pointed.pointVoidVolume)).toBeCloseTo(161.11038, 5);
    expect(Number(pointed.pointVoidMass)).toBeCloseTo(1.2647165, 7);
    expect(Number(pointed.netMass)).toBeCloseTo(30.8795392, 7);
    expect(Number(pointed.removedMass)).toBeCloseTo(24.86034 + 1.2647165, 5);
    expect(pointed.plugMass).toBe(flat.plugMass);
    const loss = Number(flat.netMass) - Number(pointed.netMass);
    expect(loss).toBeCloseTo(1.26, 2);
    expect((loss / Number(flat.netMass)) * 100).toBeCloseTo(3.9, 1);
  });

  it("agrees with the drill-depth geometry: the void is the cone drillDepthForMass cuts", () => {
    // Second derivation: the whole cone's mass, drilled to a tip depth equal to the point length h,
    // is the mass drillDepthForMass removes at T = h (shallow case, full cone).
    const pointed = plugNetMass({
      diameter: "10",
      length: "5",
      plugDensity: "17.0",
      hostDensity: "7.2",
      pointAngle: "118",
    });
    const drilled = drillDepthForMass({
      mass: pointed.pointVoidMass!,
      diameter: "10",
      density: "7.2",
    });
    expect(Number(drilled.tipDepth)).toBeCloseTo(Number(drilled.coneLength), 9);
  });

  it("keeps today's result when no point angle is given", () => {
    expect(
      plugNetMass({ diameter: "12.7", length: "25", plugDensity: "18.0", hostDensity: "7.85" }),
    ).toEqual({
      volume: expect.any(String),
      plugMass: expect.any(String),
      removedMass: expect.any(String),
      netMass: expect.stringMatching(/^32\.1442557/),
    });
  });

  it("refuses a point angle of 180° or more", () => {
    expect(() =>
      plugNetMass({
        diameter: "10",
        length: "10",
        plugDensity: "18",
        hostDensity: "7.85",
        pointAngle: "180",
      }),
    ).toThrow(expect.objectContaining({ field: "pointAngle", code: "out-of-range" }));
  });

  it("is negative for a plug lighter than the part", () => {
    expect(
      Number(
        plugNetMass({ diameter: "10", length: "10", plugDensity: "2.68", hostDensity: "7.85" })
          .netMass,
      ),
    ).toBeLessThan(0);
  });
});

describe("moveCorrection", () => {
  it("keeps the unbalance m·r: m₂ = m₁ r₁ / r₂ (geometry)", () => {
    expect(moveCorrection({ mass: "12", fromRadius: "50", toRadius: "75" })).toEqual({
      mass: "8",
      unbalance: "600",
    });
    expect(moveCorrection({ mass: "8", fromRadius: "75", toRadius: "50" }).mass).toBe("12");
  });

  it("refuses a zero radius", () => {
    expect(() => moveCorrection({ mass: "12", fromRadius: "50", toRadius: "0" })).toThrow(
      expect.objectContaining({ field: "toRadius", code: "not-positive" }),
    );
  });
});

describe("splitCorrection", () => {
  it("needs m / (2 cos θ) in each of two holes at ±θ (geometry)", () => {
    expect(splitCorrection({ mass: "10", halfAngleDeg: "0" }).massEach).toBe("5");
    expect(splitCorrection({ mass: "10", halfAngleDeg: "60" })).toEqual({
      massEach: "10",
      totalMass: "20",
      halfAngleDeg: "60",
    });
    expect(Number(splitCorrection({ mass: "10", halfAngleDeg: "45" }).massEach)).toBeCloseTo(
      7.0710678,
      7,
    );
  });

  it("refuses 90° or more", () => {
    expect(() => splitCorrection({ mass: "10", halfAngleDeg: "90" })).toThrow(
      expect.objectContaining({ field: "halfAngleDeg", code: "out-of-range" }),
    );
    expect(() => splitCorrection({ mass: "10", halfAngleDeg: "-10" })).toThrow(
      expect.objectContaining({ code: "negative" }),
    );
  });
});
