import Decimal from "decimal.js";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  computeBalance,
  convertLength,
  convertMass,
  matchSet,
  suggestPairing,
  type CylinderInput,
  type PairingCylinderInput,
} from "@/lib/balance";

const D = Decimal.clone({ precision: 80 });
const plain = (value: string) => new D(value).toFixed();

/** A weight in tenths or hundredths of a gram between min and max grams, as a decimal string. */
const weight = (min: number, max: number, places = 1) =>
  fc
    .integer({ min: min * 10 ** places, max: max * 10 ** places })
    .map((n) => new D(n).div(10 ** places).toFixed(places));

/** Any decimal string of up to 28 significant digits. */
const decimalString = fc
  .tuple(fc.bigInt({ min: 1n, max: 10n ** 28n - 1n }), fc.integer({ min: 0, max: 40 }))
  .map(([digits, scale]) => new D(digits.toString()).div(new D(10).pow(scale)).toFixed());

describe("properties: matching", () => {
  it("never asks to remove more than measured − target, and the finished set spans at most the tolerance", () => {
    fc.assert(
      fc.property(
        fc.array(weight(400, 520), { minLength: 1, maxLength: 16 }),
        fc.option(weight(400, 520), { nil: undefined }),
        weight(0, 2, 2),
        (measured, target, tolerance) => {
          const result = matchSet({ measured, target, tolerance });
          const goal = new D(result.target);
          const finals: Decimal[] = [];
          for (const part of result.parts) {
            const m = new D(part.measured);
            const remove = new D(part.remove);
            expect(remove.gte(0)).toBe(true);
            expect(remove.lte(D.max(0, m.minus(goal)))).toBe(true);
            expect(new D(part.final).eq(m.minus(remove))).toBe(true);
            if (part.status === "light") expect(m.lt(goal)).toBe(true);
            else finals.push(new D(part.final));
          }
          if (finals.length > 0)
            expect(
              D.max(...finals)
                .minus(D.min(...finals))
                .lte(tolerance),
            ).toBe(true);
          expect(new D(result.spread).lte(tolerance)).toBe(true);
        },
      ),
    );
  });

  const v8Cylinder = fc.record({
    piston: weight(505, 520),
    wristPin: weight(138, 142),
    retainers: weight(1, 3),
    rings: weight(37, 40),
    smallEnd: weight(178, 184),
    bigEnd: weight(515, 530),
    bearing: weight(28, 32),
  });
  const v8Job = fc
    .array(v8Cylinder, { minLength: 8, maxLength: 8 })
    .map((list) => list.map((c, i): CylinderInput => ({ number: i + 1, ...c })));

  it("leaves every kind of a whole job within the tolerance", () => {
    fc.assert(
      fc.property(v8Job, weight(0, 1, 2), (cylinders, tolerance) => {
        const result = computeBalance({
          layout: { preset: "v8-cross-plane" },
          tolerance,
          cylinders,
        });
        for (const kind of ["piston", "wristPin", "retainers", "rings", "smallEnd", "bigEnd"]) {
          const finals = result.parts.filter((p) => p.kind === kind).map((p) => new D(p.final));
          expect(
            D.max(...finals)
              .minus(D.min(...finals))
              .lte(tolerance),
          ).toBe(true);
          expect(D.min(...finals).eq(result.targets[kind as "piston"] as string)).toBe(true);
        }
      }),
    );
  });

  it("makes each bobweight grow with the balance factor, strictly since reciprocating mass is positive", () => {
    fc.assert(
      fc.property(
        v8Job,
        fc.integer({ min: 0, max: 1000 }),
        fc.integer({ min: 0, max: 1000 }),
        (cylinders, a, b) => {
          fc.pre(a !== b);
          const [low, high] = a < b ? [a, b] : [b, a];
          const at = (tenths: number) =>
            computeBalance({
              layout: { preset: "v8-cross-plane" },
              balanceFactor: new D(tenths).div(10).toFixed(),
              oilAllowance: "4",
              cylinders,
            }).bobweights;
          const lower = at(low);
          const higher = at(high);
          lower.forEach((bob, i) =>
            expect(new D(higher[i]?.mass as string).gt(bob.mass)).toBe(true),
          );
        },
      ),
      { numRuns: 50 },
    );
  });
});

