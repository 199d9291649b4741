import { all, create, type FactoryFunctionMap } from "mathjs";
import { describe, expect, it } from "vitest";
import type { RotatingPart } from "@/db/schema";
import { rotatingRecordSchema, type RotatingRecordInput } from "@/lib/validation/workshop";
import {
  checkRotatingRecord,
  figuresOf,
  gramsOf,
  kilogramsOf,
  millimetresOf,
  unbalanceIn,
} from "@/lib/workshop/rotating";

// Reference library: mathjs's own unit table (1 oz = 28.349523125 g, 1 lbm = 0.45359237 kg,
// 1 in = 25.4 mm: the exact NIST SP 811 App. B.8 factors) in 64-digit BigNumber arithmetic.
const math = create(all as FactoryFunctionMap, { number: "BigNumber", precision: 64 });
const mathjs = (value: string, from: string, to: string) =>
  math.unit(math.bignumber(value), from).toNumeric(to).toString();

const record = (part: RotatingPart, data: RotatingRecordInput) => ({
  part,
  data,
  version: 1,
  updatedAt: "2026-12-02T00:00:00.000Z",
});

describe("figures typed in ounces, pounds and inches, converted exactly for the engine", () => {
  it("converts a balancer reading in ounces to grams as mathjs does", () => {
    for (const oz of ["0.05", "0.015", "1", "0.125", "2.375"])
      expect(gramsOf(oz, "oz")).toBe(mathjs(oz, "oz", "g"));
    // By hand: 0.05 oz × 28.349523125 g/oz = 1.41747615625 g.
    expect(gramsOf("0.05", "oz")).toBe("1.41747615625");
    expect(gramsOf("0.4", "g")).toBe("0.4");
  });

  it("converts a radius or plane distance in inches to mm as mathjs does", () => {
    for (const inches of ["3", "2.75", "0.125", "7.0625"])
      expect(millimetresOf(inches, "in")).toBe(mathjs(inches, "in", "mm"));
    // By hand: 3 in × 25.4 = 76.2 mm.
    expect(millimetresOf("3", "in")).toBe("76.2");
  });

  it("converts a rotor mass in pounds to kg as mathjs does", () => {
    for (const lb of ["50", "12.5", "61.25"])
      expect(kilogramsOf(lb, "oz")).toBe(mathjs(lb, "lbm", "kg"));
    // By hand: 50 lb × 0.45359237 kg/lb = 22.6796185 kg.
    expect(kilogramsOf("50", "oz")).toBe("22.6796185");
    expect(kilogramsOf("24.5", "g")).toBe("24.5");
  });

  it("shows an unbalance in oz·in, g·in and oz·mm as mathjs does", () => {
    // By hand: 1 oz·in = 28.349523125 g × 25.4 mm = 720.077887375 g·mm exactly.
    expect(unbalanceIn("720.077887375", { mass: "oz", length: "in" })).toBe("1");
    for (const gmm of ["227.4", "0.5", "12345.678"]) {
      expect(Number(unbalanceIn(gmm, { mass: "oz", length: "in" }))).toBeCloseTo(
        Number(mathjs(gmm, "g mm", "oz in")),
        12,
      );
      expect(Number(unbalanceIn(gmm, { mass: "g", length: "in" }))).toBeCloseTo(
        Number(mathjs(gmm, "g mm", "g in")),
        12,
      );
    }
    expect(unbalanceIn("-25.4", { mass: "g", length: "in" })).toBe("-1");
    expect(unbalanceIn("227.4", { mass: "g", length: "mm" })).toBe("227.4");
    // A specific unbalance: g·mm/kg to oz·in/lb, checked against mathjs.
    expect(Number(unbalanceIn("10", { mass: "oz", length: "in" }, true))).toBeCloseTo(
      Number(mathjs("10", "g mm / kg", "oz in / lbm")),
      14,
    );
  });

  it("reads an older record (kg and mm under their own names) as grams and mm", () => {
    const f = figuresOf({ massKg: "24.5", radiusMm: "60", planeDistanceAMm: "120" });
    expect(f.units).toEqual({ mass: "g", length: "mm" });
    expect(f.rotorMass).toEqual({ entered: "24.5", kg: "24.5" });
    expect(f.radius).toEqual({ entered: "60", mm: "60" });
    // Only one plane distance: none is used.
    expect(f.planeDistances).toBeNull();
  });

  it("keeps the figures as typed beside the engine's", () => {
    const f = figuresOf({
      massUnit: "oz",
      lengthUnit: "in",
      rotorMass: "50",
      radius: "3.000",
      planeDistanceA: "4.5",
      planeDistanceB: "5.5",
    });
    expect(f.rotorMass).toEqual({ entered: "50", kg: "22.6796185" });
    expect(f.radius).toEqual({ entered: "3.000", mm: "76.2" });
    expect(f.planeDistances).toEqual({
      A: { entered: "4.5", mm: "114.3" },
      B: { entered: "5.5", mm: "139.7" },
    });
  });
});

