import { all, create, type FactoryFunctionMap } from "mathjs";
import { describe, expect, it } from "vitest";
import { evaluateBuildRecord, inRecordUnit } from "@/lib/build-record/evaluate";
import {
  formatAngle,
  formatCc,
  formatDerivedLength,
  formatLengthAsTyped,
  formatLoad,
  formatRatio,
} from "@/lib/build-record/format";
import { type BuildRecordData, BUILD_SECTIONS, emptySection } from "@/lib/build-record/schemas";
import { type BuildSettings, EMPTY_BUILD_SETTINGS } from "@/lib/build-record/settings-schema";

// Reference library: mathjs BigNumber arithmetic (1 in = 25.4 mm exactly, NIST SP 811 App. B).
const math = create(all as FactoryFunctionMap, { number: "BigNumber", precision: 64 });

function record(changes: Partial<BuildRecordData>): BuildRecordData {
  const empty = Object.fromEntries(
    BUILD_SECTIONS.map((s) => [s, emptySection(s, "in")]),
  ) as unknown as BuildRecordData;
  return { ...empty, ...changes };
}

const SPECS = emptySection("specs", "in");

describe("valve springs against the window and the shop's coil-bind margin", () => {
  const springSpecs = {
    ...SPECS,
    spring: {
      installedHeight: "1.800",
      rate: "300",
      solidHeight: "1.150",
      lift: "0.500",
      seatLoadMin: "105",
      seatLoadMax: "115",
    },
  };

  it("seat 100 lb at 1.800 in, 300 lb/in, 0.500 in lift: open 250 lb, margin 0.150 in", () => {
    // Hooke's law: 100 + 300 × 0.500 = 250 lb; 1.800 − 0.500 = 1.300; 1.300 − 1.150 = 0.150 in.
    const out = evaluateBuildRecord(
      record({
        specs: springSpecs,
        springs: {
          rows: [
            { cylinder: 1, valve: "intake", installedHeight: null, shim: null, seatLoad: "100" },
          ],
        },
      }),
      { ...EMPTY_BUILD_SETTINGS, minCoilBindMargin: "0.060" },
    );
    const row = out.springs[0]!;
    expect(row.result).toMatchObject({
      ok: true,
      value: { seatLoad: "100", openLoad: "250", coilBindMargin: "0.15", coilBind: false },
    });
    expect(row.flags).toEqual(["seat load below the window"]); // 100 < 105
  });

  it("a 0.030 in shim adds 300 × 0.030 = 9 lb and takes 0.030 in of margin; a shop minimum in mm is converted", () => {
    const settings: BuildSettings = {
      ...EMPTY_BUILD_SETTINGS,
      lengthUnit: "mm",
      minCoilBindMargin: "3.1", // 3.1 mm = 0.12205 in (÷ 25.4)
    };
    const out = evaluateBuildRecord(
      record({
        specs: springSpecs,
        springs: {
          rows: [
            {
              cylinder: 1,
              valve: "exhaust",
              installedHeight: "1.800",
              shim: "0.030",
              seatLoad: "100",
            },
          ],
        },
      }),
      settings,
    );
    const row = out.springs[0]!;
    // Seat 100 + 9 = 109 lb (in the window); margin 1.800 − 0.030 − 0.500 − 1.150 = 0.120 in.
    expect(row.result).toMatchObject({
      ok: true,
      value: { seatLoad: "109", coilBindMargin: "0.12" },
    });
    expect(row.flags).toEqual(["coil-bind margin below the shop's smallest"]); // 0.120 < 0.12205
    expect(
      Math.abs(
        Number(inRecordUnit("3.1", "mm", "in")) -
          Number(math.divide(math.bignumber("3.1"), 25.4).toString()),
      ),
    ).toBeLessThan(1e-15);
  });
});

