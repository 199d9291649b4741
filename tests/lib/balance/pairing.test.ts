import Decimal from "decimal.js";
import { describe, expect, it } from "vitest";
import {
  BalanceInputError,
  computeBalance,
  suggestPairing,
  type CylinderInput,
  type PairingCylinderInput,
} from "@/lib/balance";

// Invented weights (g). Every cylinder has the same pin, retainers and rings (140.0 + 2.0 +
// 38.5 = 180.5), so a piston assembly is piston + 180.5.
const cyl = (number: number, piston: string, smallEnd: string): PairingCylinderInput => ({
  number,
  piston,
  wristPin: "140.0",
  retainers: "2.0",
  rings: "38.5",
  smallEnd,
});

/**
 * A second, naive derivation of the by-cylinder removal (written here, not taken from the
 * engine): per cylinder, reciprocating = piston + pin + retainers + rings + small end; target
 * = the lightest; over target + tolerance, take the excess off the piston down to the lightest
 * piston, then off the small end down to the lightest small end (the rule the plan documents).
 */
function naiveRemoved(rows: { piston: string; rest: string; smallEnd: string }[], tol = "0.5") {
  const D = Decimal;
  const sums = rows.map((r) => new D(r.piston).plus(r.rest).plus(r.smallEnd));
  const target = D.min(...sums);
  const pFloor = D.min(...rows.map((r) => new D(r.piston)));
  const sFloor = D.min(...rows.map((r) => new D(r.smallEnd)));
  let removed = new D(0);
  rows.forEach((r, i) => {
    const excess = (sums[i] as Decimal).minus(target);
    if (excess.lte(tol)) return;
    const fromPiston = D.min(excess, new D(r.piston).minus(pFloor));
    const fromSmall = D.min(excess.minus(fromPiston), new D(r.smallEnd).minus(sFloor));
    removed = removed.plus(fromPiston).plus(fromSmall);
  });
  return removed;
}

