import { all, create, type FactoryFunctionMap } from "mathjs";
import { describe, expect, it } from "vitest";
import {
  compressionRatio,
  deckClearance,
  dynamicCompressionRatio,
  pistonPosition,
} from "@/lib/assembly";

// Reference library: mathjs with BigNumber arithmetic and its unit conversions
// (1 in = 25.4 mm exactly, NIST SP 811 appendix B).
const math = create(all as FactoryFunctionMap, { number: "BigNumber", precision: 64 });
const close = (actual: string, expected: string, digits = 20) =>
  expect(
    math.abs(math.subtract(math.bignumber(actual), math.bignumber(expected))).toNumber(),
  ).toBeLessThan(10 ** -digits);

// An invented engine: bore 100 mm, stroke 80 mm, rod 150 mm, 50 cc chamber, gasket 101 mm
// bore × 1.0 mm, piston 0.5 mm below the deck, 5 cc dish.
const engine = {
  bore: "100",
  stroke: "80",
  chamberCc: "50",
  gasketBore: "101",
  gasketThickness: "1",
  deckClearance: "0.5",
  pistonCc: "5",
};

describe("compressionRatio (Heywood 1988, ch. 2: r = (V_d + V_c) / V_c)", () => {
  it("works the invented engine by hand", () => {
    // V_d = π/4 × 100² × 80 = 628 318.53 mm³ = 628.3185 cc
    // gasket = π/4 × 101² × 1 = 8 011.85 mm³ = 8.0118 cc; deck = π/4 × 100² × 0.5 = 3.9270 cc
    // V_c = 50 + 8.0118 + 3.9270 + 5 = 66.9388 cc; r = (628.3185 + 66.9388) / 66.9388 = 10.3865
    const result = compressionRatio(engine);
    expect(Number(result.sweptCc)).toBeCloseTo(628.3185, 4);
    expect(Number(result.gasketCc)).toBeCloseTo(8.0118, 4);
    expect(Number(result.deckCc)).toBeCloseTo(3.927, 4);
    expect(Number(result.clearanceCc)).toBeCloseTo(66.9388, 4);
    expect(Number(result.ratio)).toBeCloseTo(10.3865, 4);
  });

  it("agrees with mathjs BigNumber arithmetic to 20 places", () => {
    const swept = math.evaluate("pi / 4 * 100^2 * 80 / 1000");
    const clearance = math.evaluate(
      "50 + pi / 4 * 101^2 * 1 / 1000 + pi / 4 * 100^2 * 0.5 / 1000 + 5",
    );
    const result = compressionRatio(engine);
    close(result.sweptCc, swept.toString());
    close(result.clearanceCc, clearance.toString());
    close(result.ratio, math.divide(math.add(swept, clearance), clearance).toString());
  });

  it("agrees with the volume at BDC over the volume at TDC from the piston position (second way)", () => {
    // Heywood eq. 2.4: V = V_c + (π B² / 4)(l + a − s); r = V(180°) / V(0°)
    const { clearanceCc, ratio } = compressionRatio(engine);
    const volumeAt = (crankAngle: string) => {
      const { depthFromTdc } = pistonPosition({ stroke: "80", rodLength: "150", crankAngle });
      return math.evaluate(`${clearanceCc} + pi / 4 * 100^2 * ${depthFromTdc} / 1000`);
    };
    close(ratio, math.divide(volumeAt("180"), volumeAt("0")).toString());
  });

  it("takes a dome as a negative volume and a piston above the deck as a negative clearance", () => {
    // dome 6 cc, piston 0.2 mm out of the hole: deck = −π/4 × 100² × 0.2 = −1.5708 cc
    // V_c = 50 + 8.0118 − 1.5708 − 6 = 50.4410; r = (628.3185 + 50.4410) / 50.4410 = 13.4565
    const result = compressionRatio({ ...engine, deckClearance: "-0.2", pistonCc: "-6" });
    expect(Number(result.deckCc)).toBeCloseTo(-1.5708, 4);
    expect(Number(result.clearanceCc)).toBeCloseTo(50.441, 3);
    expect(Number(result.ratio)).toBeCloseTo(13.4565, 3);
    // a dome raises the ratio over the dished piston's
    expect(Number(result.ratio)).toBeGreaterThan(Number(compressionRatio(engine).ratio));
  });

  it("takes inches for lengths and still gives cc (mathjs unit conversion)", () => {
    // 4.000 in bore, 3.480 in stroke, 64 cc chamber, 4.100 in × 0.041 in gasket, 0.025 in deck,
    // 5 cc reliefs (a familiar small-block stack, from memory)
    const result = compressionRatio({
      bore: "4.000",
      stroke: "3.480",
      chamberCc: "64",
      gasketBore: "4.100",
      gasketThickness: "0.041",
      deckClearance: "0.025",
      pistonCc: "5",
      lengthUnit: "in",
    });
    const swept = math.evaluate("pi / 4 * (4 inch)^2 * 3.48 inch").toNumber("cm^3");
    const gasket = math.evaluate("pi / 4 * (4.1 inch)^2 * 0.041 inch").toNumber("cm^3");
    const deck = math.evaluate("pi / 4 * (4 inch)^2 * 0.025 inch").toNumber("cm^3");
    const clearance = 64 + gasket + deck + 5;
    expect(Number(result.sweptCc)).toBeCloseTo(swept, 9); // 716.6 cc
    expect(Number(result.clearanceCc)).toBeCloseTo(clearance, 9); // 83.02 cc
    expect(Number(result.ratio)).toBeCloseTo((swept + clearance) / clearance, 9); // 9.63
    expect(Number(result.ratio)).toBeCloseTo(9.63, 2);
  });

  describe("refusals name the field", () => {
    const cases: [string, Record<string, string>, string, string][] = [
      ["bore missing", { ...engine, bore: "" }, "bore", "required"],
      ["stroke zero", { ...engine, stroke: "0" }, "stroke", "not-positive"],
      ["chamber zero", { ...engine, chamberCc: "0" }, "chamberCc", "not-positive"],
      [
        "gasket smaller than the bore",
        { ...engine, gasketBore: "99.5" },
        "gasketBore",
        "out-of-range",
      ],
      [
        "gasket thickness negative",
        { ...engine, gasketThickness: "-1" },
        "gasketThickness",
        "negative",
      ],
      [
        "deck clearance in words",
        { ...engine, deckClearance: "below" },
        "deckClearance",
        "not-a-decimal",
      ],
      [
        "a dome bigger than the chamber",
        { ...engine, pistonCc: "-70" },
        "pistonCc",
        "out-of-range",
      ],
      ["an unknown length unit", { ...engine, lengthUnit: "cm" }, "lengthUnit", "unknown-unit"],
    ];
    it.each(cases)("%s", (_label, input, field, code) => {
      expect(() => compressionRatio(input as never)).toThrow(
        expect.objectContaining({ field, code }),
      );
    });
  });
});

