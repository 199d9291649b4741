import { describe, expect, it } from "vitest";
import {
  BalanceInputError,
  bobweightForCrankpin,
  computeBalance,
  type BalanceInput,
  type CylinderInput,
} from "@/lib/balance";

/**
 * Worked by hand (invented weights, grams). Cross-plane V8, 2 rods per pin (1-2, 3-4, 5-6, 7-8),
 * tolerance 0.5 g (common practice), 50 % balance factor (common practice for 90° V8s,
 * common practice), oil allowance 4 g per crankpin → 2 g shown on each rod.
 *
 *            piston  pin    ret  rings  small  big    bearing
 *   cyl 1    512.4*  140.2  2.0  38.5   180.6  520.5  30.0     * readings 512.3 / 512.5 / 512.4
 *   cyl 2    511.9   140.0  2.0  38.5   180.2  520.0  30.0       rod total 700.2 (= 520.0 + 180.2)
 *   cyl 3    513.0   140.9  2.0  38.5   181.0  521.1  30.0
 *   cyl 4    512.2   140.1  2.1  38.5   180.4  520.3  30.0       rod total 701.0 (ends 700.7: 0.3 off)
 *   cyl 5    511.6   140.3  2.0  38.5   180.9  520.8  30.0
 *   cyl 6    512.1   140.0  2.0  38.7   180.3  520.4  30.0
 *   cyl 7    514.3   140.4  2.0  38.5   180.2  520.1  30.2
 *   cyl 8    511.8   140.6  2.0  38.5   180.5  521.4  30.0
 *
 * Targets (lightest): piston 511.6, pin 140.0, retainers 2.0, rings 38.5, small 180.2, big 520.0.
 * Band = target + 0.5. Machined to target:
 *   pistons  1: 512.4 → 0.8   3: 513.0 → 1.4   4: 512.2 → 0.6   7: 514.3 → 2.7
 *            (6: 512.1 is exactly on the band edge → left alone)
 *   pins     3: 140.9 and 8: 140.6 are over the 140.5 band but wrist pins are matched by
 *            selection, not machined (common practice): both "reselect", weights kept
 *   small    3: 181.0 → 0.8   5: 180.9 → 0.7
 *   big      3: 521.1 → 1.1   5: 520.8 → 0.8   8: 521.4 → 1.4   (1: 520.5 on the edge → left)
 *
 * Reciprocating (final piston + pin + ret + rings + small end):
 *   1: 511.6 + 140.2 + 2.0 + 38.5 + 180.6 = 872.9      5: 511.6 + 140.3 + 2.0 + 38.5 + 180.2 = 872.6
 *   2: 511.9 + 140.0 + 2.0 + 38.5 + 180.2 = 872.6      6: 512.1 + 140.0 + 2.0 + 38.7 + 180.3 = 873.1
 *   3: 511.6 + 140.9 + 2.0 + 38.5 + 180.2 = 873.2      7: 511.6 + 140.4 + 2.0 + 38.5 + 180.2 = 872.7
 *   4: 511.6 + 140.1 + 2.1 + 38.5 + 180.4 = 872.7      8: 511.8 + 140.6 + 2.0 + 38.5 + 180.5 = 873.4
 * Rotating per rod (final big end + bearing + 4/2 oil):
 *   1: 552.5  2: 552.0  3: 552.0  4: 552.3  5: 552.0  6: 552.4  7: 552.3 (bearing 30.2)  8: 552.0
 * Bobweights = Σ(big + bearing) + 4 + 0.5 × Σ reciprocating:
 *   pin 1: 1100.5 + 4 + 0.5 × 1745.5 = 1977.25
 *   pin 2: 1100.3 + 4 + 0.5 × 1745.9 = 1977.25
 *   pin 3: 1100.4 + 4 + 0.5 × 1745.7 = 1977.25
 *   pin 4: 1100.3 + 4 + 0.5 × 1746.1 = 1977.35
 */
