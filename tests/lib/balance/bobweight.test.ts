import { all, create, type FactoryFunctionMap } from "mathjs";
import { describe, expect, it } from "vitest";
import {
  bobweightForCrankpin,
  bobweightToBuild,
  computeBalance,
  type BalanceInput,
  type CylinderInput,
} from "@/lib/balance";

// mathjs with exact decimals, a reference library for the means and spreads.
const math = create(all as FactoryFunctionMap, { number: "BigNumber", precision: 64 });
const exact = (values: string[]) => {
  const xs = values.map((v) => math.bignumber(v));
  return {
    mean: math.format(math.mean(xs), { notation: "fixed" }),
    spread: math.format(math.subtract(math.max(xs), math.min(xs)), { notation: "fixed" }),
  };
};

/*
 * A cross-plane V8 worked by hand (invented weights, g). Every cylinder: wrist pin 120.0,
 * retainers 2.0, ring set 40.0, small end 160.0, big end 440.0, bearing shells 50.0. Pistons
 * 500.0, 500.2, 500.4, 500.0, 500.1, 500.1, 500.3, 500.3: all within 0.5 g of the lightest
 * (500.0), so none is machined (common practice).
 *   reciprocating = piston + 120.0 + 2.0 + 40.0 + 160.0 = piston + 322.0
 *   rotating per rod = 440.0 + 50.0 = 490.0, + 2.5 oil per rod = 492.5
 * Bobweight at 50 % (common practice: 2 × rotating + 1 × reciprocating + 2 × oil where the pistons
 * match):
 *   pin 1 (cyl. 1, 2): 2 × 490 + 2 × 2.5 + 0.5 × (822.0 + 822.2) = 980 + 5 + 822.1 = 1807.1
 *   pin 2 (cyl. 3, 4): 985 + 0.5 × (822.4 + 822.0) = 985 + 822.2 = 1807.2
 *   pin 3 (cyl. 5, 6): 985 + 0.5 × (822.1 + 822.1) = 985 + 822.1 = 1807.1
 *   pin 4 (cyl. 7, 8): 985 + 0.5 × (822.3 + 822.3) = 985 + 822.3 = 1807.3
 * To build: (1807.1 + 1807.2 + 1807.1 + 1807.3) ÷ 4 = 7228.7 ÷ 4 = 1807.175;
 * spread 1807.3 − 1807.1 = 0.2, more than the 0.1 g scale.
 */
const PISTONS = ["500.0", "500.2", "500.4", "500.0", "500.1", "500.1", "500.3", "500.3"];
const v8Cylinders: CylinderInput[] = PISTONS.map((piston, i) => ({
  number: i + 1,
  piston,
  wristPin: "120.0",
  retainers: "2.0",
  rings: "40.0",
  smallEnd: "160.0",
  bigEnd: "440.0",
  bearing: "50.0",
}));
const v8 = (oil: Pick<BalanceInput, "oilAllowance" | "oilAllowancePerRod">) =>
  computeBalance({ layout: { preset: "v8-cross-plane" }, cylinders: v8Cylinders, ...oil });