describe("properties: units", () => {
  it("g → oz → g and g → grain → g return the input (NIST HB44 exact factors)", () => {
    fc.assert(
      fc.property(decimalString, (grams) => {
        expect(convertMass(convertMass(grams, "g", "oz"), "oz", "g")).toBe(plain(grams));
        expect(convertMass(convertMass(grams, "g", "grain"), "grain", "g")).toBe(plain(grams));
        expect(convertMass(convertMass(grams, "oz", "grain"), "grain", "oz")).toBe(plain(grams));
      }),
      { numRuns: 1000 },
    );
  });

  it("oz → g → oz and mm → in → mm return the input", () => {
    fc.assert(
      fc.property(decimalString, (value) => {
        expect(convertMass(convertMass(value, "oz", "g"), "g", "oz")).toBe(plain(value));
        expect(convertLength(convertLength(value, "mm", "in"), "in", "mm")).toBe(plain(value));
        expect(convertLength(convertLength(value, "in", "mm"), "mm", "in")).toBe(plain(value));
      }),
      { numRuns: 500 },
    );
  });

  it("stays within one part in 10³⁰ of the exact value", () => {
    fc.assert(
      fc.property(decimalString, (grams) => {
        const oz = new D(convertMass(grams, "g", "oz"));
        const exact = new D(grams).div("28.349523125");
        expect(oz.minus(exact).abs().div(exact).lte("1e-30")).toBe(true);
      }),
    );
  });
});

describe("properties: pairing", () => {
  const job = (n: number) =>
    fc.record({
      cylinders: fc.array(fc.tuple(weight(500, 515), weight(178, 184)), {
        minLength: n,
        maxLength: n,
      }),
      groupOf: fc.array(fc.integer({ min: 0, max: 2 }), { minLength: n, maxLength: n }),
      grouped: fc.boolean(),
    });
  const toInput = (cylinders: [string, string][]): PairingCylinderInput[] =>
    cylinders.map(([piston, smallEnd], i) => ({
      number: i + 1,
      piston,
      wristPin: "140.0",
      smallEnd,
    }));

  function permutations<T>(items: readonly T[]): T[][] {
    if (items.length <= 1) return [[...items]];
    return items.flatMap((item, i) =>
      permutations([...items.slice(0, i), ...items.slice(i + 1)]).map((rest) => [item, ...rest]),
    );
  }

  /** Least Σ(s − min s) over every pairing that keeps pistons within their group. */
  function bruteForce(cylinders: [string, string][], groups: number[][]): Decimal {
    const assembly = cylinders.map(([p]) => new D(p).plus("140.0"));
    const small = cylinders.map(([, s]) => new D(s));
    let best: Decimal | undefined;
    const walk = (g: number, pistonFor: number[]) => {
      if (g === groups.length) {
        const sums = small.map((s, rod) => s.plus(assembly[pistonFor[rod] as number] as Decimal));
        const removed = D.sum(...sums).minus(D.min(...sums).times(sums.length));
        if (best === undefined || removed.lt(best)) best = removed;
        return;
      }
      const group = groups[g] as number[];
      for (const perm of permutations(group)) {
        const next = [...pistonFor];
        group.forEach((rod, k) => (next[rod] = perm[k] as number));
        walk(g + 1, next);
      }
    };
    walk(
      0,
      cylinders.map((_, i) => i),
    );
    return best as Decimal;
  }

  it("is never worse than the numbered pairing", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 16 }).chain(job), ({ cylinders }) => {
        const result = suggestPairing({ cylinders: toInput(cylinders) });
        expect(new D(result.removedSuggested).lte(result.removedNumbered)).toBe(true);
        expect(new D(result.saved).gte(0)).toBe(true);
        const pistons = result.assignment.map((a) => a.pistonFromCylinder).sort((x, y) => x - y);
        expect(pistons).toEqual(cylinders.map((_, i) => i + 1));
      }),
    );
  });

  it("finds the same least removal as brute force for up to 6 cylinders, with or without groups", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 6 }).chain(job), ({ cylinders, groupOf, grouped }) => {
        const groups = grouped
          ? [0, 1, 2]
              .map((g) => groupOf.flatMap((owner, i) => (owner === g ? [i] : [])))
              .filter((g) => g.length > 0)
          : [cylinders.map((_, i) => i)];
        const result = suggestPairing({
          cylinders: toInput(cylinders),
          groups: groups.map((g) => g.map((i) => i + 1)),
        });
        expect(new D(result.removedSuggested).eq(bruteForce(cylinders, groups))).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});