const v8: BalanceInput = {
  layout: { preset: "v8-cross-plane" },
  oilAllowance: "4",
  cylinders: [
    {
      number: 1,
      piston: ["512.3", "512.5", "512.4"],
      wristPin: "140.2",
      retainers: "2.0",
      rings: "38.5",
      smallEnd: "180.6",
      bigEnd: "520.5",
      bearing: "30.0",
    },
    {
      number: 2,
      piston: "511.9",
      wristPin: "140.0",
      retainers: "2.0",
      rings: "38.5",
      smallEnd: "180.2",
      bigEnd: "520.0",
      bearing: "30.0",
      rodTotal: "700.2",
    },
    {
      number: 3,
      piston: "513.0",
      wristPin: "140.9",
      retainers: "2.0",
      rings: "38.5",
      smallEnd: "181.0",
      bigEnd: "521.1",
      bearing: "30.0",
    },
    {
      number: 4,
      piston: "512.2",
      wristPin: "140.1",
      retainers: "2.1",
      rings: "38.5",
      smallEnd: "180.4",
      bigEnd: "520.3",
      bearing: "30.0",
      rodTotal: "701.0",
    },
    {
      number: 5,
      piston: "511.6",
      wristPin: "140.3",
      retainers: "2.0",
      rings: "38.5",
      smallEnd: "180.9",
      bigEnd: "520.8",
      bearing: "30.0",
    },
    {
      number: 6,
      piston: "512.1",
      wristPin: "140.0",
      retainers: "2.0",
      rings: "38.7",
      smallEnd: "180.3",
      bigEnd: "520.4",
      bearing: "30.0",
    },
    {
      number: 7,
      piston: "514.3",
      wristPin: "140.4",
      retainers: "2.0",
      rings: "38.5",
      smallEnd: "180.2",
      bigEnd: "520.1",
      bearing: "30.2",
    },
    {
      number: 8,
      piston: "511.8",
      wristPin: "140.6",
      retainers: "2.0",
      rings: "38.5",
      smallEnd: "180.5",
      bigEnd: "521.4",
      bearing: "30.0",
    },
  ],
};

const singleCylinder = (overrides: Partial<CylinderInput> = {}): CylinderInput => ({
  number: 1,
  piston: "310.4",
  wristPin: "72.6",
  retainers: "1.2",
  rings: "18.3",
  smallEnd: "95.8",
  bigEnd: "240.5",
  bearing: "22.0",
  ...overrides,
});

const removal = (result: ReturnType<typeof computeBalance>, kind: string) =>
  Object.fromEntries(
    result.parts
      .filter((p) => p.kind === kind && p.remove !== "0")
      .map((p) => [p.cylinder, p.remove]),
  );

describe("computeBalance: cross-plane V8 worked by hand", () => {
  const result = computeBalance(v8);

  it("takes the lightest part of each kind as the target", () => {
    expect(result.targets).toEqual({
      piston: "511.6",
      wristPin: "140",
      retainers: "2",
      rings: "38.5",
      smallEnd: "180.2",
      bigEnd: "520",
    });
  });

  it("machines only the parts above target + 0.5 g, down to the target (common practice)", () => {
    expect(removal(result, "piston")).toEqual({ 1: "0.8", 3: "1.4", 4: "0.6", 7: "2.7" });
    expect(removal(result, "wristPin")).toEqual({});
    expect(
      result.parts
        .filter((p) => p.status === "reselect")
        .map((p) => [p.cylinder, p.kind, p.excess]),
    ).toEqual([
      [3, "wristPin", "0.9"], // 140.9 − 140.0
      [8, "wristPin", "0.6"], // 140.6 − 140.0
    ]);
    expect(removal(result, "retainers")).toEqual({});
    expect(removal(result, "rings")).toEqual({});
    expect(removal(result, "smallEnd")).toEqual({ 3: "0.8", 5: "0.7" });
    expect(removal(result, "bigEnd")).toEqual({ 3: "1.1", 5: "0.8", 8: "1.4" });
    const piston6 = result.parts.find((p) => p.kind === "piston" && p.cylinder === 6);
    expect(piston6).toEqual({
      cylinder: 6,
      kind: "piston",
      measured: "512.1",
      remove: "0",
      final: "512.1",
      status: "ok",
    });
  });

  it("lists pistons first, then the other kinds, each by cylinder", () => {
    expect(result.parts.slice(0, 8).map((p) => [p.kind, p.cylinder])).toEqual(
      [1, 2, 3, 4, 5, 6, 7, 8].map((n) => ["piston", n]),
    );
    expect(result.parts).toHaveLength(7 * 8);
  });

  it("averages repeated readings and reports their spread", () => {
    const piston1 = result.parts[0];
    expect(piston1).toMatchObject({
      measured: "512.4",
      readings: ["512.3", "512.5", "512.4"],
      spread: "0.2",
      remove: "0.8",
    });
  });

  it("gives every cylinder's masses from the final weights", () => {
    expect(result.cylinders).toEqual([
      { number: 1, crankpin: 1, reciprocating: "872.9", rotating: "552.5" },
      { number: 2, crankpin: 1, reciprocating: "872.6", rotating: "552" },
      { number: 3, crankpin: 2, reciprocating: "873.2", rotating: "552" },
      { number: 4, crankpin: 2, reciprocating: "872.7", rotating: "552.3" },
      { number: 5, crankpin: 3, reciprocating: "872.6", rotating: "552" },
      { number: 6, crankpin: 3, reciprocating: "873.1", rotating: "552.4" },
      { number: 7, crankpin: 4, reciprocating: "872.7", rotating: "552.3" },
      { number: 8, crankpin: 4, reciprocating: "873.4", rotating: "552" },
    ]);
  });

  it("gives one bobweight per crankpin: 2 × rotating + 1 × reciprocating at 50 % (common practice)", () => {
    expect(result.bobweightNeeded).toBe(true);
    expect(result.balanceFactor).toBe("50");
    expect(result.bobweights).toEqual([
      {
        crankpin: 1,
        cylinders: [1, 2],
        rotating: "1104.5",
        reciprocating: "1745.5",
        mass: "1977.25",
        oil: "4",
      },
      {
        crankpin: 2,
        cylinders: [3, 4],
        rotating: "1104.3",
        reciprocating: "1745.9",
        mass: "1977.25",
        oil: "4",
      },
      {
        crankpin: 3,
        cylinders: [5, 6],
        rotating: "1104.4",
        reciprocating: "1745.7",
        mass: "1977.25",
        oil: "4",
      },
      {
        crankpin: 4,
        cylinders: [7, 8],
        rotating: "1104.3",
        reciprocating: "1746.1",
        mass: "1977.35",
        oil: "4",
      },
    ]);
  });

  it("warns about the spread readings and the rod whose ends do not add up to its total", () => {
    expect(result.warnings.map((w) => [w.code, w.cylinder, w.kind])).toEqual([
      ["reading-spread", 1, "piston"],
      ["part-reselect", 3, "wristPin"],
      ["part-reselect", 8, "wristPin"],
      ["rod-total-mismatch", 4, "rodTotal"],
    ]);
  });
});