describe("bobweight with the oil allowance per rod", () => {
  const result = v8({ oilAllowancePerRod: "2.5" });

  it("adds rods on the pin × the per-rod figure: 2 × rotating + 1 × reciprocating + 2 × oil on a V8 (hand-worked, common practice)", () => {
    expect(result.bobweights.map((b) => [b.crankpin, b.mass, b.oil])).toEqual([
      [1, "1807.1", "5"],
      [2, "1807.2", "5"],
      [3, "1807.1", "5"],
      [4, "1807.3", "5"],
    ]);
    // pin 1 rotating part: 2 × 490.0 + 5 = 985
    expect(result.bobweights[0]?.rotating).toBe("985");
    expect(result.oilAllowancePerRod).toBe("2.5");
    expect(result.oilAllowance).toBe("0");
  });

  it("puts one per-rod figure in each cylinder's rotating mass: 440.0 + 50.0 + 2.5 = 492.5", () => {
    expect(new Set(result.cylinders.map((c) => c.rotating))).toEqual(new Set(["492.5"]));
  });

  it("gives the same bobweights as the older per-crankpin figure of twice as much on two-rod pins", () => {
    const perPin = v8({ oilAllowance: "5" });
    expect(perPin.bobweights.map((b) => b.mass)).toEqual(result.bobweights.map((b) => b.mass));
    expect(perPin.bobweights.map((b) => b.oil)).toEqual(["5", "5", "5", "5"]);
    expect(perPin.oilAllowancePerRod).toBeNull();
  });

  it("keeps the per-crankpin figure as it was for existing callers: 4 per pin is 4, not 8", () => {
    // pin 3: 980 + 4 + 822.1 = 1806.1
    expect(v8({ oilAllowance: "4" }).bobweights[2]).toMatchObject({ mass: "1806.1", oil: "4" });
  });

  it("refuses the allowance given both ways at once, naming the per-rod field", () => {
    expect(() => v8({ oilAllowance: "4", oilAllowancePerRod: "2" })).toThrow(
      expect.objectContaining({ field: "oilAllowancePerRod", code: "conflict" }),
    );
    expect(() => v8({ oilAllowancePerRod: "-1" })).toThrow(
      expect.objectContaining({ field: "oilAllowancePerRod", code: "negative" }),
    );
  });

  it("works for one crankpin on its own (bobweightForCrankpin)", () => {
    // 550 + 550 + 2 × 2 + 0.5 × (870 + 870) = 1100 + 4 + 870 = 1974
    const pin = { rotating: ["550", "550"], reciprocating: ["870", "870"], balanceFactor: "50" };
    expect(bobweightForCrankpin({ ...pin, oilAllowancePerRod: "2" })).toBe("1974");
    // one rod: 550 + 2 + 0.5 × 870 = 987
    expect(
      bobweightForCrankpin({
        rotating: ["550"],
        reciprocating: ["870"],
        balanceFactor: "50",
        oilAllowancePerRod: "2",
      }),
    ).toBe("987");
    expect(() =>
      bobweightForCrankpin({ ...pin, oilAllowance: "4", oilAllowancePerRod: "2" }),
    ).toThrow(expect.objectContaining({ code: "conflict" }));
  });
});

describe("bobweight on the split-pin 90° V6", () => {
  // One rod per pin, 50 %: big end 390.0 + bearing 45.0 + oil 3 + 0.5 × (402.0 + 98.0 + 150.0)
  // = 438 + 325 = 763 on each of the six pins (common practice, worked by hand).
  const cylinder = (number: number): CylinderInput => ({
    number,
    piston: "402.0",
    wristPin: "98.0",
    smallEnd: "150.0",
    bigEnd: "390.0",
    bearing: "45.0",
  });
  const result = computeBalance({
    layout: { preset: "v6-90-split" },
    oilAllowancePerRod: "3",
    cylinders: [1, 2, 3, 4, 5, 6].map(cylinder),
  });

  it("gives six bobweights, each with one rod's oil", () => {
    expect(result.bobweights.map((b) => [b.crankpin, b.cylinders, b.mass, b.oil])).toEqual(
      [1, 2, 3, 4, 5, 6].map((n) => [n, [n], "763", "3"]),
    );
  });

  it("builds one set of six to 763 with no spread", () => {
    expect(result.buildTo).toEqual([
      expect.objectContaining({
        rodsPerPin: 1,
        mass: "763",
        spread: "0",
        spreadAboveResolution: false,
      }),
    ]);
    expect(result.buildTo[0]?.pins).toHaveLength(6);
  });
});