describe("suggestPairing (judged by the by-cylinder plan)", () => {
  // Pistons 512.0, 511.0, 513.0, 510.0 → assemblies 692.5, 691.5, 693.5, 690.5.
  const pistons = ["512.0", "511.0", "513.0", "510.0"];

  it("puts pistons on rods so the plan removes least, with the tolerance (worked by hand)", () => {
    // Small ends 182.0, 181.0, 180.5, 180.0. Lightest piston 510.0, lightest small end 180.0.
    // As numbered: 692.5+182.0 = 874.5, 691.5+181.0 = 872.5, 693.5+180.5 = 874.0,
    // 690.5+180.0 = 870.5 → target 870.5; over by 4.0, 2.0, 3.5, 0 (all > 0.5):
    //   cyl 1: piston gives 512.0−510.0 = 2.0, small end the other 2.0 → 4.0
    //   cyl 2: piston gives 1.0, small end 1.0 → 2.0;  cyl 3: piston 3.5 (it could give 3.0…
    //   513.0−510.0 = 3.0, so piston 3.0 + small end 0.5) → 3.5.   Total 9.5.
    // Best: the sums A+S that can share a 0.5 window: piston 4 (690.5) is at most 872.5
    // (on the 182.0 rod), piston 3 (693.5) at least 873.5 (on the 180.0 rod), so the spread is
    // at least 1.0 and the target at most 872.5: rod 1 ← piston 4 = 872.5, rod 2 ← 2 = 872.5,
    // rod 3 ← 1 = 873.0 (0.5 over: in band), rod 4 ← 3 = 873.5 (1.0 over: off piston 3).
    // Removed 1.0; saved 9.5 − 1.0 = 8.5.
    const smallEnds = ["182.0", "181.0", "180.5", "180.0"];
    const result = suggestPairing({
      cylinders: pistons.map((p, i) => cyl(i + 1, p, smallEnds[i]!)),
    });
    expect(
      result.assignment.map((a) => [a.rodCylinder, a.pistonFromCylinder, a.reciprocating]),
    ).toEqual([
      [1, 4, "872.5"],
      [2, 2, "872.5"],
      [3, 1, "873"],
      [4, 3, "873.5"],
    ]);
    expect(result).toMatchObject({
      removedNumbered: "9.5",
      removedSuggested: "1",
      saved: "8.5",
      unfixedNumbered: "0",
      unfixedSuggested: "0",
      spreadNumbered: "4",
      spreadSuggested: "1",
      changed: true,
    });
  });

  it("finds a saving a zero-tolerance model misses: the last 0.5 g is in band", () => {
    // Small ends 180.0, 181.0, 180.5, 182.0. As numbered: 872.5, 872.5, 874.0, 872.5 →
    // cyl 3 is 1.5 over, taken off its piston (513.0 can give 3.0): 1.5 removed.
    // The anti-sorted pairing gives 873.5, 872.5, 873.0, 872.5: Σ above the lightest is
    // 1.0 + 0.5 = 1.5 again, so a zero-tolerance count sees no gain; with the 0.5 g band only
    // the 873.5 is machined, by 1.0: rod 1 (180.0) ← piston 3 = 873.5, rod 3 (180.5) ← piston 1
    // = 873.0 (in band).
    const smallEnds = ["180.0", "181.0", "180.5", "182.0"];
    const result = suggestPairing({
      cylinders: pistons.map((p, i) => cyl(i + 1, p, smallEnds[i]!)),
    });
    expect(result.assignment.map((a) => a.pistonFromCylinder)).toEqual([3, 2, 1, 4]);
    expect(result).toMatchObject({ removedNumbered: "1.5", removedSuggested: "1", saved: "0.5" });
  });

  it("keeps the numbered pairing when nothing is strictly better", () => {
    // 500+180.5+180.0 = 860.5 and 500.2+180.5+180.1 = 860.8: 0.3 apart, within 0.5: nothing
    // to remove either way.
    const result = suggestPairing({
      cylinders: [cyl(1, "500.0", "180.0"), cyl(2, "500.2", "180.1")],
    });
    expect(result).toMatchObject({ removedNumbered: "0", saved: "0", changed: false });
  });

  it("says what machining cannot fix: a heavy ring set stays with its piston", () => {
    // Rings 38.5 and 40.5: assemblies 500+140+2+38.5+180 = 860.5 and 862.5, pistons and
    // small ends all at their lightest, so nothing can come off: 2.0 over, with either pairing.
    const result = suggestPairing({
      cylinders: [cyl(1, "500.0", "180.0"), { ...cyl(2, "500.0", "180.0"), rings: "40.5" }],
    });
    expect(result).toMatchObject({
      removedNumbered: "0",
      unfixedNumbered: "2",
      unfixedSuggested: "2",
      changed: false,
    });
  });

  it("agrees with a naive removal count and with computeBalance on the re-paired set", () => {
    // A V8 (invented): pistons, small ends; pin 140.0 + retainers 2.0 + rings 38.5 each.
    const p = ["501.2", "500.4", "502.0", "500.9", "500.1", "501.6", "501.1", "500.5"];
    const s = ["180.4", "179.8", "181.0", "180.1", "180.6", "179.9", "180.2", "181.1"];
    const result = suggestPairing({ cylinders: p.map((x, i) => cyl(i + 1, x, s[i]!)) });
    const rows = (pistonFor: (rod: number) => number) =>
      s.map((smallEnd, rod) => ({ piston: p[pistonFor(rod)]!, rest: "180.5", smallEnd }));
    const numbered = naiveRemoved(rows((rod) => rod));
    const suggested = naiveRemoved(rows((rod) => result.assignment[rod]!.pistonFromCylinder - 1));
    expect(result.removedNumbered).toBe(numbered.toString());
    expect(result.removedSuggested).toBe(suggested.toString());
    expect(result.saved).toBe(numbered.minus(suggested).toString());
    expect(new Decimal(result.saved).gt(0)).toBe(true);

    // The plan itself (computeBalance by cylinder, big ends all alike so they add nothing).
    const plan = (pistonFor: (rod: number) => number) =>
      computeBalance({
        layout: { preset: "v8-cross-plane" },
        matching: "by-cylinder",
        cylinders: s.map((smallEnd, rod): CylinderInput => ({
          number: rod + 1,
          piston: p[pistonFor(rod)]!,
          wristPin: "140.0",
          retainers: "2.0",
          rings: "38.5",
          smallEnd,
          bigEnd: "450.0",
        })),
      }).parts.reduce((sum, part) => sum.plus(part.remove), new Decimal(0));
    expect(plan((rod) => rod).toString()).toBe(result.removedNumbered);
    expect(plan((rod) => result.assignment[rod]!.pistonFromCylinder - 1).toString()).toBe(
      result.removedSuggested,
    );
  });

  it("swaps pistons only within a group (e.g. one bank)", () => {
    const result = suggestPairing({
      cylinders: [
        cyl(1, "512.0", "182.0"),
        cyl(2, "511.0", "181.0"),
        cyl(3, "513.0", "180.5"),
        cyl(4, "510.0", "180.0"),
      ],
      groups: [
        [1, 3],
        [2, 4],
      ],
    });
    for (const a of result.assignment) expect(a.rodCylinder % 2).toBe(a.pistonFromCylinder % 2);
  });

  it("keeps cylinders outside every group on their own piston", () => {
    const result = suggestPairing({
      cylinders: [
        cyl(1, "512.0", "182.0"),
        cyl(2, "511.0", "181.0"),
        cyl(3, "513.0", "180.5"),
        cyl(4, "510.0", "180.0"),
      ],
      groups: [[2, 3]],
    });
    expect(result.assignment.find((a) => a.rodCylinder === 1)?.pistonFromCylinder).toBe(1);
    expect(result.assignment.find((a) => a.rodCylinder === 4)?.pistonFromCylinder).toBe(4);
  });

  it("brings assemblies to a set target, first leaving none light that a pairing can save", () => {
    // Target 861.0. Assemblies 680.5 and 681.5 (pistons 500.0, 501.0), small ends 180.0, 180.5.
    // As numbered: 860.5 (0.5 light) and 862.0 (1.0 over: piston 501 gives 1.0 → 861.0).
    // Swapped: 680.5+180.5 = 861.0 and 681.5+180.0 = 861.5 (0.5 over: in band): nothing light,
    // nothing to remove.
    const result = suggestPairing({
      cylinders: [cyl(1, "500.0", "180.0"), cyl(2, "501.0", "180.5")],
      target: "861.0",
    });
    expect(result).toMatchObject({
      unfixedNumbered: "0.5",
      unfixedSuggested: "0",
      removedNumbered: "1",
      removedSuggested: "0",
      changed: true,
    });
  });

  describe("edge cases", () => {
    it("handles one cylinder and refuses bad groups and settings", () => {
      expect(suggestPairing({ cylinders: [cyl(1, "500", "180")] })).toMatchObject({
        removedSuggested: "0",
        changed: false,
      });
      const cylinders = [cyl(1, "500", "180"), cyl(2, "501", "180")];
      expect(() => suggestPairing({ cylinders, groups: [[1, 3]] })).toThrow(
        expect.objectContaining({ field: "groups.0.1", code: "unknown-cylinder" }),
      );
      expect(() => suggestPairing({ cylinders, groups: [[1], [1, 2]] })).toThrow(
        expect.objectContaining({ field: "groups.1.0", code: "duplicate" }),
      );
      expect(() => suggestPairing({ cylinders, tolerance: "-1" })).toThrow(
        expect.objectContaining({ field: "tolerance", code: "negative" }),
      );
      expect(() => suggestPairing({ cylinders, target: "0" })).toThrow(
        expect.objectContaining({ field: "target", code: "not-positive" }),
      );
      expect(() => suggestPairing({ cylinders: [] })).toThrow(BalanceInputError);
      expect(() =>
        suggestPairing({
          cylinders: [cyl(1, "500", "180"), { ...cyl(2, "501", "180"), rings: undefined }],
        }),
      ).toThrow(expect.objectContaining({ field: "cylinders.1.rings", code: "incomplete-kind" }));
    });
  });
});
