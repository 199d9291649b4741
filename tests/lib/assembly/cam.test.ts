import { describe, expect, it } from "vitest";
import {
  camCorrection,
  camFromCard,
  intakeCentreline,
  toDegreesAtdc,
  trueTdc,
} from "@/lib/assembly";

// Cam-card arithmetic as cam makers and trade magazines publish it: duration = opening + 180 +
// closing; intake centreline = duration / 2 − opening; lobe separation = (ICL + ECL) / 2.

describe("camFromCard", () => {
  const card = {
    intakeOpenBtdc: "31",
    intakeCloseAbdc: "63",
    exhaustOpenBbdc: "73",
    exhaustCloseAtdc: "21",
  };

  it("gives 274° and an intake centreline of 106° for a 31°/63° intake (published arithmetic)", () => {
    const result = camFromCard(card);
    expect(result.intakeDuration).toBe("274"); // 31 + 180 + 63
    expect(result.intakeCentreline).toBe("106"); // 274 / 2 − 31
  });

  it("gives the exhaust side, lobe separation, advance and overlap (worked by hand)", () => {
    // exhaust 73 + 180 + 21 = 274; ECL = 137 − 21 = 116 BTDC; LSA = (106 + 116) / 2 = 111;
    // advance ground in = 111 − 106 = 5; overlap = 31 + 21 = 52
    expect(camFromCard(card)).toEqual({
      intakeDuration: "274",
      exhaustDuration: "274",
      intakeCentreline: "106",
      exhaustCentreline: "116",
      lobeSeparation: "111",
      advance: "5",
      overlap: "52",
    });
  });

  it("keeps the lobe separation when the whole cam is turned 4° earlier (second derivation)", () => {
    // Advancing 4° makes each event 4° earlier: intake opens 35 BTDC, closes 59 ABDC; exhaust
    // opens 77 BBDC, closes 17 ATDC. The lobes are ground on the cam, so LSA cannot change; ICL
    // moves 4° earlier (102), ECL 4° later (120) and the advance grows by 4.
    const moved = camFromCard({
      intakeOpenBtdc: "35",
      intakeCloseAbdc: "59",
      exhaustOpenBbdc: "77",
      exhaustCloseAtdc: "17",
    });
    expect(moved).toMatchObject({
      intakeCentreline: "102",
      exhaustCentreline: "120",
      lobeSeparation: "111",
      advance: "9",
      intakeDuration: "274",
    });
  });

  it("takes an intake that opens after TDC as a negative opening", () => {
    // -2 + 180 + 36 = 214; ICL = 107 − (−2) = 109; overlap −2 + 2 = 0
    const result = camFromCard({
      intakeOpenBtdc: "-2",
      intakeCloseAbdc: "36",
      exhaustOpenBbdc: "40",
      exhaustCloseAtdc: "2",
    });
    expect(result).toMatchObject({ intakeDuration: "214", intakeCentreline: "109", overlap: "0" });
  });

  it("agrees with the equal-lift method read at the card's own events (second derivation)", () => {
    // Reading the wheel where the lifter passes the checking lift on opening (31 BTDC) and on
    // closing (63 ABDC): (−31 + 243) / 2 = 106, the card's centreline.
    const opening = toDegreesAtdc({ reading: "31", mark: "BTDC" }).degreesAtdc;
    const closing = toDegreesAtdc({ reading: "63", mark: "ABDC" }).degreesAtdc;
    expect([opening, closing]).toEqual(["-31", "243"]);
    expect(intakeCentreline({ openingSide: opening, closingSide: closing }).centreline).toBe(
      camFromCard(card).intakeCentreline,
    );
  });

  describe("refusals name the field", () => {
    const cases: [string, Record<string, string>, string, string][] = [
      ["an event of 180°", { ...card, intakeOpenBtdc: "180" }, "intakeOpenBtdc", "out-of-range"],
      ["a missing event", { ...card, exhaustOpenBbdc: "" }, "exhaustOpenBbdc", "required"],
      [
        "an intake duration below zero",
        { ...card, intakeOpenBtdc: "-100", intakeCloseAbdc: "-90" },
        "intakeCloseAbdc",
        "out-of-range",
      ],
      [
        "an exhaust duration of 360°",
        { ...card, exhaustOpenBbdc: "90", exhaustCloseAtdc: "90" },
        "exhaustCloseAtdc",
        "out-of-range",
      ],
      [
        "an event in words",
        { ...card, intakeCloseAbdc: "63deg" },
        "intakeCloseAbdc",
        "not-a-decimal",
      ],
    ];
    it.each(cases)("%s", (_label, input, field, code) => {
      expect(() => camFromCard(input as never)).toThrow(expect.objectContaining({ field, code }));
    });
  });
});