describe("computeBalance: single cylinder worked by hand", () => {
  // Invented weights (g): piston 310.4 with a set target of 310.0 and tolerance 0.2 →
  // 310.4 > 310.2, so 0.4 comes off and it ends at 310.0. Pin 72.6, retainers 1.2, rings 18.3,
  // small end 95.8: reciprocating = 310.0 + 72.6 + 1.2 + 18.3 + 95.8 = 497.9.
  // Rotating = big end 240.5 + bearing 22.0 + oil 3 = 265.5 (one rod takes all the pin's oil).
  // Bobweight at 60 % (within the 50–60 % trade range for singles): 265.5 + 0.6 × 497.9 = 564.24.
  const result = computeBalance({
    layout: { preset: "single" },
    tolerance: "0.2",
    balanceFactor: "60",
    oilAllowance: "3",
    targets: { piston: "310.0" },
    cylinders: [singleCylinder()],
  });

  it("machines the piston to the set target", () => {
    expect(result.parts[0]).toEqual({
      cylinder: 1,
      kind: "piston",
      measured: "310.4",
      remove: "0.4",
      final: "310",
      status: "remove",
    });
    expect(result.targets.piston).toBe("310");
  });

  it("works out the masses and the bobweight", () => {
    expect(result.cylinders).toEqual([
      { number: 1, crankpin: 1, reciprocating: "497.9", rotating: "265.5" },
    ]);
    expect(result.bobweights).toEqual([
      {
        crankpin: 1,
        cylinders: [1],
        rotating: "265.5",
        reciprocating: "497.9",
        mass: "564.24",
        oil: "3",
      },
    ]);
    expect(result.warnings).toEqual([]);
  });

  it("uses the preset's 50 % when no factor is given", () => {
    const plain = computeBalance({ layout: { preset: "single" }, cylinders: [singleCylinder()] });
    // 262.5 + 0.5 × 498.3 = 511.65
    expect(plain.balanceFactor).toBe("50");
    expect(plain.bobweights[0]?.mass).toBe("511.65");
  });
});

