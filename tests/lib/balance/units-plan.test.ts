import Decimal from "decimal.js";
import fc from "fast-check";
import { evaluate } from "mathjs";
import { describe, expect, it } from "vitest";
import { type BalanceInput, computeBalance, type CylinderInput } from "@/lib/balance";

// The same parts weighed in grams and in ounces must give the same plan: the same status for
// every part, and removals, finished weights, targets and bobweights equal after conversion.
// The ounce figures are generated on a 0.001 oz grid and the gram figures are those × 28.349523125
// (1 oz = 28.349523125 g exactly, NIST SP 811 App. B), so both sets are exactly the same masses.

const GRAMS_PER_OUNCE = new Decimal("28.349523125");

/** A mass in thousandths of an ounce, around a base figure. */
const thousandths = (base: number, spread: number) =>
  fc.integer({ min: base - spread, max: base + spread }).map((n) => new Decimal(n).div(1000));

/** One or two readings of a part (a mean of two is exact, so no rounding enters). */
const readings = (base: number, spread: number) =>
  fc.array(thousandths(base, spread), { minLength: 1, maxLength: 2 });

const cylinder = fc.record({
  piston: readings(17_600, 40),
  wristPin: readings(5_000, 10),
  rings: readings(1_700, 8),
  smallEnd: readings(6_500, 25),
  bigEnd: readings(16_000, 40),
  bearing: readings(1_900, 5),
});

const plan = fc.record({
  layout: fc.constantFrom("v8-cross-plane", "inline-4"),
  matching: fc.constantFrom("by-part" as const, "by-cylinder" as const),
  toleranceOz: thousandths(18, 15),
  oilOz: thousandths(140, 140),
  cylinders: fc.array(cylinder, { minLength: 8, maxLength: 8 }),
});

type Plan = typeof plan extends fc.Arbitrary<infer T> ? T : never;

function input(p: Plan, unit: "g" | "oz"): BalanceInput {
  const scale = (d: Decimal) => (unit === "oz" ? d : d.times(GRAMS_PER_OUNCE)).toString();
  const n = p.layout === "inline-4" ? 4 : 8;
  const cylinders = p.cylinders.slice(0, n).map((c, i): CylinderInput => ({
    number: i + 1,
    piston: c.piston.map(scale),
    wristPin: c.wristPin.map(scale),
    rings: c.rings.map(scale),
    smallEnd: c.smallEnd.map(scale),
    bigEnd: c.bigEnd.map(scale),
    bearing: c.bearing.map(scale),
  }));
  return {
    unit,
    layout: { preset: p.layout },
    matching: p.matching,
    tolerance: scale(p.toleranceOz),
    // 0.002 oz, the gram resolution the same step: only the spread checks read it.
    resolution: scale(new Decimal("0.002")),
    oilAllowancePerRod: scale(p.oilOz),
    cylinders,
  };
}

/** grams ÷ 28.349523125 equals ounces (exact: both are products of the same decimals). */
function sameMass(grams: string, ounces: string): boolean {
  return new Decimal(grams).eq(new Decimal(ounces).times(GRAMS_PER_OUNCE));
}

describe("a plan in ounces is the plan in grams", () => {
  it("checks the conversion factor itself against mathjs (an independent unit table)", () => {
    expect(evaluate("number(1 ounce, g)")).toBeCloseTo(28.349523125, 12);
  });

  it("gives every part the same status, and the same masses after conversion", () => {
    fc.assert(
      fc.property(plan, (p) => {
        const g = computeBalance(input(p, "g"));
        const oz = computeBalance(input(p, "oz"));
        expect(g.parts.map((x) => x.status)).toEqual(oz.parts.map((x) => x.status));
        g.parts.forEach((part, i) => {
          const other = oz.parts[i]!;
          expect([part.cylinder, part.kind]).toEqual([other.cylinder, other.kind]);
          expect(sameMass(part.remove, other.remove)).toBe(true);
          expect(sameMass(part.final, other.final)).toBe(true);
        });
        for (const [kind, target] of Object.entries(g.targets)) {
          expect(sameMass(target, oz.targets[kind as keyof typeof oz.targets]!)).toBe(true);
        }
        expect(g.bobweights.length).toBe(oz.bobweights.length);
        g.bobweights.forEach((b, i) => {
          expect(sameMass(b.mass, oz.bobweights[i]!.mass)).toBe(true);
        });
        expect(g.warnings.map((w) => w.code)).toEqual(oz.warnings.map((w) => w.code));
      }),
      { numRuns: 60 },
    );
  });
});