describe("toDegreesAtdc", () => {
  it("turns each wheel marking into degrees after TDC", () => {
    expect(toDegreesAtdc({ reading: "8", mark: "BTDC" }).degreesAtdc).toBe("-8");
    expect(toDegreesAtdc({ reading: "84", mark: "ATDC" }).degreesAtdc).toBe("84");
    expect(toDegreesAtdc({ reading: "34", mark: "BBDC" }).degreesAtdc).toBe("146"); // 180 − 34
    expect(toDegreesAtdc({ reading: "30", mark: "ABDC" }).degreesAtdc).toBe("210"); // 180 + 30
    expect(toDegreesAtdc({ reading: "0", mark: "BTDC" }).degreesAtdc).toBe("0");
  });

  it("refuses a reading past 180 and an unknown marking", () => {
    expect(() => toDegreesAtdc({ reading: "181", mark: "ATDC" })).toThrow(
      expect.objectContaining({ field: "reading", code: "out-of-range" }),
    );
    expect(() => toDegreesAtdc({ reading: "-5", mark: "ATDC" })).toThrow(
      expect.objectContaining({ field: "reading", code: "negative" }),
    );
    expect(() => toDegreesAtdc({ reading: "10", mark: "TDC" as never })).toThrow(
      expect.objectContaining({ field: "mark", code: "unknown-unit" }),
    );
    expect(() => toDegreesAtdc({ reading: "10" } as never)).toThrow(
      expect.objectContaining({ field: "mark", code: "required" }),
    );
  });
});

describe("intakeCentreline (equal-lift method, as cam makers publish it)", () => {
  it("puts the centreline midway and calls an earlier one advanced (worked by hand)", () => {
    // (62 + 146) / 2 = 104; card 106 − 104 = +2: the cam is 2° advanced
    expect(
      intakeCentreline({ openingSide: "62", closingSide: "146", specCentreline: "106" }),
    ).toEqual({ centreline: "104", advance: "2", phasing: "advanced" });
  });

  it("calls a later centreline retarded and an equal one on the card", () => {
    // (66 + 150) / 2 = 108; 106 − 108 = −2
    expect(
      intakeCentreline({ openingSide: "66", closingSide: "150", specCentreline: "106" }),
    ).toEqual({ centreline: "108", advance: "-2", phasing: "retarded" });
    expect(
      intakeCentreline({ openingSide: "64.5", closingSide: "147.5", specCentreline: "106" }),
    ).toEqual({ centreline: "106", advance: "0", phasing: "on-card" });
  });

  it("takes half degrees without rounding", () => {
    // (63 + 148) / 2 = 105.5
    expect(intakeCentreline({ openingSide: "63", closingSide: "148" })).toEqual({
      centreline: "105.5",
    });
  });

  describe("refusals name the field", () => {
    const cases: [string, Record<string, string>, string, string][] = [
      [
        "closing before opening",
        { openingSide: "146", closingSide: "62" },
        "closingSide",
        "out-of-order",
      ],
      [
        "closing equal to opening",
        { openingSide: "90", closingSide: "90" },
        "closingSide",
        "out-of-order",
      ],
      ["opening at 360", { openingSide: "360", closingSide: "300" }, "openingSide", "out-of-range"],
      [
        "a card centreline of 200",
        { openingSide: "62", closingSide: "146", specCentreline: "200" },
        "specCentreline",
        "out-of-range",
      ],
      ["opening missing", { closingSide: "146" }, "openingSide", "required"],
    ];
    it.each(cases)("%s", (_label, input, field, code) => {
      expect(() => intakeCentreline(input as never)).toThrow(
        expect.objectContaining({ field, code }),
      );
    });

    it("refuses a closing side 360° or more after the opening side", () => {
      expect(() => intakeCentreline({ openingSide: "-100", closingSide: "260" })).toThrow(
        expect.objectContaining({ field: "closingSide", code: "out-of-range" }),
      );
    });
  });
});