describe("matching", () => {
  it("flags a part lighter than a set target instead of machining it", () => {
    const result = computeBalance({
      layout: { preset: "single" },
      targets: { wristPin: "73.0" },
      cylinders: [singleCylinder()],
    });
    const pin = result.parts.find((p) => p.kind === "wristPin");
    expect(pin).toEqual({
      cylinder: 1,
      kind: "wristPin",
      measured: "72.6",
      remove: "0",
      final: "72.6",
      status: "light",
      short: "0.4", // 73.0 − 72.6
    });
    expect(result.warnings.map((w) => w.code)).toEqual(["target-above-set", "part-light"]);
    // 73.0 − 72.6 = 0.4, a difference: one decimal more than the 0.1 g scale (display rule).
    expect(result.warnings[1]?.message).toContain("0.40 g under the target 73.00 g");
  });

  it("leaves a part within the band alone", () => {
    const result = computeBalance({
      layout: { preset: "v-twin" },
      cylinders: [singleCylinder(), singleCylinder({ number: 2, piston: "310.9" })],
    });
    expect(result.parts.filter((p) => p.kind === "piston").map((p) => p.status)).toEqual([
      "ok",
      "ok",
    ]);
  });

  it("matches big ends and small ends separately (rods end to end)", () => {
    const result = computeBalance({
      layout: { preset: "v-twin" },
      cylinders: [
        singleCylinder({ smallEnd: "96.8", bigEnd: "240.0" }),
        singleCylinder({ number: 2, smallEnd: "95.8", bigEnd: "241.0" }),
      ],
    });
    expect(result.targets).toMatchObject({ smallEnd: "95.8", bigEnd: "240" });
    expect(removal(result, "smallEnd")).toEqual({ 1: "1" });
    expect(removal(result, "bigEnd")).toEqual({ 2: "1" });
  });

  it("weighs bearing shells into the rotating mass without machining them", () => {
    const result = computeBalance({
      layout: { preset: "v-twin" },
      cylinders: [
        singleCylinder({ bearing: "22.0" }),
        singleCylinder({ number: 2, bearing: "23.0" }),
      ],
    });
    const bearings = result.parts.filter((p) => p.kind === "bearing");
    expect(bearings.map((p) => [p.remove, p.final, p.status])).toEqual([
      ["0", "22", "ok"],
      ["0", "23", "ok"],
    ]);
    expect(result.targets).not.toHaveProperty("bearing");
    expect(result.cylinders.map((c) => c.rotating)).toEqual(["262.5", "263.5"]);
  });

  it("works in ounces with the 0.5 g tolerance converted", () => {
    const result = computeBalance({
      unit: "oz",
      layout: { preset: "v-twin" },
      cylinders: [
        singleCylinder({ piston: "10.95" }),
        singleCylinder({ number: 2, piston: "10.97" }),
      ],
    });
    expect(result.unit).toBe("oz");
    expect(result.tolerance).toBe("0.01764");
    expect(result.resolution).toBe("0.003527");
    expect(removal(result, "piston")).toEqual({ 2: "0.02" });
  });
});

describe("oil allowance", () => {
  const twin = (oilAllowance: string) =>
    computeBalance({
      layout: { preset: "v-twin" },
      oilAllowance,
      cylinders: [singleCylinder(), singleCylinder({ number: 2 })],
    });

  it("is added once per crankpin to the bobweight", () => {
    // Two rods on one pin, 60 % preset: 2 × 262.5 + 4 + 0.6 × (2 × 498.3) = 1126.96
    expect(twin("4").bobweights[0]).toMatchObject({ rotating: "529", mass: "1126.96" });
    expect(twin("0").bobweights[0]?.mass).toBe("1122.96");
  });

  it("is shared among the rods on the pin in each cylinder's rotating mass", () => {
    expect(twin("4").cylinders.map((c) => c.rotating)).toEqual(["264.5", "264.5"]);
  });
});