describe("deckClearance", () => {
  // Block deck 9.025 in, stroke 3.480, rod 5.700, compression height 1.560 (familiar small-block
  // figures, from memory): 1.740 + 5.700 + 1.560 = 9.000; 9.025 − 9.000 = 0.025 in below the deck.
  const stack = {
    blockDeckHeight: "9.025",
    stroke: "3.480",
    rodLength: "5.700",
    compressionHeight: "1.560",
  };

  it("gives deck height − (stroke/2 + rod + compression height) (worked by hand)", () => {
    expect(deckClearance(stack)).toEqual({ clearance: "0.025", pistonTopAtTdc: "9" });
    // with a 0.041 in gasket the quench is 0.025 + 0.041 = 0.066 in
    expect(deckClearance({ ...stack, gasketThickness: "0.041" }).quench).toBe("0.066");
  });

  it("goes negative for a piston out of the hole", () => {
    // 1.740 + 5.700 + 1.590 = 9.030; 9.025 − 9.030 = −0.005
    expect(deckClearance({ ...stack, compressionHeight: "1.590" }).clearance).toBe("-0.005");
  });

  it("agrees with the piston position at TDC (second derivation)", () => {
    // at θ = 0 the pin stands a + l above the crank centre (Heywood eq. 2.5)
    const { pinHeight } = pistonPosition({ stroke: "3.480", rodLength: "5.700", crankAngle: "0" });
    expect(Number(pinHeight) + 1.56).toBeCloseTo(Number(deckClearance(stack).pistonTopAtTdc), 12);
  });

  it("refuses a rod no longer than the crank throw and a missing deck height", () => {
    expect(() => deckClearance({ ...stack, rodLength: "1.740" })).toThrow(
      expect.objectContaining({ field: "rodLength", code: "out-of-range" }),
    );
    expect(() => deckClearance({ ...stack, blockDeckHeight: "" })).toThrow(
      expect.objectContaining({ field: "blockDeckHeight", code: "required" }),
    );
    expect(() => deckClearance({ ...stack, compressionHeight: "0" })).toThrow(
      expect.objectContaining({ field: "compressionHeight", code: "not-positive" }),
    );
    expect(() => deckClearance({ ...stack, gasketThickness: "-0.04" })).toThrow(
      expect.objectContaining({ field: "gasketThickness", code: "negative" }),
    );
  });
});