describe("camCorrection (offset key, bushing or multi-keyway sprocket)", () => {
  it("advances a retarded cam by the difference, half that at the sprocket (worked by hand)", () => {
    // measured 108 against card 106: events are 2° late, so advance 2 crank degrees = 1 cam degree
    expect(camCorrection({ measuredCentreline: "108", specCentreline: "106" })).toEqual({
      move: "2",
      direction: "advance",
      camDegrees: "1",
    });
  });

  it("retards an advanced cam and leaves one on the card alone", () => {
    // measured 103 against 106: 3° early, retard 3 crank degrees = 1.5 cam degrees
    expect(camCorrection({ measuredCentreline: "103", specCentreline: "106" })).toEqual({
      move: "3",
      direction: "retard",
      camDegrees: "1.5",
    });
    expect(camCorrection({ measuredCentreline: "106", specCentreline: "106" }).direction).toBe(
      "none",
    );
  });

  it("agrees in sign with intakeCentreline's advance (the move undoes it)", () => {
    const measured = intakeCentreline({
      openingSide: "62",
      closingSide: "146",
      specCentreline: "106",
    });
    const move = camCorrection({ measuredCentreline: measured.centreline, specCentreline: "106" });
    expect(measured.phasing).toBe("advanced");
    expect(move).toEqual({ move: "2", direction: "retard", camDegrees: "1" });
  });

  it("picks the nearest key setting and says where the centreline lands (worked by hand)", () => {
    // need +2.5; settings −4, 0, 4: |4 − 2.5| = 1.5 beats |0 − 2.5| = 2.5 → 4;
    // 108.5 − 4 = 104.5; 106 − 104.5 = +1.5 still advanced
    expect(
      camCorrection({
        measuredCentreline: "108.5",
        specCentreline: "106",
        positions: ["-4", "0", "4"],
      }),
    ).toEqual({
      move: "2.5",
      direction: "advance",
      camDegrees: "1.25",
      position: "4",
      resultingCentreline: "104.5",
      resultingAdvance: "1.5",
    });
  });

  it("on a tie takes the smaller move", () => {
    // need +2 with settings 0 and 4: both 2 away, so stay at 0 (108, 2° retarded)
    expect(
      camCorrection({ measuredCentreline: "108", specCentreline: "106", positions: ["4", "0"] }),
    ).toMatchObject({ position: "0", resultingCentreline: "108", resultingAdvance: "-2" });
  });

  it("refuses an empty settings list and a bad setting, naming it", () => {
    expect(() =>
      camCorrection({ measuredCentreline: "108", specCentreline: "106", positions: [] }),
    ).toThrow(expect.objectContaining({ field: "positions", code: "empty" }));
    expect(() =>
      camCorrection({ measuredCentreline: "108", specCentreline: "106", positions: ["0", "x"] }),
    ).toThrow(expect.objectContaining({ field: "positions.1", code: "not-a-decimal" }));
    expect(() => camCorrection({ measuredCentreline: "108", specCentreline: "0" })).toThrow(
      expect.objectContaining({ field: "specCentreline", code: "out-of-range" }),
    );
    expect(() => camCorrection({ measuredCentreline: "", specCentreline: "106" })).toThrow(
      expect.objectContaining({ field: "measuredCentreline", code: "required" }),
    );
  });
});

describe("trueTdc (piston-stop method, common practice)", () => {
  it("puts true TDC midway between the stops (worked by hand)", () => {
    // stops at 18 BTDC and 22 ATDC: (−18 + 22) / 2 = +2 is where the wheel reads at true TDC;
    // after correcting, each stop reads (22 + 18) / 2 = 20
    expect(trueTdc({ firstStop: "-18", secondStop: "22" })).toEqual({
      offset: "2",
      eachSide: "20",
    });
  });

  it("does not care which stop is read first, and reads zero offset on an honest pointer", () => {
    expect(trueTdc({ firstStop: "22", secondStop: "-18" })).toEqual({
      offset: "2",
      eachSide: "20",
    });
    expect(trueTdc({ firstStop: "-20.5", secondStop: "20.5" })).toEqual({
      offset: "0",
      eachSide: "20.5",
    });
    // corrected readings are symmetric: −18 − 2 = −20 and 22 − 2 = 20
    const { offset, eachSide } = trueTdc({ firstStop: "-18", secondStop: "22" });
    expect(-18 - Number(offset)).toBe(-Number(eachSide));
  });

  it("refuses equal readings and readings past 180, naming the field", () => {
    expect(() => trueTdc({ firstStop: "10", secondStop: "10" })).toThrow(
      expect.objectContaining({ field: "secondStop", code: "same-reading" }),
    );
    expect(() => trueTdc({ firstStop: "-190", secondStop: "10" })).toThrow(
      expect.objectContaining({ field: "firstStop", code: "out-of-range" }),
    );
    expect(() => trueTdc({ firstStop: "-20", secondStop: 20 as never })).toThrow(
      expect.objectContaining({ field: "secondStop", code: "not-a-string" }),
    );
  });
});
