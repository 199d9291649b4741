import { describe, expect, it } from "vitest";
import { bearingClearance, journalGeometry } from "@/lib/assembly";

describe("bearingClearance", () => {
  it("gives bore − journal and about 0.001 in per inch of journal (common practice)", () => {
    // 2.4525 − 2.4500 = 0.0025 in; 0.0025 / 2.45 = 0.00102 in per inch of journal
    const result = bearingClearance({ bore: "2.4525", journal: "2.4500" });
    expect(result.clearance).toBe("0.0025");
    expect(Number(result.perJournalDiameter)).toBeCloseTo(0.00102, 5);
    expect(result.status).toBeUndefined();
  });

  it("works the same in mm (unit-agnostic)", () => {
    // 62.292 − 62.230 = 0.062 mm
    expect(bearingClearance({ bore: "62.292", journal: "62.230" }).clearance).toBe("0.062");
  });

  it("checks the clearance against the engine maker's limits", () => {
    const limits = { minClearance: "0.0015", maxClearance: "0.0030" };
    expect(bearingClearance({ bore: "2.4525", journal: "2.4500", ...limits }).status).toBe("ok");
    // 2.4510 − 2.4500 = 0.0010 < 0.0015
    expect(bearingClearance({ bore: "2.4510", journal: "2.4500", ...limits }).status).toBe("tight");
    // 2.4535 − 2.4500 = 0.0035 > 0.0030
    expect(bearingClearance({ bore: "2.4535", journal: "2.4500", ...limits }).status).toBe("wide");
  });

  it("calls a journal as big as the bore an interference, limits or not", () => {
    expect(bearingClearance({ bore: "2.4500", journal: "2.4502" })).toMatchObject({
      clearance: "-0.0002",
      status: "interference",
    });
    expect(bearingClearance({ bore: "2.4500", journal: "2.4500" }).status).toBe("interference");
  });

  it("takes the tightest and widest clearance from readings and gives each part's geometry", () => {
    // bore: front 2.4527 / 2.4524, rear 2.4526 / 2.4525; journal: front 2.4500 / 2.4498,
    // rear 2.4497 / 2.4496 (first reading vertical, second horizontal at each position).
    // tightest = smallest bore − largest journal = 2.4524 − 2.4500 = 0.0024
    // widest = largest bore − smallest journal = 2.4527 − 2.4496 = 0.0031 > 0.0030 → wide
    // journal taper: |2.4500 − 2.4497| = 0.0003, |2.4498 − 2.4496| = 0.0002 → 0.0003
    // journal out-of-round: 2.4500 − 2.4498 = 0.0002, 2.4497 − 2.4496 = 0.0001 → 0.0002
    // bore taper: |2.4527 − 2.4526| = 0.0001, |2.4524 − 2.4525| = 0.0001 → 0.0001
    // bore out-of-round: 0.0003 at the front, 0.0001 at the rear → 0.0003
    const result = bearingClearance({
      bore: [
        ["2.4527", "2.4524"],
        ["2.4526", "2.4525"],
      ],
      journal: [
        ["2.4500", "2.4498"],
        ["2.4497", "2.4496"],
      ],
      minClearance: "0.0015",
      maxClearance: "0.0030",
    });
    expect(result).toMatchObject({
      clearance: "0.0024",
      widestClearance: "0.0031",
      status: "wide",
      journalGeometry: {
        smallest: "2.4496",
        largest: "2.45",
        taper: "0.0003",
        outOfRound: "0.0002",
      },
      boreGeometry: { taper: "0.0001", outOfRound: "0.0003" },
    });
  });

  it("mixes one bore reading with journal readings", () => {
    // 2.4525 − 2.4501 = 0.0024; widest 2.4525 − 2.4499 = 0.0026
    const result = bearingClearance({ bore: "2.4525", journal: [["2.4501"], ["2.4499"]] });
    expect(result).toMatchObject({ clearance: "0.0024", widestClearance: "0.0026" });
    expect(result.boreGeometry).toBeUndefined();
    expect(result.journalGeometry).toEqual({
      smallest: "2.4499",
      largest: "2.4501",
      taper: "0.0002",
    });
  });

  describe("refusals name the field", () => {
    const cases: [string, Record<string, unknown>, string, string][] = [
      ["bore missing", { journal: "2.45" }, "bore", "required"],
      ["journal zero", { bore: "2.4525", journal: "0" }, "journal", "not-positive"],
      ["an empty readings list", { bore: "2.4525", journal: [] }, "journal", "empty"],
      ["an empty position", { bore: "2.4525", journal: [["2.45"], []] }, "journal.1", "empty"],
      [
        "uneven positions",
        { bore: "2.4525", journal: [["2.45", "2.4499"], ["2.4498"]] },
        "journal.1",
        "uneven-readings",
      ],
      [
        "a bad reading",
        { bore: [["2.4525"], ["2.45x"]], journal: "2.45" },
        "bore.1.0",
        "not-a-decimal",
      ],
      [
        "max below min",
        { bore: "2.4525", journal: "2.45", minClearance: "0.003", maxClearance: "0.002" },
        "maxClearance",
        "out-of-range",
      ],
      [
        "a negative minimum",
        { bore: "2.4525", journal: "2.45", minClearance: "-0.001" },
        "minClearance",
        "negative",
      ],
    ];
    it.each(cases)("%s", (_label, input, field, code) => {
      expect(() => bearingClearance(input as never)).toThrow(
        expect.objectContaining({ field, code }),
      );
    });

    it("names the position and reading in the message", () => {
      expect(() => bearingClearance({ bore: "2.4525", journal: [["2.45"], ["-1"]] })).toThrow(
        /Journal, position 2, reading 1 cannot be negative/,
      );
    });
  });
});

describe("journalGeometry", () => {
  it("gives taper end to end and out-of-round at a position (worked by hand)", () => {
    // three positions, three directions each; taper compares first and last positions only:
    // |2.1240 − 2.1236| = 0.0004, |2.1238 − 2.1237| = 0.0001, |2.1239 − 2.1235| = 0.0004 → 0.0004
    // out-of-round: 0.0002 (2.1240 − 2.1238), 0.0005 (2.1241 − 2.1236), 0.0002 → 0.0005
    expect(
      journalGeometry({
        readings: [
          ["2.1240", "2.1238", "2.1239"],
          ["2.1241", "2.1236", "2.1238"],
          ["2.1236", "2.1237", "2.1235"],
        ],
      }),
    ).toEqual({ smallest: "2.1235", largest: "2.1241", taper: "0.0004", outOfRound: "0.0005" });
  });

  it("gives no taper from one position and no out-of-round from one direction", () => {
    expect(journalGeometry({ readings: [["2.1240", "2.1237"]] })).toEqual({
      smallest: "2.1237",
      largest: "2.124",
      outOfRound: "0.0003",
    });
  });

  it("refuses a readings list that is not a list", () => {
    expect(() => journalGeometry({ readings: "2.124" as never })).toThrow(
      expect.objectContaining({ field: "readings", code: "empty" }),
    );
  });
});
