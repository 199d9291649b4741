import { describe, expect, it } from "vitest";
import { BalanceInputError, suggestPairing, type PairingCylinderInput } from "@/lib/balance";

const cyl = (number: number, piston: string, smallEnd: string): PairingCylinderInput => ({
  number,
  piston,
  wristPin: "140.0",
  retainers: "2.0",
  rings: "38.5",
  smallEnd,
});

describe("suggestPairing", () => {
  it("puts the heaviest piston assembly on the lightest small end (worked by hand)", () => {
    // Assemblies = piston + 180.5 (pin, retainers, rings): 692.5, 691.5, 693.5, 690.5.
    // Small ends 180.0, 181.0, 180.5, 182.0.
    // As numbered: 872.5, 872.5, 874.0, 872.5 → min 872.5, removed 0 + 0 + 1.5 + 0 = 1.5.
    // Anti-sorted: assemblies 693.5 (3), 692.5 (1), 691.5 (2), 690.5 (4) onto small ends
    // 180.0 (1), 180.5 (3), 181.0 (2), 182.0 (4) → rod 1 ← 3: 873.5, rod 3 ← 1: 873.0,
    // rod 2 ← 2: 872.5, rod 4 ← 4: 872.5 → min 872.5, removed 1.0 + 0.5 = 1.5 — no better,
    // so the numbered pairing stays.
    const even = suggestPairing({
      cylinders: [
        cyl(1, "512.0", "180.0"),
        cyl(2, "511.0", "181.0"),
        cyl(3, "513.0", "180.5"),
        cyl(4, "510.0", "182.0"),
      ],
    });
    expect(even).toMatchObject({
      removedNumbered: "1.5",
      removedSuggested: "1.5",
      saved: "0",
      changed: false,
    });

    // Swap small ends 1 and 4: numbered 692.5+182.0 = 874.5, 872.5, 874.0, 690.5+180.0 = 870.5
    // → min 870.5, removed 4 + 2 + 3.5 = 9.5. Anti-sorted: 693.5+180.0 = 873.5 (rod 4 ← 3),
    // 692.5+180.5 = 873.0 (rod 3 ← 1), 691.5+181.0 = 872.5 (rod 2 ← 2), 690.5+182.0 = 872.5
    // (rod 1 ← 4) → min 872.5, removed 1.0 + 0.5 = 1.5; saved 8.
    const result = suggestPairing({
      cylinders: [
        cyl(1, "512.0", "182.0"),
        cyl(2, "511.0", "181.0"),
        cyl(3, "513.0", "180.5"),
        cyl(4, "510.0", "180.0"),
      ],
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
      removedSuggested: "1.5",
      saved: "8",
      spreadNumbered: "4",
      spreadSuggested: "1",
      changed: true,
    });
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

  describe("edge cases", () => {
    it("handles one cylinder and refuses bad groups", () => {
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
      expect(() => suggestPairing({ cylinders: [] })).toThrow(BalanceInputError);
      expect(() =>
        suggestPairing({
          cylinders: [cyl(1, "500", "180"), { ...cyl(2, "501", "180"), rings: undefined }],
        }),
      ).toThrow(expect.objectContaining({ field: "cylinders.1.rings", code: "incomplete-kind" }));
    });
  });
});