describe("bobweight", () => {
  const forFactor = (balanceFactor: string) =>
    computeBalance({ layout: { preset: "single" }, balanceFactor, cylinders: [singleCylinder()] })
      .bobweights[0]?.mass;

  it("adds half the reciprocating mass at a 50 % balance factor", () => {
    // rotating 262.5 + 0.5 × reciprocating 498.3
    expect(forFactor("50")).toBe("511.65");
  });

  it("is Σ rotating + oil allowance + factor × Σ reciprocating for one crankpin (common practice)", () => {
    // 90° V8 pin at 50 %: 2 × 550 + 4 + 0.5 × 2 × 870 = 2 × rotating + 1 × reciprocating + oil
    expect(
      bobweightForCrankpin({
        rotating: ["550", "550"],
        reciprocating: ["870", "870"],
        balanceFactor: "50",
        oilAllowance: "4",
      }),
    ).toBe("1974");
    expect(() =>
      bobweightForCrankpin({ rotating: ["550"], reciprocating: ["870"], balanceFactor: "100.1" }),
    ).toThrow(expect.objectContaining({ field: "balanceFactor", code: "out-of-range" }));
  });

  it("is the rotating mass alone at 0 % and rotating + reciprocating at 100 %", () => {
    expect(forFactor("0")).toBe("262.5");
    expect(forFactor("100")).toBe("760.8");
  });

  it.each(["inline-4", "inline-6", "v8-flat-plane", "flat-4", "flat-6", "v12"])(
    "is not needed for the %s layout (common practice)",
    (preset) => {
      const n = {
        "inline-4": 4,
        "inline-6": 6,
        "v8-flat-plane": 8,
        "flat-4": 4,
        "flat-6": 6,
        v12: 12,
      }[preset] as number;
      const result = computeBalance({
        layout: { preset },
        cylinders: Array.from({ length: n }, (_, i) => singleCylinder({ number: i + 1 })),
      });
      expect(result.bobweightNeeded).toBe(false);
      expect(result.bobweights).toEqual([]);
      expect(result.balanceFactor).toBeNull();
      expect(result.cylinders).toHaveLength(n);
    },
  );

  it("warns when a factor is given for a layout that needs no bobweight", () => {
    const result = computeBalance({
      layout: { preset: "inline-4" },
      balanceFactor: "50",
      cylinders: [1, 2, 3, 4].map((number) => singleCylinder({ number })),
    });
    expect(result.warnings.map((w) => w.code)).toEqual(["balance-factor-unused"]);
  });

  it("uses 50 % with a warning for a custom layout given no factor", () => {
    const result = computeBalance({
      layout: { rodsPerPin: 2, bobweight: true },
      cylinders: [1, 2, 3, 4].map((number) => singleCylinder({ number })),
    });
    expect(result.layout).toBe("custom");
    expect(result.balanceFactor).toBe("50");
    expect(result.bobweights.map((b) => b.cylinders)).toEqual([
      [1, 2],
      [3, 4],
    ]);
    expect(result.warnings.map((w) => w.code)).toEqual(["assumed-balance-factor"]);
  });

  it("follows explicit crankpins for other numbering schemes", () => {
    const result = computeBalance({
      layout: { preset: "v8-cross-plane" },
      cylinders: [1, 2, 3, 4, 5, 6, 7, 8].map((number) =>
        singleCylinder({ number, crankpin: ((number - 1) % 4) + 1 }),
      ),
    });
    expect(result.bobweights.map((b) => b.cylinders)).toEqual([
      [1, 5],
      [2, 6],
      [3, 7],
      [4, 8],
    ]);
  });
});