describe("bobweightToBuild", () => {
  const pins = (masses: string[]) =>
    masses.map((mass, i) => ({ crankpin: i + 1, cylinders: [2 * i + 1, 2 * i + 2], mass }));

  it("builds to the mean of the pins and shows their spread (hand-worked and mathjs)", () => {
    // (1936.0 + 1936.9 + 1936.4 + 1936.5) ÷ 4 = 7745.8 ÷ 4 = 1936.45; spread 1936.9 − 1936.0 = 0.9
    const masses = ["1936.0", "1936.9", "1936.4", "1936.5"];
    const [set, ...rest] = bobweightToBuild({ resolution: "0.1", bobweights: pins(masses) });
    expect(rest).toEqual([]);
    expect(set).toMatchObject({
      rodsPerPin: 2,
      mass: "1936.45",
      min: "1936",
      max: "1936.9",
      spread: "0.9",
      spreadAboveResolution: true,
    });
    expect(set?.pins.map((p) => p.mass)).toEqual(["1936", "1936.9", "1936.4", "1936.5"]);
    expect(exact(masses)).toEqual({ mean: set?.mass, spread: set?.spread });
  });

  it("warns only when the spread is wider than the scale resolution", () => {
    const within = bobweightToBuild({
      resolution: "0.1",
      bobweights: pins(["1936.4", "1936.5", "1936.5", "1936.4"]),
    });
    expect(within[0]).toMatchObject({ spread: "0.1", spreadAboveResolution: false });
    const coarse = bobweightToBuild({
      resolution: "0.5",
      bobweights: pins(["1936.0", "1936.9"]),
    });
    expect(coarse[0]?.spreadAboveResolution).toBe(true);
    // A mean of three that does not terminate: (100 + 100 + 100.1) ÷ 3 = 100.0333…
    const three = bobweightToBuild({
      resolution: "0.1",
      bobweights: pins(["100", "100", "100.1"]),
    });
    expect(three[0]?.mass.startsWith("100.0333333")).toBe(true);
    expect(three[0]?.spreadAboveResolution).toBe(false);
  });

  it("never averages pins that carry a different number of rods", () => {
    // A custom layout, 2 rods per pin, 3 cylinders: pin 1 has cylinders 1 and 2, pin 2 only 3.
    const result = computeBalance({
      layout: { rodsPerPin: 2, bobweight: true },
      balanceFactor: "50",
      oilAllowancePerRod: "2",
      cylinders: [1, 2, 3].map((number) => ({
        number,
        piston: "400",
        wristPin: "100",
        smallEnd: "150",
        bigEnd: "400",
      })),
    });
    // pin 1: 800 + 2 × 2 + 0.5 × 1300 = 1454; pin 2: 400 + 2 + 0.5 × 650 = 727
    expect(result.bobweights.map((b) => [b.mass, b.oil])).toEqual([
      ["1454", "4"],
      ["727", "2"],
    ]);
    expect(result.buildTo.map((s) => [s.rodsPerPin, s.mass])).toEqual([
      [1, "727"],
      [2, "1454"],
    ]);
  });

  it("is worked out from the same bobweights the result lists", () => {
    const result = v8({ oilAllowancePerRod: "2.5" });
    expect(result.buildTo).toHaveLength(1);
    const set = result.buildTo[0];
    expect(set?.pins).toEqual(
      result.bobweights.map((b) => ({ crankpin: b.crankpin, mass: b.mass })),
    );
    expect(set).toMatchObject({ mass: "1807.175", spread: "0.2", spreadAboveResolution: true });
  });

  it("is empty where the layout needs no bobweight", () => {
    const inline4 = computeBalance({
      layout: { preset: "inline-4" },
      oilAllowancePerRod: "2",
      cylinders: v8Cylinders.slice(0, 4),
    });
    expect(inline4.bobweights).toEqual([]);
    expect(inline4.buildTo).toEqual([]);
  });

  it("refuses a crankpin given twice, a pin without rods and a bad resolution", () => {
    const pin = { crankpin: 1, cylinders: [1], mass: "700" };
    expect(() => bobweightToBuild({ resolution: "0.1", bobweights: [pin, pin] })).toThrow(
      expect.objectContaining({ field: "bobweights.1.crankpin", code: "duplicate" }),
    );
    expect(() =>
      bobweightToBuild({ resolution: "0.1", bobweights: [{ ...pin, cylinders: [] }] }),
    ).toThrow(expect.objectContaining({ field: "bobweights.0.cylinders", code: "empty" }));
    expect(() => bobweightToBuild({ resolution: "0", bobweights: [pin] })).toThrow(
      expect.objectContaining({ field: "resolution", code: "not-positive" }),
    );
    expect(bobweightToBuild({ resolution: "0.1", bobweights: [] })).toEqual([]);
  });
});