describe("pistonPosition (Heywood 1988, eq. 2.5: s = a cos θ + √(l² − a² sin² θ))", () => {
  it("works 90° by hand: past half stroke because the rod leans", () => {
    // a = 40, l = 150: s = 0 + √(22500 − 1600) = √20900 = 144.5683; depth = 190 − 144.5683 = 45.4317
    const result = pistonPosition({ stroke: "80", rodLength: "150", crankAngle: "90" });
    expect(Number(result.pinHeight)).toBeCloseTo(144.5683, 4);
    expect(Number(result.depthFromTdc)).toBeCloseTo(45.4317, 4);
    expect(Number(result.depthFromTdc)).toBeGreaterThan(40);
  });

  it("gives zero at TDC and the stroke at BDC", () => {
    expect(pistonPosition({ stroke: "80", rodLength: "150", crankAngle: "0" }).depthFromTdc).toBe(
      "0",
    );
    close(pistonPosition({ stroke: "80", rodLength: "150", crankAngle: "180" }).depthFromTdc, "80");
    close(pistonPosition({ stroke: "80", rodLength: "150", crankAngle: "540" }).depthFromTdc, "80");
  });

  it.each(["17", "63.5", "137", "-42", "251", "400"])(
    "keeps the rod length constant at %s° (second derivation from the geometry)",
    (angle) => {
      // crank pin at (a sin θ, a cos θ), piston pin at (0, s): the distance between them is l
      const { pinHeight } = pistonPosition({ stroke: "80", rodLength: "150", crankAngle: angle });
      const rod = math.evaluate(
        `sqrt((40 * sin(${angle} deg))^2 + (${pinHeight} - 40 * cos(${angle} deg))^2)`,
      );
      expect(Number(rod)).toBeCloseTo(150, 10);
    },
  );

  it("refuses a crank angle past 720° and a rod no longer than the throw", () => {
    expect(() => pistonPosition({ stroke: "80", rodLength: "150", crankAngle: "721" })).toThrow(
      expect.objectContaining({ field: "crankAngle", code: "out-of-range" }),
    );
    expect(() => pistonPosition({ stroke: "80", rodLength: "40", crankAngle: "90" })).toThrow(
      expect.objectContaining({ field: "rodLength", code: "out-of-range" }),
    );
    expect(() => pistonPosition({ stroke: "80", rodLength: "150", crankAngle: "" })).toThrow(
      expect.objectContaining({ field: "crankAngle", code: "required" }),
    );
  });
});

describe("dynamicCompressionRatio (common practice, from Heywood's crank–slider geometry)", () => {
  const clearanceCc = compressionRatio(engine).clearanceCc;

  it("works a 60° ABDC intake closing by hand", () => {
    // θ = 240°: s = 40 cos 240° + √(150² − 40² sin² 240°) = −20 + √(22500 − 1200) = 125.9452
    // depth = 190 − 125.9452 = 64.0548 mm; trapped = 66.9388 + π/4 × 100² × 64.0548 / 1000
    // = 66.9388 + 503.0853 = 570.0241 cc; ratio = 570.0241 / 66.9388 = 8.5156
    const result = dynamicCompressionRatio({
      bore: "100",
      stroke: "80",
      rodLength: "150",
      clearanceCc,
      intakeCloseAbdc: "60",
    });
    expect(Number(result.effectiveStroke)).toBeCloseTo(64.0548, 4);
    expect(Number(result.trappedCc)).toBeCloseTo(570.0241, 3);
    expect(Number(result.ratio)).toBeCloseTo(8.5156, 4);
  });

  it("equals the static ratio when the intake closes at BDC (second derivation)", () => {
    const result = dynamicCompressionRatio({
      bore: "100",
      stroke: "80",
      rodLength: "150",
      clearanceCc,
      intakeCloseAbdc: "0",
    });
    close(result.ratio, compressionRatio(engine).ratio);
  });

  it("gives the effective stroke in inches when lengths are inches", () => {
    // the 60° case above in inches: 64.0548 mm / 25.4 = 2.52184 in, same ratio
    const result = dynamicCompressionRatio({
      bore: String(100 / 25.4),
      stroke: String(80 / 25.4),
      rodLength: String(150 / 25.4),
      clearanceCc,
      intakeCloseAbdc: "60",
      lengthUnit: "in",
    });
    expect(Number(result.effectiveStroke)).toBeCloseTo(64.0548 / 25.4, 4);
    expect(Number(result.ratio)).toBeCloseTo(8.5156, 4);
  });

  it("refuses an intake closing of 180° and a zero clearance volume", () => {
    const base = { bore: "100", stroke: "80", rodLength: "150", clearanceCc };
    expect(() => dynamicCompressionRatio({ ...base, intakeCloseAbdc: "180" })).toThrow(
      expect.objectContaining({ field: "intakeCloseAbdc", code: "out-of-range" }),
    );
    expect(() =>
      dynamicCompressionRatio({ ...base, clearanceCc: "0", intakeCloseAbdc: "60" }),
    ).toThrow(expect.objectContaining({ field: "clearanceCc", code: "not-positive" }));
    expect(() =>
      dynamicCompressionRatio({ ...base, rodLength: "30", intakeCloseAbdc: "60" }),
    ).toThrow(expect.objectContaining({ field: "rodLength", code: "out-of-range" }));
  });
});