describe("edge cases", () => {
  const base: BalanceInput = { layout: { preset: "single" }, cylinders: [singleCylinder()] };
  const fails = (input: unknown, field: string, code: string) => {
    let caught: unknown;
    try {
      computeBalance(input as BalanceInput);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(BalanceInputError);
    expect(caught).toMatchObject({ field, code });
    expect((caught as Error).message).toContain(field);
  };
  const withCylinder = (overrides: Record<string, unknown>) => ({
    ...base,
    cylinders: [{ ...singleCylinder(), ...overrides }],
  });

  it("refuses missing, negative, zero, non-numeric and non-finite weights, naming the field", () => {
    fails(withCylinder({ piston: undefined }), "cylinders.0.piston", "required");
    fails(withCylinder({ piston: "-310.4" }), "cylinders.0.piston", "negative");
    fails(withCylinder({ piston: "0" }), "cylinders.0.piston", "not-positive");
    fails(withCylinder({ piston: "abc" }), "cylinders.0.piston", "not-a-decimal");
    fails(withCylinder({ piston: "1e3" }), "cylinders.0.piston", "not-a-decimal");
    fails(withCylinder({ piston: " 310" }), "cylinders.0.piston", "not-a-decimal");
    fails(withCylinder({ piston: "+310" }), "cylinders.0.piston", "not-a-decimal");
    fails(withCylinder({ piston: "NaN" }), "cylinders.0.piston", "not-finite");
    fails(withCylinder({ piston: "Infinity" }), "cylinders.0.piston", "not-finite");
    fails(withCylinder({ piston: 310.4 }), "cylinders.0.piston", "not-a-string");
    fails(withCylinder({ piston: [] }), "cylinders.0.piston", "empty");
    fails(withCylinder({ piston: ["310.4", "x"] }), "cylinders.0.piston.1", "not-a-decimal");
    fails(withCylinder({ piston: "1." + "1".repeat(45) }), "cylinders.0.piston", "too-precise");
  });

  it("refuses an empty set and cylinders that do not fit the layout", () => {
    fails({ ...base, cylinders: [] }, "cylinders", "empty");
    fails(
      { layout: { preset: "v-twin" }, cylinders: [singleCylinder()] },
      "cylinders",
      "layout-mismatch",
    );
    fails(
      { layout: { preset: "v-twin" }, cylinders: [singleCylinder(), singleCylinder()] },
      "cylinders.1.number",
      "duplicate",
    );
    fails(
      {
        layout: { preset: "v-twin" },
        cylinders: [singleCylinder(), singleCylinder({ number: 3 })],
      },
      "cylinders.1.number",
      "out-of-range",
    );
    fails(withCylinder({ number: 1.5 }), "cylinders.0.number", "not-an-integer");
    fails(withCylinder({ crankpin: 2 }), "cylinders.0.crankpin", "out-of-range");
    fails(
      {
        layout: { preset: "v8-cross-plane" },
        cylinders: [1, 2, 3, 4, 5, 6, 7, 8].map((number) =>
          singleCylinder({ number, crankpin: number === 3 ? 1 : undefined }),
        ),
      },
      "cylinders.2.crankpin",
      "too-many-rods",
    );
    fails({ ...base, layout: { preset: "w16" } }, "layout.preset", "unknown-preset");
    fails(
      { ...base, layout: { rodsPerPin: 0, bobweight: true } },
      "layout.rodsPerPin",
      "out-of-range",
    );
    fails({ ...base, layout: { rodsPerPin: 1 } }, "layout.bobweight", "required");
  });

  it("refuses a kind weighed for some cylinders only", () => {
    fails(
      {
        layout: { preset: "v-twin" },
        cylinders: [singleCylinder(), singleCylinder({ number: 2, rings: undefined })],
      },
      "cylinders.1.rings",
      "incomplete-kind",
    );
  });

  it("refuses a factor outside 0–100 % and bad settings", () => {
    fails({ ...base, balanceFactor: "101" }, "balanceFactor", "out-of-range");
    fails({ ...base, balanceFactor: "-5" }, "balanceFactor", "negative");
    fails({ ...base, tolerance: "-0.5" }, "tolerance", "negative");
    fails({ ...base, resolution: "0" }, "resolution", "not-positive");
    fails({ ...base, oilAllowance: "-1" }, "oilAllowance", "negative");
    fails({ ...base, unit: "lb" }, "unit", "unknown-unit");
  });

  it("refuses targets that make no sense", () => {
    fails({ ...base, targets: { piston: "0" } }, "targets.piston", "not-positive");
    fails({ ...base, targets: { piston: "-1" } }, "targets.piston", "negative");
    fails({ ...base, targets: { bearing: "22" } }, "targets.bearing", "unknown-kind");
    fails(
      { ...base, cylinders: [singleCylinder({ rings: undefined })], targets: { rings: "18" } },
      "targets.rings",
      "kind-not-weighed",
    );
  });

  it("accepts the custom layout named as a preset with its shape", () => {
    const result = computeBalance({
      ...base,
      layout: { preset: "custom", rodsPerPin: 1, bobweight: false } as never,
    });
    expect(result.layout).toBe("custom");
    expect(result.bobweightNeeded).toBe(false);
  });

  it("warns when the tolerance is finer than the scale", () => {
    const result = computeBalance({ ...base, tolerance: "0.05", resolution: "0.1" });
    expect(result.warnings.map((w) => w.code)).toEqual(["tolerance-below-resolution"]);
  });

  it("works without retainers, rings or bearings and never prints exponents", () => {
    const result = computeBalance({
      layout: { preset: "single" },
      resolution: "0.00000001",
      cylinders: [
        {
          number: 1,
          piston: "0.00000012",
          wristPin: "0.00000003",
          smallEnd: "0.00000001",
          bigEnd: "0.00000002",
        },
      ],
    });
    expect(result.cylinders[0]).toEqual({
      number: 1,
      crankpin: 1,
      reciprocating: "0.00000016",
      rotating: "0.00000002",
    });
    expect(JSON.stringify(result)).not.toMatch(/\de[+-]?\d/i);
  });

  it("keeps 30 significant digits for a mean that does not terminate", () => {
    const result = computeBalance(withCylinder({ piston: ["310.4", "310.4", "310.5"] }));
    expect(result.parts[0]?.measured).toBe("310.433333333333333333333333333");
    expect(result.warnings).toEqual([]);
  });
});

/**
 * The same V8 matched by whole reciprocating assemblies (worked by hand; tolerance 0.5 g).
 * Reciprocating = piston + pin + retainers + rings + small end, as weighed:
 *   1: 512.4 + 140.2 + 2.0 + 38.5 + 180.6 = 873.7      5: 511.6 + 140.3 + 2.0 + 38.5 + 180.9 = 873.3
 *   2: 511.9 + 140.0 + 2.0 + 38.5 + 180.2 = 872.6      6: 512.1 + 140.0 + 2.0 + 38.7 + 180.3 = 873.1
 *   3: 513.0 + 140.9 + 2.0 + 38.5 + 181.0 = 875.4      7: 514.3 + 140.4 + 2.0 + 38.5 + 180.2 = 875.4
 *   4: 512.2 + 140.1 + 2.1 + 38.5 + 180.4 = 873.3      8: 511.8 + 140.6 + 2.0 + 38.5 + 180.5 = 873.4
 * Target 872.6 (cyl 2), band up to 873.1. Lightest piston 511.6, lightest small end 180.2.
 * Excess off the piston first (down to 511.6 at most), then the small end (down to 180.2):
 *   1: 1.1 → piston 0.8 (512.4 → 511.6), small end 0.3                → 872.6
 *   3: 2.8 → piston 1.4, small end 0.8 (181.0 → 180.2): only 2.2       → 873.2, 0.6 over: re-select
 *      (its wrist pin is 140.9 − 140.0 = 0.9 over the lightest pin)
 *   4: 0.7 → piston 0.6, small end 0.1                                  → 872.6
 *   5: 0.7 → piston 0 (it is the lightest), small end 0.7               → 872.6
 *   6: 0.5 → on the band edge, left alone
 *   7: 2.8 → piston 2.7 (514.3 → 511.6), small end 0 (180.2 is the lightest) → 872.7, in band
 *   8: 0.8 → piston 0.2, small end 0.3                                  → 872.9, in band
 * Big ends as by part: 3: 1.1, 5: 0.8, 8: 1.4. Rings, pins and retainers: nothing.
 */
describe("computeBalance: matching by cylinder (V8 worked by hand)", () => {
  const result = computeBalance({ ...v8, matching: "by-cylinder" });

  it("brings each assembly to the lightest, piston first, then the small-end pad", () => {
    expect(result.matching).toBe("by-cylinder");
    expect(result.assemblyTarget).toBe("872.6");
    expect(removal(result, "piston")).toEqual({ 1: "0.8", 3: "1.4", 4: "0.6", 7: "2.7", 8: "0.2" });
    expect(removal(result, "smallEnd")).toEqual({
      1: "0.3",
      3: "0.8",
      4: "0.1",
      5: "0.7",
      8: "0.3",
    });
    expect(removal(result, "bigEnd")).toEqual({ 3: "1.1", 5: "0.8", 8: "1.4" });
    for (const kind of ["wristPin", "retainers", "rings"])
      expect(removal(result, kind)).toEqual({});
    // Only the big ends keep a target of their own.
    expect(result.targets).toEqual({ bigEnd: "520" });
  });

  it("gives each cylinder's assembly and flags the one machining cannot bring into the band", () => {
    expect(result.cylinders.map((c) => [c.number, c.assembly, c.reciprocating])).toEqual([
      [1, { measured: "873.7", remove: "1.1", final: "872.6", status: "remove" }, "872.6"],
      [2, { measured: "872.6", remove: "0", final: "872.6", status: "ok" }, "872.6"],
      [
        3,
        { measured: "875.4", remove: "2.2", final: "873.2", status: "reselect", over: "0.6" },
        "873.2",
      ],
      [4, { measured: "873.3", remove: "0.7", final: "872.6", status: "remove" }, "872.6"],
      [5, { measured: "873.3", remove: "0.7", final: "872.6", status: "remove" }, "872.6"],
      [6, { measured: "873.1", remove: "0", final: "873.1", status: "ok" }, "873.1"],
      [7, { measured: "875.4", remove: "2.7", final: "872.7", status: "remove" }, "872.7"],
      [8, { measured: "873.4", remove: "0.5", final: "872.9", status: "remove" }, "872.9"],
    ]);
    const reselect = result.warnings.find((w) => w.code === "assembly-reselect");
    expect(reselect?.cylinder).toBe(3);
    expect(reselect?.message).toContain("0.60 g over the target 872.60 g");
    expect(reselect?.message).toContain("the wrist pin is 0.90 g over the lightest");
  });

  it("takes off more in all than by part here (11.2 g against 10.3 g), and says so honestly", () => {
    // By part: pistons 0.8 + 1.4 + 0.6 + 2.7 = 5.5, small ends 0.8 + 0.7 = 1.5, big ends 3.3.
    // By cylinder: pistons 5.7, small ends 0.3 + 0.8 + 0.1 + 0.7 + 0.3 = 2.2, big ends 3.3.
    const total = (r: ReturnType<typeof computeBalance>) =>
      r.parts.reduce((sum, p) => sum + Math.round(Number(p.remove) * 10), 0) / 10;
    expect(total(computeBalance(v8))).toBe(10.3);
    expect(total(result)).toBe(11.2);
  });

  it("ignores per-kind targets other than the big end, with a warning, and uses a set assembly target", () => {
    const withTargets = computeBalance({
      ...v8,
      matching: "by-cylinder",
      targets: { piston: "511.0", bigEnd: "520.0" },
      assemblyTarget: "873.0",
    });
    expect(withTargets.warnings.filter((w) => w.code === "target-unused")).toHaveLength(1);
    // 872.6 and 873.1 … : cylinder 2 (872.6) is 0.4 under 873.0 → light.
    expect(withTargets.cylinders[1]?.assembly?.status).toBe("light");
    expect(withTargets.warnings.find((w) => w.code === "assembly-light")?.message).toContain(
      "0.40 g under the target 873.00 g",
    );
  });
});

describe("removal where the trade removes", () => {
  it("never machines a ring set: one over the band reads re-select or replace", () => {
    // Rings 46.1, 46.3, 47.7, 46.2 (a four, invented): target 46.1, band to 46.6; 47.7 is 1.6 over.
    const four = [1, 2, 3, 4].map((n, i): CylinderInput => ({
      number: n,
      piston: "400.0",
      wristPin: "100.0",
      rings: ["46.1", "46.3", "47.7", "46.2"][i]!,
      smallEnd: "150.0",
      bigEnd: "400.0",
    }));
    const result = computeBalance({ layout: { preset: "inline-4" }, cylinders: four });
    const rings3 = result.parts.find((p) => p.kind === "rings" && p.cylinder === 3);
    expect(rings3).toMatchObject({ remove: "0", final: "47.7", status: "reselect", excess: "1.6" });
    const warning = result.warnings.find((w) => w.code === "part-reselect");
    expect(warning?.message).toContain("1.60 g over the target 46.10 g");
    expect(warning?.message).toContain("re-select a lighter set or replace it");
    expect(result.parts.every((p) => p.kind !== "rings" || p.remove === "0")).toBe(true);
  });
});

describe("warning messages follow the display rule", () => {
  it("prints computed masses with one decimal more than the 0.1 g scale, never raw decimals", () => {
    // Pistons weighed three times: 400.0/400.1/400.4 (mean 400.1666…, spread 0.4) and
    // 400.0/400.0/400.1 (mean 400.0333…). Target 400.2: the first is 0.0333… under → "0.03 g".
    // Rod 1: big end 300.0 + small end 100.05 = 400.05 against a whole rod of 400.3: 0.25 apart.
    const result = computeBalance({
      layout: { rodsPerPin: 1, bobweight: false },
      targets: { piston: "400.2" },
      cylinders: [
        {
          number: 1,
          piston: ["400.0", "400.1", "400.4"],
          wristPin: "100.0",
          smallEnd: "100.05",
          bigEnd: "300.0",
          rodTotal: "400.3",
        },
        {
          number: 2,
          piston: ["400.0", "400.0", "400.1"],
          wristPin: "100.0",
          smallEnd: "100.0",
          bigEnd: "300.0",
        },
      ],
    });
    const messages = result.warnings.map((w) => w.message);
    expect(messages.join("\n")).not.toMatch(/\d\.\d{3,}/);
    expect(messages.find((m) => m.startsWith("Cylinder 1 piston is"))).toContain(
      "0.03 g under the target 400.20 g", // 400.2 − 400.1666… = 0.0333… → 0.03
    );
    expect(messages.find((m) => m.includes("readings spread"))).toContain("spread 0.40 g");
    expect(messages.find((m) => m.includes("whole rod"))).toContain(
      "big end + small end is 400.05 g but the whole rod weighed 400.3 g",
    );
  });
});