describe("bearing clearances", () => {
  const row = {
    kind: "main" as const,
    journal: 1,
    bore: [
      ["2.4525", "2.4527"],
      ["2.4526", "2.4526"],
    ],
    journalDiameter: [
      ["2.4500", "2.4498"],
      ["2.4499", "2.4500"],
    ],
  };

  it("judges against the engine maker's window when given", () => {
    const out = evaluateBuildRecord(
      record({
        specs: {
          ...SPECS,
          clearance: { main: { min: "0.0015", max: "0.0030" }, rod: { min: null, max: null } },
        },
        clearances: { rows: [row] },
      }),
      EMPTY_BUILD_SETTINGS,
    );
    const r = out.clearances[0]!;
    expect(r.window.from).toBe("engine");
    // Tightest: smallest bore 2.4525 − largest journal 2.4500 = 0.0025; widest 2.4527 − 2.4498 = 0.0029.
    // Journal out-of-round at the front: 2.4500 − 2.4498 = 0.0002; taper (front vs rear, same
    // direction): |2.4500 − 2.4499| = 0.0001 and |2.4498 − 2.4500| = 0.0002 → 0.0002.
    expect(r.result).toMatchObject({
      ok: true,
      value: {
        clearance: "0.0025",
        widestClearance: "0.0029",
        status: "ok",
        journalGeometry: { outOfRound: "0.0002", taper: "0.0002" },
      },
    });
  });

  it("names the position when the bore readings are uneven (a blank reading)", () => {
    const out = evaluateBuildRecord(
      record({
        clearances: {
          rows: [
            {
              ...row,
              bore: [
                ["2.4525", "2.4527"],
                ["2.4526", null],
              ],
            },
          ],
        },
      }),
      EMPTY_BUILD_SETTINGS,
    );
    expect(out.clearances[0]!.result).toMatchObject({ ok: false, refusal: { field: "bore.1" } });
  });

  it("falls back on the shop's clearance per inch of journal, scaled by this journal", () => {
    const out = evaluateBuildRecord(record({ clearances: { rows: [row] } }), {
      ...EMPTY_BUILD_SETTINGS,
      clearancePerInch: { min: "0.00075", max: "0.0010" },
    });
    const r = out.clearances[0]!;
    // Smallest journal reading 2.4498 in: 2.4498 × 0.0010 = 0.0024498 in at most; 0.0025 is over.
    expect(r.window).toEqual({ min: "0.00183735", max: "0.0024498", from: "shop" });
    expect(r.result).toMatchObject({ ok: true, value: { status: "wide" } });
  });
});

describe("compression ratio per cylinder", () => {
  it("agrees with mathjs for an invented 4.030 × 3.480 in engine with the measured deck", () => {
    const out = evaluateBuildRecord(
      record({
        specs: {
          ...SPECS,
          bore: "4.030",
          stroke: "3.480",
          compression: {
            chamberCc: "64",
            pistonCc: "5",
            gasketBore: "4.100",
            gasketThickness: "0.041",
          },
        },
        deck: { rows: [{ cylinder: 1, deckClearance: "0.005", chamberCc: null }] },
      }),
      EMPTY_BUILD_SETTINGS,
    );
    const row = out.deck[0]!;
    // Heywood ch. 2: r = (Vd + Vc) / Vc, lengths in mm (× 25.4), volumes in cc (÷ 1000).
    const mm = (v: string) => math.multiply(math.bignumber(v), 25.4);
    const area = (d: string) => math.multiply(math.divide(math.pi, 4), math.pow(mm(d), 2));
    const cc = (d: string, h: string) => math.divide(math.multiply(area(d), mm(h)), 1000);
    const swept = cc("4.030", "3.480");
    const clearance = math.add(64, cc("4.100", "0.041"), cc("4.030", "0.005"), 5);
    const ratio = math.divide(math.add(swept, clearance), clearance);
    expect(row.result?.ok).toBe(true);
    if (!row.result?.ok) return;
    expect(Math.abs(Number(row.result.value.ratio) - Number(ratio.toString()))).toBeLessThan(1e-12);
    expect(formatRatio(row.result.value.ratio)).toBe(`${Number(ratio.toString()).toFixed(2)}:1`);
    // Quench: deck 0.005 + gasket 0.041 = 0.046 in.
    expect(row.quench).toBe("0.046");
  });
});

describe("how the figures are shown", () => {
  it("computed lengths carry one decimal more than the typed ones; sums keep the typed decimals", () => {
    // 0.0045 × 4.030 = 0.018135 against a 0.015 feeler reading → 0.0181 (4 places).
    expect(formatDerivedLength("0.018135", ["0.015"])).toBe("0.0181");
    expect(formatDerivedLength("0.003135", ["0.015"])).toBe("0.0031");
    expect(formatLengthAsTyped("0.046", ["0.005", "0.041"])).toBe("0.046");
  });

  it("angles to a tenth without a minus zero, loads whole, volumes to a tenth", () => {
    expect(formatAngle("108.5")).toBe("108.5");
    expect(formatAngle("-0.04")).toBe("0");
    expect(formatAngle("1.25", 2)).toBe("1.25");
    expect(formatLoad("249.6")).toBe("250");
    expect(formatCc("8.01184")).toBe("8.0");
  });
});
