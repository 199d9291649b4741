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

  it("leaves every machined kind within the tolerance and never machines rings, pins or retainers", () => {
    fc.assert(
      fc.property(v8Job, weight(0, 1, 2), (cylinders, tolerance) => {
        const result = computeBalance({
          layout: { preset: "v8-cross-plane" },
          tolerance,
          cylinders,
        });
        for (const kind of ["piston", "wristPin", "retainers", "rings", "smallEnd", "bigEnd"]) {
          const parts = result.parts.filter((p) => p.kind === kind);
          const target = new D(result.targets[kind as "piston"] as string);
          const kept = parts.filter((p) => p.status !== "reselect").map((p) => new D(p.final));
          expect(
            D.max(...kept)
              .minus(D.min(...kept))
              .lte(tolerance),
          ).toBe(true);
          expect(D.min(...kept).eq(target)).toBe(true);
          if (["wristPin", "retainers", "rings"].includes(kind)) {
            // Matched by choice (common practice): nothing removed; over the band → re-select.
            for (const p of parts) {
              expect(p.remove).toBe("0");
              expect(p.status === "reselect").toBe(new D(p.measured).gt(target.plus(tolerance)));
            }
          } else expect(parts.every((p) => p.status !== "reselect")).toBe(true);
        }
      }),
    );
  });

  it("by cylinder: every assembly ends in the band or is flagged, cut only from pistons and small ends, never below the lightest", () => {
    fc.assert(
      fc.property(v8Job, weight(0, 1, 2), (cylinders, tolerance) => {
        const result = computeBalance({
          layout: { preset: "v8-cross-plane" },
          tolerance,
          matching: "by-cylinder",
          cylinders,
        });
        const target = new D(result.assemblyTarget as string);
        const lightest = (kind: string) =>
          D.min(...result.parts.filter((p) => p.kind === kind).map((p) => new D(p.measured)));
        for (const c of result.cylinders) {
          const a = c.assembly!;
          const final = new D(a.final);
          // The final reciprocating mass is the sum of the parts' finals.
          expect(final.eq(c.reciprocating)).toBe(true);
          if (a.status === "reselect") expect(final.gt(target.plus(tolerance))).toBe(true);
          else expect(final.gte(target) && final.lte(target.plus(tolerance))).toBe(true);
        }
        for (const p of result.parts) {
          if (["wristPin", "retainers", "rings", "bearing"].includes(p.kind))
            expect(p.remove).toBe("0");
          if (p.kind === "piston" || p.kind === "smallEnd")
            expect(new D(p.final).gte(lightest(p.kind))).toBe(true);
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
  // Small random sets: pistons 500–503 g and small ends 179–182 g (0.1 g steps), pins
  // 140.0–140.6, rings 46.0–47.5, so ring sets are sometimes heavy enough that machining
  // cannot fix an assembly; tolerance 0–1 g.
  const job = (n: number) =>
    fc.record({
      cylinders: fc.array(
        fc.tuple(weight(500, 503), weight(179, 182), weight(140, 140.6), weight(46, 47.5)),
        { minLength: n, maxLength: n },
      ),
      groupOf: fc.array(fc.integer({ min: 0, max: 2 }), { minLength: n, maxLength: n }),
      grouped: fc.boolean(),
      tolerance: weight(0, 1),
    });
  type Row = [string, string, string, string];
  const toInput = (cylinders: Row[]): PairingCylinderInput[] =>
    cylinders.map(([piston, smallEnd, wristPin, rings], i) => ({
      number: i + 1,
      piston,
      wristPin,
      rings,
      smallEnd,
    }));

  function permutations<T>(items: readonly T[]): T[][] {
    if (items.length <= 1) return [[...items]];
    return items.flatMap((item, i) =>
      permutations([...items.slice(0, i), ...items.slice(i + 1)]).map((rest) => [item, ...rest]),
    );
  }

  /**
   * The plan's rule written out naively (not the engine's code): target = lightest sum;
   * over target + tolerance, the piston gives down to the lightest piston, then the small end
   * down to the lightest small end; what is still over the band is "unfixed".
   */
  function naivePlan(cylinders: Row[], pistonFor: number[], tolerance: string) {
    const sums = cylinders.map(([, s], rod) => {
      const [p, , pin, rings] = cylinders[pistonFor[rod] as number] as Row;
      return new D(p).plus(pin).plus(rings).plus(s);
    });
    const target = D.min(...sums);
    const pFloor = D.min(...cylinders.map(([p]) => new D(p)));
    const sFloor = D.min(...cylinders.map(([, s]) => new D(s)));
    let removed = new D(0);
    let unfixed = new D(0);
    sums.forEach((sum, rod) => {
      const excess = sum.minus(target);
      if (excess.lte(tolerance)) return;
      const piston = new D((cylinders[pistonFor[rod] as number] as Row)[0]);
      const small = new D((cylinders[rod] as Row)[1]);
      const fromPiston = D.min(excess, piston.minus(pFloor));
      const fromSmall = D.min(excess.minus(fromPiston), small.minus(sFloor));
      removed = removed.plus(fromPiston).plus(fromSmall);
      const left = excess.minus(fromPiston).minus(fromSmall);
      if (left.gt(tolerance)) unfixed = unfixed.plus(left);
    });
    return { removed, unfixed };
  }

  /** The best (unfixed, removed) over every pairing that keeps pistons within their group. */
  function bruteForce(cylinders: Row[], groups: number[][], tolerance: string) {
    let best: { removed: Decimal; unfixed: Decimal } | undefined;
    const walk = (g: number, pistonFor: number[]) => {
      if (g === groups.length) {
        const found = naivePlan(cylinders, pistonFor, tolerance);
        if (
          best === undefined ||
          found.unfixed.lt(best.unfixed) ||
          (found.unfixed.eq(best.unfixed) && found.removed.lt(best.removed))
        )
          best = found;
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
    return best as { removed: Decimal; unfixed: Decimal };
  }

  it("is a permutation never worse than the numbered pairing, up to 16 cylinders", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 16 }).chain(job), ({ cylinders, tolerance }) => {
        const result = suggestPairing({ cylinders: toInput(cylinders), tolerance });
        const numbered = [new D(result.unfixedNumbered), new D(result.removedNumbered)];
        const suggested = [new D(result.unfixedSuggested), new D(result.removedSuggested)];
        const better =
          (suggested[0] as Decimal).lt(numbered[0] as Decimal) ||
          ((suggested[0] as Decimal).eq(numbered[0] as Decimal) &&
            (suggested[1] as Decimal).lte(numbered[1] as Decimal));
        expect(better).toBe(true);
        const pistons = result.assignment.map((a) => a.pistonFromCylinder).sort((x, y) => x - y);
        expect(pistons).toEqual(cylinders.map((_, i) => i + 1));
      }),
      { numRuns: 60 },
    );
  });

  it("reports the numbered and suggested figures the naive plan gives for those pairings", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 8 }).chain(job), ({ cylinders, tolerance }) => {
        const result = suggestPairing({ cylinders: toInput(cylinders), tolerance });
        const numbered = naivePlan(
          cylinders,
          cylinders.map((_, i) => i),
          tolerance,
        );
        const suggested = naivePlan(
          cylinders,
          result.assignment.map((a) => a.pistonFromCylinder - 1),
          tolerance,
        );
        expect(new D(result.removedNumbered).eq(numbered.removed)).toBe(true);
        expect(new D(result.unfixedNumbered).eq(numbered.unfixed)).toBe(true);
        expect(new D(result.removedSuggested).eq(suggested.removed)).toBe(true);
        expect(new D(result.saved).eq(numbered.removed.minus(suggested.removed))).toBe(true);
      }),
      { numRuns: 200 },
    );
  });

  it("finds the same best as trying every pairing (up to 6 cylinders, with or without groups)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 6 }).chain(job),
        ({ cylinders, groupOf, grouped, tolerance }) => {
          const groups = grouped
            ? [0, 1, 2]
                .map((g) => groupOf.flatMap((owner, i) => (owner === g ? [i] : [])))
                .filter((g) => g.length > 0)
            : [cylinders.map((_, i) => i)];
          const result = suggestPairing({
            cylinders: toInput(cylinders),
            groups: groups.map((g) => g.map((i) => i + 1)),
            tolerance,
          });
          const best = bruteForce(cylinders, groups, tolerance);
          expect(new D(result.unfixedSuggested).eq(best.unfixed)).toBe(true);
          expect(new D(result.removedSuggested).eq(best.removed)).toBe(true);
        },
      ),
      { numRuns: 300 },
    );
  });
});