describe("the same crank in g and mm and in oz and in gets the same verdict", () => {
  // An invented crank: 50 lb (22.6796185 kg), 6000 rpm, G 6.3, read at 3 in (76.2 mm), two
  // planes half each. By hand (ISO 21940-11): Ω = 2π × 6000 / 60 = 628.3185 rad/s,
  // e_per = 6.3 / 628.3185 × 1000 = 10.0268 g·mm/kg, U_per = 10.0268 × 22.6796185 = 227.40 g·mm
  // = 227.40 / 720.0779 = 0.31580 oz·in; half each plane 0.15790 oz·in, at 3 in 0.052633 oz.
  const inOunces = (a: string, b: string): RotatingRecordInput => ({
    massUnit: "oz",
    lengthUnit: "in",
    rotorMass: "50",
    rpm: 6000,
    grade: "6.3",
    radius: "3",
    planes: "two",
    after: { A: { mass: a }, B: { mass: b } },
  });
  const inGrams = (a: string, b: string): RotatingRecordInput => ({
    rotorMass: "22.6796185",
    rpm: 6000,
    grade: "6.3",
    radius: "76.2",
    planes: "two",
    after: { A: { mass: gramsOf(a, "oz") }, B: { mass: gramsOf(b, "oz") } },
  });

  it("works the allowance out to the hand figures, in oz at the radius", () => {
    const check = checkRotatingRecord(record("crankshaft", inOunces("0.05", "0.02")));
    expect(check.units).toEqual({ mass: "oz", length: "in" });
    expect(Number(check.permissible!.uPer)).toBeCloseTo(227.4, 1);
    expect(Number(unbalanceIn(check.permissible!.uPer, check.units))).toBeCloseTo(0.3158, 4);
    expect(Number(unbalanceIn(check.allowances[0]!.massAtRadius, { mass: "oz", length: "mm" })))
      // A mass converts like an unbalance with the length left in mm.
      .toBeCloseTo(0.052633, 5);
    expect(check.after!.pass).toBe(true);
  });

  it("passes and fails the same readings either way, up to the edge of the allowance", () => {
    for (const [a, b] of [
      ["0.05", "0.02"],
      ["0.0526", "0.0526"],
      ["0.0527", "0.01"],
      ["0.055", "0.055"],
      ["0.3", "0.001"],
    ] as const) {
      const oz = checkRotatingRecord(record("crankshaft", inOunces(a, b)));
      const g = checkRotatingRecord(record("crankshaft", inGrams(a, b)));
      expect(oz.after!.pass, `${a} / ${b} oz`).toBe(g.after!.pass);
      expect(oz.after!.planes.map((p) => p.residual)).toEqual(
        g.after!.planes.map((p) => p.residual),
      );
      expect(oz.allowances).toEqual(g.allowances);
    }
    // 0.0526 oz is under 0.052633 oz; 0.0527 oz is over it (by hand, above).
    expect(
      checkRotatingRecord(record("crankshaft", inOunces("0.0526", "0.0526"))).after!.pass,
    ).toBe(true);
    expect(checkRotatingRecord(record("crankshaft", inOunces("0.0527", "0.01"))).after!.pass).toBe(
      false,
    );
  });

  it("takes the figure as typed on the server, whatever its gram conversion's length", () => {
    const parsed = rotatingRecordSchema.safeParse(inOunces("0.052", "0.015"));
    expect(parsed.success).toBe(true);
    // 0.015 oz is 0.425242846875 g: 12 decimals, more than a typed figure may have.
    expect(gramsOf("0.015", "oz")).toBe("0.425242846875");
    expect(rotatingRecordSchema.safeParse(inGrams("0.052", "0.015")).success).toBe(false);
  });

  it("names ounces in a refusal of a record typed in ounces, grams otherwise", () => {
    const oz = rotatingRecordSchema.safeParse({
      ...inOunces("", "0.01"),
      after: { A: { mass: "", angle: "90" } },
      corrections: [{ plane: "A", method: "drilled", where: "", mass: "" }],
    });
    expect(oz.success).toBe(false);
    const messages = Object.fromEntries(oz.error!.issues.map((i) => [i.path.join("."), i.message]));
    expect(messages["after.A.mass"]).toMatch(/ounces/);
    expect(messages["corrections.0.mass"]).toMatch(/ounces/);
    const g = rotatingRecordSchema.safeParse({
      corrections: [{ plane: "A", method: "drilled", where: "", mass: "" }],
    });
    expect(g.error!.issues[0]!.message).toMatch(/grams/);
    expect(g.error!.issues[0]!.path).toEqual(["corrections", 0, "mass"]);
  });
});
